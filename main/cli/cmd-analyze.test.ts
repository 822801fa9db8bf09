import { mkdtemp, mkdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SweepAnalysis } from '../../app/analysis/sweep-types.ts';
import { runCliCaptured as cli } from '../../test/testing/run-cli-captured.ts';

const fixture = fileURLToPath(new URL('../../test/fixtures/sweep-sensor-osc.csv', import.meta.url));

let dir = '';
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'tunebench-analyze-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('tunebench analyze FILE.csv --json (sweep)', () => {
  it('gives the CONTRACTS.md keys with the fixture’s known edge and unstable region', async () => {
    const { code, out, err } = await cli('analyze', fixture, '--json');
    expect(err).toBe('');
    expect(code).toBe(0);
    const r = JSON.parse(out) as SweepAnalysis;
    expect(r.kind).toBe('sweep');
    expect(Object.keys(r.tuningRange)).toEqual(expect.arrayContaining(['fMinHz', 'fMaxHz', 'vAtFMin', 'vAtFMax']));
    expect(Object.keys(r.stall)).toEqual(expect.arrayContaining(['stalled', 'thresholdV', 'unstableBelowV']));
    expect(Object.keys(r.kvco)).toEqual(expect.arrayContaining(['linear', 'local', 'minHzPerV', 'maxHzPerV']));
    expect(Object.keys(r.kvco.linear)).toEqual(
      expect.arrayContaining(['slopeHzPerV', 'interceptHz', 'r2', 'maxLinearityErrorPct', 'fromV', 'toV']),
    );
    expect(r.fit.model).toBe('spline');
    expect(r.fit.curve.v).toHaveLength(r.fit.curve.hz.length);
    expect(r.window.source).toBe('auto');
    // Fixture: no oscillation at ≤ 0.4 V, first oscillation at 0.5 V; jitter at 0.5–0.6 V.
    expect(r.stall.stalled).toBe(true);
    expect(r.stall.thresholdV).toBeCloseTo(0.45, 12);
    expect(r.stall.unstableBelowV).toBeCloseTo(0.65, 12);
    expect(r.kvco.local).toHaveLength(26);
    expect(r.kvco.local.filter((e) => e.unstable).map((e) => e.v)).toEqual([0.5, 0.6]);
    // Fixture curve f = 20 kHz + 40 kHz/V·V − 2.5 kHz/V²·V²: Kvco from 36.5 kHz/V (0.7 V) to 25 kHz/V (3 V).
    expect(r.kvco.maxHzPerV).toBeGreaterThan(36e3);
    expect(r.kvco.maxHzPerV).toBeLessThan(37e3);
    expect(r.kvco.minHzPerV).toBeGreaterThan(24.5e3);
    expect(r.kvco.minHzPerV).toBeLessThan(25.5e3);
  });
  it('--fit poly:2 gives unscaled coefficients of the fixture curve', async () => {
    const { code, out } = await cli('analyze', fixture, '--json', '--fit', 'poly:2');
    expect(code).toBe(0);
    const r = JSON.parse(out) as { fit: { degree: number; coefficients: number[]; selection: string } };
    expect(r.fit.degree).toBe(2);
    expect(r.fit.selection).toBe('user');
    expect(r.fit.coefficients[0]).toBeCloseTo(20000, -1);
    expect(r.fit.coefficients[1]).toBeCloseTo(40000, -1);
    expect(r.fit.coefficients[2]).toBeCloseTo(-2500, -1);
  });
  it('--nominal and --linearity-limit reach the analysis; bad values are usage errors', async () => {
    const { code, out } = await cli('analyze', fixture, '--json', '--nominal', '1500m', '--linearity-limit', '1');
    expect(code).toBe(0);
    const r = JSON.parse(out) as SweepAnalysis;
    expect(r.kvco.nominal.v).toBe(1.5);
    expect(r.kvco.widestLinearRange?.limitPct).toBe(1);
    expect(r.kvco.widestLinearRange?.maxLinearityErrorPct).toBeLessThanOrEqual(1);
    expect((await cli('analyze', fixture, '--nominal', 'high')).code).toBe(2);
  });
  it('prints a readable summary without --json', async () => {
    const { code, out } = await cli('analyze', fixture);
    expect(code).toBe(0);
    expect(out).toMatch(/stall threshold\s+450 ± 50 mV/);
  });
});

describe('tunebench analyze: drift CSV and run folders', () => {
  it('analyses a drift CSV with the CONTRACTS.md drift keys', async () => {
    const rows = ['time_s,frequency_hz,temperature_c'];
    for (let i = 0; i < 600; i++) {
      const c = 25 + (5 * i) / 599;
      rows.push(`${i},${(1e6 + 10 * (c - 25)).toFixed(4)},${c.toFixed(4)}`);
    }
    const file = join(dir, 'drift.csv');
    await writeFile(file, rows.join('\n'));
    const { code, out } = await cli('analyze', file, '--json');
    expect(code).toBe(0);
    const r = JSON.parse(out) as {
      kind: string;
      meanHz: number;
      tempcoPpmPerC: number;
      tempcoHzPerC: number;
      driftPpmPerHour: number;
      adev: { tauS: number; adev: number }[];
    };
    expect(r.kind).toBe('drift');
    expect(r.tempcoHzPerC).toBeCloseTo(10, 3);
    expect(r.tempcoPpmPerC).toBeCloseTo((10 / (1e6 + 25)) * 1e6, 3);
    // The log rises 10 Hz/°C × 5 °C over 599 s, a straight ramp: the drift line's slope is exactly that, in ppm/h of the mean.
    expect(r.driftPpmPerHour).toBeCloseTo(((((10 * 5) / 599) * 3600) / r.meanHz) * 1e6, 3);
    expect(r.adev[0]?.tauS).toBe(1);
  });
  it('analyses a pushing run CSV (time_s, control_v, supply_v, frequency_hz, status)', async () => {
    const rows = ['time_s,control_v,supply_v,frequency_hz,status'];
    [4.5, 5, 5.5].forEach((s, i) => {
      for (let r = 0; r < 3; r++) rows.push(`${i * 3 + r},2,${s},${4e8 + 3e3 * (s - 5)},ok`);
    });
    rows.push('9,2,6,,timeout'); // says nothing about oscillation: dropped
    const file = join(dir, 'pushing.csv');
    await writeFile(file, rows.join('\n'));
    const { code, out } = await cli('analyze', file, '--json');
    expect(code).toBe(0);
    const r = JSON.parse(out) as {
      kind: string;
      pushingHzPerV: number;
      pushingPpmPerV: number;
      points: unknown[];
      controlV: number;
    };
    expect(r.kind).toBe('pushing');
    expect(r.pushingHzPerV).toBeCloseTo(3e3, 5);
    expect(r.pushingPpmPerV).toBeCloseTo(7.5, 9); // 3 kHz/V on 400 MHz
    expect(r.points).toHaveLength(3);
    expect(r.controlV).toBe(2);
  });
  it('reads a run folder, taking the gate time from the plan', async () => {
    const run = join(dir, 'run-1');
    await mkdir(run);
    const meta = {
      schema: 'tunebench.run/1',
      id: 'run-1',
      kind: 'sweep',
      status: 'complete',
      startedAt: '2026-01-01T00:00:00Z',
      endedAt: '2026-01-01T00:01:00Z',
      dut: { id: 'clock-mult-7', notes: '' },
      instruments: [],
      plan: { start: 1, stop: 2, step: 0.25, gateS: 0.01 },
      software: { version: '0.1.0' },
    };
    await writeFile(join(run, 'run.json'), JSON.stringify(meta));
    const rows = ['time_s,control_v,frequency_hz,direction,status'];
    [1, 1.25, 1.5, 1.75, 2].forEach((v, i) => rows.push(`${i},${v},${1e6 + 5e5 * v},up,ok`));
    await writeFile(join(run, 'samples.csv'), rows.join('\n') + '\n');
    await writeFile(join(run, 'events.jsonl'), '{"time_s":1,"type":"retry"}\n{"time_s":2,"type":"retry"}\n');
    const { code, out } = await cli('analyze', run, '--json');
    expect(code).toBe(0);
    const r = JSON.parse(out) as {
      counter: { resolutionHz: number };
      kvco: { linear: { slopeHzPerV: number } };
      run: { id: string; eventsByType: Record<string, number> };
    };
    expect(r.run.eventsByType).toEqual({ retry: 2 });
    expect(r.counter.resolutionHz).toBeCloseTo(100, 9);
    expect(r.kvco.linear.slopeHzPerV).toBeCloseTo(5e5, 4);
    expect(r.run.id).toBe('run-1');
  });
});

describe('tunebench analyze: bad input and failed work', () => {
  it('exit 2 with a line-numbered message for a malformed CSV', async () => {
    const file = join(dir, 'bad.csv');
    await writeFile(file, 'control_v,frequency_hz\n0.5,1000\n0.6,abc\n');
    const { code, err } = await cli('analyze', file);
    expect(code).toBe(2);
    expect(err).toContain('line 3, column frequency_hz: "abc" is not a number');
  });
  it('exit 2 for a missing file, a bad --fit and a CSV of unknown shape', async () => {
    expect((await cli('analyze', join(dir, 'nope.csv'))).code).toBe(2);
    expect((await cli('analyze', fixture, '--fit', 'poly:9')).err).toMatch(/--fit/);
    const file = join(dir, 'odd.csv');
    await writeFile(file, 'volts,hz\n1,2\n');
    const r = await cli('analyze', file);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/line 1: missing column "frequency_hz"/);
  });
  it('exit 1 when the oscillator stalled over the whole range', async () => {
    const file = join(dir, 'dead.csv');
    await writeFile(file, 'control_v,frequency_hz\n0.5,0\n1.0,9.91E37\n1.5,\n');
    const r = await cli('analyze', file);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/stalled over the whole range/);
  });
});
