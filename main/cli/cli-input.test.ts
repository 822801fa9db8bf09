/**
 * What the command line refuses, and how: strict files with a did-you-mean,
 * the one time grammar on flags, plausibility bounds, caps on work and on
 * echoed text, util.parseArgs' `--`, and one error mapping for the three
 * recording commands (a refused plan is exit 2 and leaves no run folder).
 */
import { mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCliCaptured } from '../../test/testing/run-cli-captured.ts';
import { parseProfile } from '../instruments/profile-loader.ts';
import { parseDutParams } from '../sim/dut-params.ts';
import { builtinDut } from '../sim/builtin-duts.ts';

const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});
async function tempDir(): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), 'tunebench-cli-input-'));
  dirs.push(dir);
  return dir;
}
async function file(dir: string, name: string, content: unknown): Promise<string> {
  const path = join(dir, name);
  await writeFile(path, typeof content === 'string' ? content : JSON.stringify(content));
  return path;
}
const limits = { maxControlV: 5, currentLimitA: '20mA' };

describe('unknown keys are refused with a did-you-mean (bench, plan, profile, DUT)', () => {
  it('a bench file with "controlChanel" and "thermometr" exits 2 before any instrument is touched', async () => {
    const dir = await tempDir();
    const bench = await file(dir, 'bench.json', {
      supply: { address: 'sim', controlChanel: 2 },
      counter: { address: 'sim' },
      thermometr: { address: 'sim' },
    });
    const r = await runCliCaptured('sweep', '--bench', bench, '--runs', dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/supply: unknown key "controlChanel" \(did you mean "controlChannel"\?\)/);
    expect(r.err).toMatch(/\(root\): unknown key "thermometr" \(did you mean "thermometer"\?\)/);
    expect(await readdir(dir)).toEqual(['bench.json']);
  });

  it('a plan file with a misspelt key exits 2 naming the nearest key', async () => {
    const dir = await tempDir();
    const plan = await file(dir, 'plan.json', {
      controlV: 2,
      intervalS: '1s',
      durationS: '10s',
      gateS: '100ms',
      limits,
      saef: {},
    });
    const r = await runCliCaptured('drift', '--plan', plan, '--runs', dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/unknown key "saef" \(did you mean "safe"\?\)/);
  });

  it('profiles and DUT models are strict too', () => {
    const profile = {
      schema: 'tunebench.profile/1',
      role: 'counter',
      commands: { setGate: 'FREQ:APER {gateS}', readFrequency: 'READ?' },
      noSignal: { zeroo: true },
    };
    expect(() => parseProfile(profile, 'counter-test')).toThrow(
      /noSignal: unknown key "zeroo" \(did you mean "zero"\?\)/,
    );
    const dut = { ...builtinDut('relaxation'), tempcoPpmPerCC: 1 };
    expect(() => parseDutParams(dut, 'dut.json')).toThrow(
      /unknown key "tempcoPpmPerCC" \(did you mean "tempcoPpmPerC"\?\)/,
    );
  });
});

describe('the one time grammar on flags and bounds on plans', () => {
  it('--duration 15m is refused offering both readings; 15min is 900 s', async () => {
    const dir = await tempDir();
    const r = await runCliCaptured('drift', '--duration', '15m', '--runs', dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--duration: "15m" is ambiguous: write 15ms or 15min/);
  });

  it('a drift interval shorter than one reading is refused, naming intervalS', async () => {
    const dir = await tempDir();
    const r = await runCliCaptured('drift', '--interval', '10ms', '--duration', '20s', '--runs', dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/plan refused — intervalS: 0\.01 s is shorter than one reading \(gateS 0\.1 s \+ 20 ms\)/);
    expect(await readdir(dir)).toEqual([]);
  });

  it('a gate the counter profile rules out (20 s > its 10 s) is refused with no run folder', async () => {
    const dir = await tempDir();
    const plan = await file(dir, 'plan.json', { points: [2], gateS: '20s', limits });
    const r = await runCliCaptured('sweep', '--plan', plan, '--runs', join(dir, 'runs'));
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/gateS: 20 s is outside the counter's gate range 0\.000001–10 s/);
    expect(await readdir(dir)).toEqual(['plan.json']);
  });
});

describe('a refused plan leaves no run folder', () => {
  it('pushing that finds the DUT supply above maxSupplyV exits 2 and creates nothing', async () => {
    const dir = await tempDir();
    // The simulated relaxation DUT runs at 5 V; this plan allows at most 3.6 V.
    const plan = await file(dir, 'plan.json', {
      controlV: 2.5,
      supplyStartV: 3,
      supplyStopV: 3.6,
      supplyStepV: '100mV',
      maxSupplyV: 3.6,
      gateS: '10ms',
      settleS: '10ms',
      limits,
    });
    const runs = join(dir, 'runs');
    const r = await runCliCaptured('pushing', '--plan', plan, '--runs', runs);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/plan refused — maxSupplyV: the DUT supply \(channel 2\) is at 5 V/);
    expect(r.err).not.toMatch(/run folder:/);
    expect(await readdir(runs).catch(() => [])).toEqual([]);
  });
});

describe('bounded work and bounded echoes', () => {
  it('a pushing step of 1e-9 V is refused at once (exit 2), not run', async () => {
    const dir = await tempDir();
    const plan = await file(dir, 'plan.json', {
      controlV: 2.5,
      supplyStartV: 4.5,
      supplyStopV: 5.5,
      supplyStepV: '1e-9',
      maxSupplyV: 5.5,
      limits,
    });
    const r = await runCliCaptured('pushing', '--plan', plan, '--runs', dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/supplyStepV: 1e-9 V over 4\.5\.\.5\.5 V gives more than 100000 steps/);
  });

  it('a plan nested 10,000 deep is refused with exit 2, not a stack overflow', async () => {
    const dir = await tempDir();
    const plan = await file(dir, 'plan.json', `{"limits":${'['.repeat(10_000)}${']'.repeat(10_000)}}`);
    const r = await runCliCaptured('sweep', '--plan', plan, '--runs', dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/nested more than 32 levels deep/);
  });

  it('a million-element array in a scalar field is refused with a short message', async () => {
    const dir = await tempDir();
    const plan = await file(dir, 'plan.json', { start: new Array(99_999).fill(0), stop: 2, step: 0.1, limits });
    const r = await runCliCaptured('sweep', '--plan', plan, '--runs', dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/start: expected a voltage/);
    expect(r.err.length).toBeLessThan(2000);
    const big = await file(dir, 'big.json', { start: new Array(1_000_000).fill(0), stop: 2, step: 0.1, limits });
    const r2 = await runCliCaptured('sweep', '--plan', big, '--runs', dir);
    expect(r2.code).toBe(2);
    expect(r2.err).toMatch(/start: an array of 1000000 values is longer than any field takes/);
    expect(r2.err.length).toBeLessThan(2000);
  });
});

describe('flags through util.parseArgs', () => {
  it('everything after -- is an argument: `analyze -- --json` looks for a file named --json', async () => {
    const r = await runCliCaptured('analyze', '--', '--json');
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^tunebench analyze: --json: no such file or run folder/);
  });

  it('`--help` after -- is an argument, not a request for help', async () => {
    const r = await runCliCaptured('analyze', '--', '--help');
    expect(r.code).toBe(2);
    expect(r.out).toBe('');
  });

  it('an unknown option names the nearest one; a value flag without its value says so', async () => {
    const r = await runCliCaptured('sweep', '--plna', 'x.json');
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/unknown option --plna \(did you mean --plan\?\)/);
    const missing = await runCliCaptured('sweep', '--plan', '--runs', 'x');
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/--plan needs a value/);
  });
});
