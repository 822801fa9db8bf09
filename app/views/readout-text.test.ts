/**
 * The plots' cursor read-outs (the legend's live values and the two-cursor
 * line) show only the digits each series supports (issue 11 item 6). Every
 * read-out text the sweep, drift, pushing and loop-filter plots would show is
 * produced here on real analyses — a sweep and a drift log of the simulated
 * relaxation DUT through the real procedures and SCPI drivers, a pushing run,
 * the loop designed on that sweep — and scanned:
 * - a value without ± may not write a digit finer than the decade of what the
 *   series resolves (a counter's 1/gate, 10 Hz at a 0.1 s gate; the supply's
 *   1 mV setting step; 0.01 °C; 0.1 dB) — "18.4427 kHz" for a 10 Hz count fails;
 * - a "value ± u" pair keeps u to two significant digits, the value to u's
 *   decimals (GUM §7.2.6, common practice), and u never below the ±1-count
 *   floor 1/(gate·√12) (GUM §4.3.7) — a mean cannot be known better than
 *   the counter counts.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { BenchApi, BenchEvent } from '../contract/bench-api.ts';
import { benchEventSchema } from '../contract/wire-schemas.ts';
import { driftPlanSchema } from '../contract/plans.ts';
import { analyzeDrift } from '../analysis/drift-analysis.ts';
import { formatSi } from '../analysis/format-si.ts';
import { logFrequencies, openLoopResponse } from '../analysis/loop-filter-eval.ts';
import { loopOperatingPoint } from '../analysis/loop-operating-point.ts';
import { analyzePushing } from '../analysis/pushing-analysis.ts';
import { analyzeSweep } from '../analysis/sweep-analysis.ts';
import { cursorTexts } from '../plots/cursor-pair.ts';
import { readPlotColors } from '../plots/plot-colors.ts';
import { readoutText } from '../plots/readout.ts';
import { simSweep } from '../../test/testing/sim-sweep.ts';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG } from '../../main/bench/assemble.ts';
import { campaignDut, campaignPlanInput } from '../../main/procedures/campaign/demo-campaign.ts';
import { startCampaignSession } from '../../main/service/campaign-session.ts';
import { runDrift } from '../../main/procedures/drift.ts';
import { MemorySink } from '../../main/procedures/testing/fake-bench.ts';
import { VirtualClock } from '../../main/time/virtual-clock.ts';
import { campaignFeed, liveReadingReadout } from './campaign/campaign-feed.ts';
import { driftReadouts } from './drift/drift-readouts.ts';
import { bodeOptions } from './loop/bode-options.ts';
import { designAtLock } from './loop/loop-design.ts';
import { checkLoopDraft, DEFAULT_LOOP, suggestedLoop } from './loop/loop-inputs.ts';
import { pushingPlotColumns, pushingReadouts } from './runs/pushing-figures.ts';
import { fitOnX, gainColumns, residualColumns } from './sweep/sweep-figures.ts';
import { residualUncertainty, sweepReadouts } from './sweep/sweep-readouts.ts';

const PREFIX: Readonly<Record<string, number>> = { p: 1e-12, n: 1e-9, µ: 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9 };

/** Place value of the last written digit of a number ("18.44" → 0.01; "650" → 10: trailing zeros of a whole number say nothing). */
function lastDigit(number: string): number {
  const [whole = '', decimals] = number.replace('−', '').split('.');
  if (decimals !== undefined) return 10 ** -decimals.length;
  const zeros = /0*$/.exec(whole)?.[0].length ?? 0;
  return 10 ** Math.min(zeros, whole.length - 1);
}

interface Support {
  /** What the series resolves, in base units: a digit finer than its decade is unsupported. */
  resolution?: number;
  /** Smallest 1σ a "± u" may claim, base units. */
  uFloor?: number;
}

/** What is wrong with one read-out text for a series with this support ([] when nothing). */
function unsupported(text: string, unit: string, support: Support): string[] {
  const bad: string[] = [];
  if (text === '—') return bad;
  const escaped = unit.replace(/[/]/g, '\\/');
  const exp = /^\((−?[\d.]+) ± ([\d.]+)\)e(-?\d+)$/.exec(text);
  const pm = new RegExp(`^(−?[\\d.]+) ± ([\\d.]+) ([pnµmkMG]?)${escaped}$`).exec(text);
  const plain = new RegExp(`^(−?[\\d.]+)(?: ([pnµmkMG]?)${escaped})?$`).exec(text);
  let scale = 1;
  let value = '';
  let u: string | null = null;
  if (exp) [, value = '', u = '', scale] = [exp[0], exp[1], exp[2], 10 ** Number(exp[3])];
  else if (pm) [value, u, scale] = [pm[1] ?? '', pm[2] ?? '', PREFIX[pm[3] ?? ''] ?? NaN];
  else if (plain) [value, scale] = [plain[1] ?? '', PREFIX[plain[2] ?? ''] ?? NaN];
  else return [`unreadable read-out "${text}"`];
  const step = lastDigit(value) * scale;
  if (u !== null) {
    const uDigits = u.replace('.', '').replace(/^0+/, '');
    if (uDigits.length > 2) bad.push(`${text}: u has more than 2 significant digits`);
    if ((value.split('.')[1] ?? '').length !== (u.split('.')[1] ?? '').length)
      bad.push(`${text}: value and u end at different decimals`);
    if (support.uFloor !== undefined && Number(u) * scale < support.uFloor * 0.95)
      bad.push(`${text}: u below the series' floor ${support.uFloor}`);
  } else if (support.resolution !== undefined) {
    const decade = 10 ** Math.floor(Math.log10(support.resolution) + 1e-9);
    if (step < decade * (1 - 1e-9))
      bad.push(`${text}: digit of ${step} finer than the resolution ${support.resolution}`);
  } else {
    bad.push(`${text}: neither ± nor a resolution to judge it by`);
  }
  return bad;
}

function expectSupported(texts: readonly string[], unit: string, support: Support): void {
  expect(texts.length).toBeGreaterThan(0);
  expect(texts.flatMap((t) => unsupported(t, unit, support))).toEqual([]);
}

const GATE_S = 0.1;
const COUNT_HZ = 1 / GATE_S;
const COUNT_FLOOR_HZ = COUNT_HZ / Math.sqrt(12);
const plan = {
  readingsPerPoint: 5,
  gateS: GATE_S,
  settle: { mode: 'auto', maxS: 2 },
  limits: { maxControlV: 5, currentLimitA: 0.02 },
  safe: { controlV: 0, outputOff: true },
  start: 0.6,
  stop: 4.8,
  step: 0.2,
  direction: 'up-down',
};

describe('the checker', () => {
  it('flags the digits a fixed 6-significant read-out wrote, and passes what the data support', () => {
    // The old read-out: si(value, unit, 6) whatever the reading supports.
    expect(unsupported(formatSi(18442.67, 'Hz', 6), 'Hz', { resolution: 10 })).not.toEqual([]);
    expect(unsupported(formatSi(4.300000000000001, 'V', 5), 'V', { resolution: 1e-3 })).not.toEqual([]);
    expect(unsupported('18.4427 ± 0.0058 kHz', 'Hz', { uFloor: 2.9 })).toEqual([]);
    expect(unsupported('18.4427 ± 0.0006 kHz', 'Hz', { uFloor: 2.9 })).not.toEqual([]);
    expect(unsupported('18.44 kHz', 'Hz', { resolution: 10 })).toEqual([]);
    expect(unsupported('650 mV', 'V', { resolution: 1e-3 })).toEqual([]);
    expect(unsupported('(5.40 ± 0.30)e-4', '', {})).toEqual([]);
  });
});

describe('sweep plots (simulated relaxation DUT, up-down, 0.1 s gate)', () => {
  it('readings to 10 Hz, setpoints to 1 mV, fit, Kvco and residuals with their ±, cursors likewise', async () => {
    const s = await simSweep('relaxation', 2, plan);
    const a = analyzeSweep(s.input);
    const xs = Array.from(s.input.controlV);
    const fs = Array.from(s.input.frequencyHz).filter((f) => f > 0);
    const gain = gainColumns(a);
    const residuals = residualColumns(a);
    const r = sweepReadouts(a, GATE_S, (i) => xs[i], gain, residualUncertainty(a, GATE_S));

    expectSupported(
      xs.map((v) => readoutText(r.control, v)),
      'V',
      { resolution: 1e-3 },
    );
    expectSupported(
      fs.map((f) => readoutText(r.reading, f)),
      'Hz',
      { resolution: COUNT_HZ },
    );
    // What the old read-out wrote for these very readings is caught.
    expect(fs.flatMap((f) => unsupported(formatSi(f, 'Hz', 6), 'Hz', { resolution: COUNT_HZ })).length).toBeGreaterThan(
      0,
    );
    const fit = fitOnX(a, xs);
    const fitTexts = fit.map((f, i) => readoutText(r.fit, f, i)).filter((t) => t !== '—');
    expect(fitTexts.every((t) => / ± /.test(t))).toBe(true);
    expectSupported(fitTexts, 'Hz', { uFloor: COUNT_FLOOR_HZ });

    const kvcoTexts = [...gain.stable, ...gain.unstable].map((k, i) => readoutText(r.kvco, k, i % gain.v.length));
    expectSupported(
      kvcoTexts.filter((t) => t !== '—'),
      'Hz/V',
      {},
    );
    // Each local Kvco's ± is the analysis' own uncertainty, rounded to two digits.
    const local = [...a.kvco.local].sort((p, q) => p.v - q.v);
    gain.stable.forEach((k, i) => {
      if (k === null) return;
      const [, uText = '', prefix = ''] = / ± ([\d.]+) ([kM]?)Hz\/V$/.exec(readoutText(r.kvco, k, i)) ?? [];
      const u = Number(uText) * (PREFIX[prefix] ?? NaN);
      expect(Math.abs(u / (local[i]?.uncertaintyHzPerV ?? NaN) - 1)).toBeLessThan(0.06);
    });

    const residualTexts = residuals.residualHz.map((f, i) => readoutText(r.residual, f, i)).filter((t) => t !== '—');
    expectSupported(residualTexts, 'Hz', { uFloor: COUNT_FLOOR_HZ });

    // Two cursors on readings across the curve: ΔV to 1 mV, Δf to 10 Hz, the slope with its ±.
    const okRows = xs.map((v, i) => ({ x: v, y: s.input.frequencyHz[i] as number })).filter((m) => m.y > 0);
    for (const [i, j] of [
      [0, okRows.length - 1],
      [3, 9],
      [10, 11],
    ] as const) {
      const text = cursorTexts([okRows[i]!, okRows[j]!], r.control, r.reading);
      const [, dv = '', df = '', slope = ''] = /^ΔV (.*) · Δf (.*) · slope (.*)$/.exec(text.deltas ?? '') ?? [];
      expectSupported([readoutTextOnly(text.a)[0] ?? '', readoutTextOnly(text.b)[0] ?? ''], 'V', { resolution: 1e-3 });
      expectSupported([readoutTextOnly(text.a)[1] ?? '', readoutTextOnly(text.b)[1] ?? ''], 'Hz', {
        resolution: COUNT_HZ,
      });
      expectSupported([dv], 'V', { resolution: 1e-3 });
      expectSupported([df], 'Hz', { resolution: COUNT_HZ });
      if (slope !== '— (same x)') {
        expect(slope).toMatch(/ ± /);
        expectSupported([slope], 'Hz/V', {});
      }
    }
  }, 60_000);
});

/** "A: 1.200 V, 18.44 kHz" → ["1.200 V", "18.44 kHz"]. */
function readoutTextOnly(text: string | null): string[] {
  return (text ?? '').split(', ');
}

describe('drift plots (simulated relaxation DUT, 150 readings at 1 s, 0.1 s gate)', () => {
  it('frequencies to 10 Hz, temperatures to 0.01 °C, clock times, Allan points with their confidence', async () => {
    const clock = new VirtualClock({ autoAdvance: true });
    const bench = await assembleBench('sim', { clock, sim: { dut: 'relaxation', seed: 5 } });
    const sink = new MemorySink();
    const driftPlan = driftPlanSchema.parse({
      controlV: 2.5,
      intervalS: 1,
      durationS: 150,
      gateS: GATE_S,
      limits: { maxControlV: 5, currentLimitA: 0.02 },
    });
    try {
      await clock.runUntil(runDrift({ bench, plan: driftPlan, clock, sink }));
    } finally {
      await bench.close();
    }
    const ok = sink.rows.filter((row) => row.status === 'ok');
    const timeS = Float64Array.from(ok, (row) => row.time_s as number);
    const frequencyHz = Float64Array.from(ok, (row) => row.frequency_hz as number);
    const temperatureC = Float64Array.from(ok, (row) => row.temperature_c as number);
    expect(ok.length).toBeGreaterThanOrEqual(140);
    const a = analyzeDrift({ timeS, frequencyHz, temperatureC }, { gateS: GATE_S });
    const r = driftReadouts(GATE_S, a);

    expectSupported(
      Array.from(frequencyHz, (f) => readoutText(r.frequency, f)),
      'Hz',
      { resolution: COUNT_HZ },
    );
    expectSupported(
      Array.from(temperatureC, (t) => readoutText(r.temperature, t)),
      '°C',
      { resolution: 0.01 },
    );
    // Times as a clock says them: "12.3 s" under a minute (a reading spans its 0.1 s gate), "2 min 05 s" past it.
    const times = Array.from(timeS, (t) => readoutText(r.time, t));
    for (const t of times) expect(t).toMatch(/^(\d+(\.\d)? s|\d+ min( \d\d s)?)$/);
    expect(times.some((t) => /min/.test(t))).toBe(true);
    // σy(τ) with its confidence, e.g. "(5.4 ± 1.2)e-4": never the 3 bare digits the old read-out wrote.
    const adevTexts = a.adev.map((p, i) => readoutText(r.adev, p.adev, i));
    expect(adevTexts.every((t) => /^\([\d.]+ ± [\d.]+\)e-\d+$/.test(t))).toBe(true);
    expectSupported(adevTexts, '', {});
    expect(a.adev.map((p) => readoutText(r.tau, p.tauS))[0]).toBe('1.00 s');
    // The drift rate between two cursors on readings: Δt as a clock, Δf to 10 Hz, Hz/s with its ±.
    const text = cursorTexts(
      [
        { x: timeS[5] as number, y: frequencyHz[5] as number },
        { x: timeS[120] as number, y: frequencyHz[120] as number },
      ],
      r.time,
      r.frequency,
    );
    expect(text.deltas).toMatch(/^Δt 1 min 55 s · Δf .* · slope .* ± .*Hz\/s$/);
  }, 60_000);
});

describe('live campaign sweep plot (simulated campaign bench, 0.1 s gate)', () => {
  it('writes the readings the campaign pushes to the page to 10 Hz, not to 7 significant digits', async () => {
    const runsDir = await mkdtemp(join(tmpdir(), 'tunebench-campaign-readout-'));
    const clock = new VirtualClock({ autoAdvance: true });
    const bench = await assembleBench(SIM_CAMPAIGN_BENCH_CONFIG, { clock, sim: { dut: campaignDut(), seed: 4 } });
    // The page's side: every pushed event checked by the wire schema, then into the campaign screen's feed.
    const listeners = new Set<(event: BenchEvent) => void>();
    const page = {
      subscribe: (listener: (event: BenchEvent) => void) => {
        listeners.add(listener);
        return () => listeners.delete(listener);
      },
    } as Pick<BenchApi, 'subscribe'> as BenchApi;
    const feed = campaignFeed(page);
    const base = campaignPlanInput();
    const plan = campaignPlanInput({
      temperaturesC: [25],
      supplyV: [5],
      soak: { ...base.soak, dwellS: 60 },
      sweep: { ...base.sweep, start: 2, stop: 3, step: 0.1, gateS: GATE_S },
    });
    try {
      const session = await startCampaignSession(
        {
          bench,
          clock,
          runsDir,
          batchMs: 1,
          emit: (event) => {
            const checked = benchEventSchema.parse(event);
            for (const listener of listeners) listener(checked);
          },
        },
        { plan },
      );
      expect((await session.done)?.file.status).toBe('complete');
    } finally {
      await bench.close();
      await rm(runsDir, { recursive: true, force: true });
    }
    const readings = feed.sweep.f.filter((f): f is number => f !== null && f > 0);
    expect(readings.length).toBeGreaterThan(20);
    expectSupported(
      readings.map((f) => readoutText(liveReadingReadout(feed.sweep), f)),
      'Hz',
      { resolution: COUNT_HZ },
    );
    expect(feed.sweep.gateS).toBe(GATE_S);
  }, 60_000);
});

describe('pushing plot', () => {
  it('supply setpoints to 1 mV, each mean with its ±, the line to 1/gate', () => {
    const supplyV = Float64Array.from([4.5, 4.5, 4.75, 4.75, 5, 5, 5.25, 5.25, 5.5, 5.5]);
    // 1 s gate: whole hertz, as a counter would read a 400 MHz LO.
    const noise = [-3, 5, 2, -4, 3, 0, 6, -3, 1, 4];
    const frequencyHz = Float64Array.from(supplyV, (v, i) => 4.0e8 + 2e3 * (v - 5) + (noise[i] ?? 0));
    const plot = pushingPlotColumns(analyzePushing({ supplyV, frequencyHz }), 1);
    const r = pushingReadouts(plot, 1);
    expectSupported(
      plot.supplyV.map((v) => readoutText(r.supply, v)),
      'V',
      { resolution: 1e-3 },
    );
    const means = plot.meanHz.map((f, i) => readoutText(r.mean, f, i));
    expect(means.every((t) => / ± /.test(t))).toBe(true);
    expectSupported(means, 'Hz', { uFloor: 1 / Math.sqrt(12) });
    expectSupported(
      plot.lineHz.map((f) => readoutText(r.line, f)),
      'Hz',
      { resolution: 1 },
    );
  });
});

describe('loop-filter Bode plots (the loop suggested for the simulated sweep)', () => {
  it('gain to 0.1 dB, phase to 0.1°, frequencies to 3 digits', async () => {
    const s = await simSweep('relaxation', 2, { ...plan, direction: 'up' });
    const a = analyzeSweep(s.input);
    const values = checkLoopDraft({ ...DEFAULT_LOOP, ...suggestedLoop(a) }).values;
    if (!values) throw new Error('the suggested loop does not parse');
    const outcome = designAtLock(loopOperatingPoint(a, values.referenceHz, values.dividerN), values);
    if (!outcome.ok) throw new Error(outcome.error);
    const freqs = logFrequencies(values.loopBandwidthHz / 100, values.loopBandwidthHz * 100, 300);
    const response = openLoopResponse(outcome.design.filter, { ...values, kvcoHzPerV: a.kvco.typHzPerV }, freqs);
    const colors = readPlotColors(null);
    const corners = outcome.checks.map((c) => ({
      label: c.label,
      crossoverHz: c.crossoverHz,
      phaseMarginDeg: c.phaseMarginDeg,
    }));
    for (const [kind, ys, unit, resolution] of [
      ['magnitude', response.magnitudeDb, 'dB', 0.1],
      ['phase', response.phaseDeg, '°', 0.1],
    ] as const) {
      const series = bodeOptions(kind, corners, colors, 800, 300).series;
      const value = series[1]?.value;
      const xValue = series[0]?.value;
      if (typeof value !== 'function' || typeof xValue !== 'function') throw new Error('no read-out callback');
      const texts = Array.from(ys, (y, i) => String(value(null as never, y, 1, i)));
      expectSupported(
        texts.map((t) => t.replace(/°$/, ' °')),
        unit,
        { resolution },
      );
      const xTexts = Array.from(freqs, (f, i) => String(xValue(null as never, f, 0, i)));
      // 3 significant digits: never more than the grid's 3 % steps tell apart.
      for (const t of xTexts) expect(t.replace(/\D/g, '').replace(/^0+/, '').length, t).toBeLessThanOrEqual(3);
    }
  }, 60_000);
});
