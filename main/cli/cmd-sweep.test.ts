import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readRunFolder } from '../store/index.ts';
import { runCli } from './index.ts';
import type { CliIo } from './types.ts';

function io(): CliIo & { out: () => string; err: () => string } {
  let out = '';
  let err = '';
  return {
    stdout: { write: (text: string) => ((out += text), true) },
    stderr: { write: (text: string) => ((err += text), true) },
    env: {},
    out: () => out,
    err: () => err,
  };
}

const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});

async function tempDir(): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), 'tunebench-cli-'));
  dirs.push(dir);
  return dir;
}

describe('tunebench sweep / drift / pushing input checks', () => {
  it('a plan field of the wrong form exits 2 naming the field', async () => {
    const dir = await tempDir();
    const plan = join(dir, 'plan.json');
    await writeFile(
      plan,
      JSON.stringify({ start: 1, stop: 2, step: 0.1, gateS: 'fast', limits: { maxControlV: 5, currentLimitA: 0.02 } }),
    );
    const cli = io();
    expect(await runCli(['sweep', '--plan', plan, '--runs', dir], cli)).toBe(2);
    expect(cli.err()).toMatch(/gateS: expected a time such as/);
  });

  it('a plan beyond its limits is refused (exit 2) before any bench is opened', async () => {
    const dir = await tempDir();
    const plan = join(dir, 'plan.json');
    await writeFile(
      plan,
      JSON.stringify({ start: 1, stop: 6, step: 0.5, limits: { maxControlV: 5, currentLimitA: 0.02 } }),
    );
    const cli = io();
    expect(await runCli(['sweep', '--plan', plan, '--runs', dir], cli)).toBe(2);
    expect(cli.err()).toMatch(/plan refused — stop: 6 V exceeds limits\.maxControlV \(5 V\)/);
    expect(cli.err()).not.toMatch(/bench: simulated/);
  });

  it('a bench file with a bad address exits 2 naming it', async () => {
    const dir = await tempDir();
    const bench = join(dir, 'bench.json');
    await writeFile(bench, JSON.stringify({ supply: { address: 'ftp://nowhere' }, counter: { address: 'sim' } }));
    const cli = io();
    expect(await runCli(['pushing', '--bench', bench, '--runs', dir], cli)).toBe(2);
    expect(cli.err()).toMatch(/address/);
  });

  it('bad --dut, --duration and a missing bench file exit 2', async () => {
    const dir = await tempDir();
    expect(await runCli(['sweep', '--dut', 'crystal', '--runs', dir], io())).toBe(2);
    const drift = io();
    expect(await runCli(['drift', '--duration', 'forever', '--runs', dir], drift)).toBe(2);
    expect(drift.err()).toMatch(/--duration: expected a time such as/);
    const missing = io();
    expect(await runCli(['drift', '--bench', join(dir, 'none.json'), '--runs', dir], missing)).toBe(2);
    expect(missing.err()).toMatch(/cannot read/);
  });
});

describe('tunebench demo', () => {
  it(
    'sweeps the simulated DUT, writes a complete run folder and prints the gain table with the cautions',
    { timeout: 120_000 },
    async () => {
      const dir = await tempDir();
      const cli = io();
      expect(await runCli(['demo', '--runs', dir], cli)).toBe(0);
      expect(cli.err()).toMatch(/SIMULATED/);
      const out = cli.out();
      expect(out).toMatch(/\| Parameter \| Conditions \| Min \| Typ \| Max \| Unit \|/);
      expect(out).toMatch(/Stall threshold/);
      expect(out).toMatch(/Cautions: supply limits protect the DUT/);
      const folder = /run folder: (.+)\n/.exec(out)?.[1] ?? '';
      const run = await readRunFolder(folder);
      expect(run.meta.status).toBe('complete');
      expect(run.meta.kind).toBe('sweep');
      expect(run.samplesCsv.split('\n')[0]).toBe(
        'time_s,control_v,control_meas_v,frequency_hz,direction,status,refined,point_index,settle_s',
      );
    },
  );
});
