/**
 * The command line agrees with itself: run ids work wherever runs are
 * named, help states the real defaults, `--dut FILE.json` works on every
 * command that simulates, progress names what it counts, one spelling of
 * Ctrl+C, no extrapolated Kvco, and a default 8 h drift log says so.
 */
import { copyFile, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCliCaptured } from '../../test/testing/run-cli-captured.ts';
import { defaultSweepPlan } from '../cli/default-plans.ts';
import { describeProgress } from '../cli/progress-display.ts';
import { describeDefaultSweep } from './cmd-sweep.ts';
import { commands } from './commands.ts';
import { runCli } from './index.ts';

const dirs: string[] = [];
afterAll(async () => {
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});
async function tempDir(): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), 'tunebench-cli-consistency-'));
  dirs.push(dir);
  return dir;
}

/** A sweep short enough for real time on the simulated bench: 5 points, 10 ms gate. */
const QUICK = {
  points: [2, 2.5, 3, 3.5, 4],
  readingsPerPoint: 2,
  gateS: '10ms',
  settle: { mode: 'fixed', seconds: '10ms' },
  refineEdgeV: 0,
  limits: { maxControlV: 5, currentLimitA: '20mA' },
};

describe('one command line', () => {
  it(
    'analyze and datasheet take the run ids that `runs` prints; sweep --dut takes a DUT model file',
    { timeout: 60_000 },
    async () => {
      const dir = await tempDir();
      const runs = join(dir, 'runs');
      const plan = join(dir, 'plan.json');
      await writeFile(plan, JSON.stringify(QUICK));
      const dutFile = join(dir, 'my-lo.json');
      await copyFile(
        join(import.meta.dirname, '..', '..', 'resources', 'duts', 'radio-lo-varactor-400m.json'),
        dutFile,
      );
      const sweep = await runCliCaptured('sweep', '--plan', plan, '--runs', runs, '--dut', dutFile);
      expect(sweep.code).toBe(0);
      const folder = sweep.out.split('\n')[0] as string;
      const meta = JSON.parse(await readFile(join(folder, 'run.json'), 'utf8')) as { dut: { id: string } };
      expect(meta.dut.id).toMatch(/^sim-/);
      const id = basename(folder);
      const listed = await runCliCaptured('runs', '--runs', runs);
      expect(listed.out).toContain(id);
      const analyze = await runCliCaptured('analyze', id, '--runs', runs);
      expect(analyze.code).toBe(0);
      expect(analyze.out).toMatch(new RegExp(`run ${id.slice(0, 15)}`));
      const datasheet = await runCliCaptured('datasheet', id, '--runs', runs);
      expect(datasheet.code).toBe(0);
      expect(datasheet.out).toMatch(/\| Parameter \|/);
      const unknown = await runCliCaptured('analyze', '20991231-000000-none', '--runs', runs);
      expect(unknown.code).toBe(2);
      expect(unknown.err).toMatch(/no such file, run folder or run id in/);

      // Kvco at a control voltage outside what was measured (2–4 V) is refused, not extrapolated.
      const outside = await runCliCaptured('analyze', folder, '--nominal', '4.8');
      expect(outside.code).toBe(2);
      expect(outside.err).toMatch(/--nominal: 4\.8 V is outside the measured range 2–4 V/);
      expect((await runCliCaptured('analyze', folder, '--nominal', '3')).code).toBe(0);
    },
  );

  it('sweep --help states the default plan the command really runs', async () => {
    const r = await runCliCaptured('sweep', '--help');
    const oneLine = r.out.replace(/\s+/g, ' ');
    expect(oneLine).toContain(describeDefaultSweep(defaultSweepPlan('relaxation')));
    expect(oneLine).toContain(describeDefaultSweep(defaultSweepPlan('varactor')));
    expect(oneLine).toContain('1–4.25 V in 50 mV steps');
  });

  it('progress names what it counts, and pushing shows the stepped supply voltage', () => {
    const base = { runId: 'r', phase: 'reading' as const, pointsDone: 3, pointsTotal: 13, etaS: 5 };
    expect(
      describeProgress({ ...base, kind: 'sweep', latest: { controlV: 2, frequencyHz: 1000, status: 'ok' } }),
    ).toMatch(/^reading 3\/13 points .* 2\.0000 V → 1\.0000 kHz$/);
    expect(describeProgress({ ...base, kind: 'drift', phase: 'logging', latest: null })).toMatch(
      /^logging 3\/13 readings /,
    );
    expect(
      describeProgress({
        ...base,
        kind: 'pushing',
        latest: { controlV: 2.5, supplyV: 3.1, frequencyHz: 1000, status: 'ok' },
      }),
    ).toMatch(/3\/13 supply steps .* supply 3\.1000 V → 1\.0000 kHz$/);
  });

  it('no help text points at a document that does not ship (analyze once named CONTRACTS.md)', async () => {
    const { existsSync } = await import('node:fs');
    for (const command of await Promise.all(commands.map((c) => c.load())))
      expect(command.usage, command.name).not.toMatch(/CONTRACTS\.md/);
    expect(existsSync(join(import.meta.dirname, '..', '..', 'resources', 'docs', 'reference.md'))).toBe(true);
    expect((await runCliCaptured('analyze', '--help')).out).toMatch(/docs\/reference\.md/);
  });

  it('one spelling of Ctrl+C in every help text', async () => {
    const loaded = await Promise.all(commands.map((c) => c.load()));
    for (const command of loaded) expect(command.usage, command.name).not.toMatch(/Ctrl-C/);
    expect(loaded.filter((c) => /Ctrl\+C/.test(c.usage)).map((c) => c.name)).toEqual(
      expect.arrayContaining(['sweep', 'drift', 'pushing', 'sim']),
    );
  });

  it('every registered command loads under the name it is registered by', async () => {
    for (const entry of commands) expect((await entry.load()).name).toBe(entry.name);
  });

  it('a drift log with no --duration says it runs 8 h and how to shorten it', async () => {
    const dir = await tempDir();
    let err = '';
    const controller = new AbortController();
    controller.abort(); // stop at once: only what is said before the log matters here
    const code = await runCli(['drift', '--runs', dir], {
      stdout: { write: () => true },
      stderr: { write: (s: string) => ((err += s), true) },
      env: {},
      signal: controller.signal,
    });
    expect(code).toBe(0);
    expect(err).toMatch(
      /no --duration given, so the log runs 8 h 00 min \(the default\); shorten it with e\.g\. --duration 15min/,
    );
  });

  it('tunebench schema prints a JSON Schema; an unknown name is refused with the list', async () => {
    const r = await runCliCaptured('schema', 'sweep-plan');
    expect(r.code).toBe(0);
    expect((JSON.parse(r.out) as { title: string }).title).toBe('tunebench sweep plan');
    const bad = await runCliCaptured('schema', 'plan');
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/expected one of bench, sweep-plan, drift-plan, pushing-plan, campaign-plan, profile, dut/);
  });
});
