/**
 * `tunebench campaign` from the command line: a refused plan names its field
 * before anything opens; Ctrl+C (a real SIGINT to a child process) ends the
 * campaign aborted with the supply off and the chamber sent to safeC, read
 * back; analyze --json and datasheet read the campaign folder.
 */
import { spawn } from 'node:child_process';
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCliCaptured } from '../../test/testing/run-cli-captured.ts';
import { campaignPlanInput } from '../procedures/campaign/demo-campaign.ts';

const BIN = fileURLToPath(new URL('../bin/tunebench.mjs', import.meta.url));
let work: string;
let planPath: string;

beforeAll(async () => {
  work = await mkdtemp(join(tmpdir(), 'tunebench-campaigncli-'));
  planPath = join(work, 'plan.json');
  // The built-in relaxation DUT; two temperatures keep it short.
  await writeFile(
    planPath,
    JSON.stringify(campaignPlanInput({ temperaturesC: [0, 50], supplyV: [4.8, 5.2], nominalSupplyV: 4.8 })),
  );
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

describe('tunebench campaign', () => {
  it('refuses a plan outside the chamber limits, naming the field, exit 2', async () => {
    const bad = join(work, 'bad.json');
    await writeFile(bad, JSON.stringify(campaignPlanInput({ temperaturesC: [-60, 25] })));
    const r = await runCliCaptured('campaign', '--plan', bad, '--runs', join(work, 'refused'));
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/temperaturesC\.0: -60 °C is outside chamber\.minC … chamber\.maxC/);
    await expect(readdir(join(work, 'refused'))).rejects.toThrow();
  });

  it('refuses a misspelt nested key with a did-you-mean, exit 2, before any folder exists', async () => {
    const bad = join(work, 'misspelt.json');
    const plan = campaignPlanInput();
    await writeFile(bad, JSON.stringify({ ...plan, soak: { ...plan.soak, dwelS: 60 } }));
    const r = await runCliCaptured('campaign', '--plan', bad, '--runs', join(work, 'misspelt'));
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/soak: unknown key "dwelS" \(did you mean "dwellS"\?\)/);
    await expect(readdir(join(work, 'misspelt'))).rejects.toThrow();
  });

  it('runs on the simulated bench in virtual time, then analyze --json and datasheet read the folder', async () => {
    const runs = join(work, 'ok');
    const r = await runCliCaptured('campaign', '--plan', planPath, '--runs', runs);
    expect(r.code, r.err).toBe(0);
    expect(r.err).toMatch(/condensation and frost/);
    expect(r.out).toMatch(/campaign complete: 4 of 4 conditions done/);
    const dir = join(runs, (await readdir(runs))[0] as string);
    const a = await runCliCaptured('analyze', dir, '--json');
    expect(a.code).toBe(0);
    const json = JSON.parse(a.out) as {
      kind: string;
      conditions: {
        temperatureC: number;
        supplyV: number;
        unit: string;
        runId: string;
        status: string;
        kvcoAtNominalHzPerV: number;
        frequencyAtNominalHz: number;
        dutTemperatureC: number;
      }[];
      frequencyTempcoPpmPerC: number;
      kvcoTempcoPpmPerC: number;
      headroom: unknown[];
    };
    expect(json.kind).toBe('campaign');
    expect(json.conditions).toHaveLength(4);
    expect(
      json.conditions.every((c) => c.status === 'done' && c.kvcoAtNominalHzPerV > 0 && c.frequencyAtNominalHz > 0),
    ).toBe(true);
    // The shipped relaxation DUT: −180 ppm/°C and no tuning tempco; a line through two temperatures.
    expect(json.frequencyTempcoPpmPerC).toBeGreaterThan(-190);
    expect(json.frequencyTempcoPpmPerC).toBeLessThan(-170);
    expect(json.headroom).toHaveLength(2);
    const d = await runCliCaptured('datasheet', dir);
    expect(d.code).toBe(0);
    expect(d.out).toMatch(/\| Kvco at 0\.0 °C \|/);
    expect(d.out).toMatch(/\| Kvco at 50\.0 °C \|/);
    expect(d.out).toMatch(/Tuning headroom over temperature/);
    const h = await runCliCaptured('datasheet', dir, '--format', 'html');
    expect(h.code, h.err).toBe(0);
    expect(h.out).toMatch(/^<!doctype html>/);
    expect(h.out).toContain('SIMULATED BENCH');
    expect(h.out).toContain('T 0.0 °C … 50.0 °C; supply 4.800 V … 5.200 V; 1 unit');
    expect(h.out).toMatch(/<td>Kvco at 50\.0 °C<\/td><td>[^<]*<\/td><td class="num">[\d.]+ ± [\d.]+ kHz\/V<\/td>/);
  }, 60_000);

  it(
    'Ctrl+C (SIGINT) ends aborted with the supply off and the chamber sent to safeC',
    { timeout: 60_000 },
    async () => {
      const runs = join(work, 'sigint');
      const child = spawn(process.execPath, [BIN, 'campaign', '--plan', planPath, '--runs', runs], {
        stdio: ['ignore', 'pipe', 'pipe'],
      });
      let err = '';
      let sent = false;
      child.stderr.on('data', (chunk: Buffer) => {
        err += chunk.toString();
        if (!sent && /soaking/.test(err)) {
          sent = true;
          child.kill('SIGINT');
        }
      });
      const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
      expect(code, err).toBe(1);
      expect(err).toMatch(/campaign stopped \(signal\)/);
      const dir = join(runs, (await readdir(runs))[0] as string);
      const file = JSON.parse(await readFile(join(dir, 'campaign.json'), 'utf8')) as { status: string; reason: string };
      expect(file).toMatchObject({ status: 'aborted', reason: 'signal' });
      const events = (await readFile(join(dir, 'campaign-events.jsonl'), 'utf8'))
        .split('\n')
        .filter(Boolean)
        .map((l) => JSON.parse(l) as { type: string; step?: string; ok?: boolean });
      const steps = events.filter((e) => e.type === 'safe-state');
      expect(steps.map((e) => [e.step, e.ok])).toEqual(
        expect.arrayContaining([
          ['output-off', true],
          ['dut-supply-off channel 2', true],
          ['chamber-setpoint 25 °C', true],
        ]),
      );
      expect(events.at(-1)).toMatchObject({ type: 'campaign-end', status: 'aborted', safe_state_ok: true });
    },
  );
});
