/**
 * No raw floating-point text reaches the sweep, drift and runs screens: every
 * key figure, note and plot-region title the screens show comes from these
 * view-model functions, and each is checked here on real analyses (a sweep of
 * the simulated relaxation DUT, drift logs, a pushing run) for
 * - numbers with more digits than any figure on a screen supports
 *   ("4.300000000000001 V", "0.24998171599997931 s", issue 11 item 6), and
 * - "value ± u" pairs where u has more than two significant digits or the value
 *   other decimals than u (GUM §7.2.6, common practice).
 * The gain-table screen's cells go through displayRow (screen-cli-parity.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { analyzeDrift } from '../analysis/drift-analysis.ts';
import { analyzePushing } from '../analysis/pushing-analysis.ts';
import { analyzeSweep } from '../analysis/sweep-analysis.ts';
import { simSweep } from '../../test/testing/sim-sweep.ts';
import { adevColumns, driftKeyFigures } from './drift/drift-key-figures.ts';
import type { FigureText } from './figure-text.ts';
import { readingText } from './figure-text.ts';
import { kvcoText } from './runs/archive-view.ts';
import { pushingKeyFigures } from './runs/pushing-figures.ts';
import { sweepRegions } from './sweep/sweep-figures.ts';
import { sweepKeyFigures } from './sweep/sweep-key-figures.ts';

/**
 * Numbers written out with more than 7 significant digits and no ± after them: nothing a bench figure on
 * screen supports without its uncertainty (a 400 MHz value ± 1.5 Hz may carry 10; its ± says so).
 */
function rawFloats(text: string): string[] {
  return [...text.matchAll(/\d[\d.]*\d(?![\d.]| ±)/g)]
    .map((m) => m[0])
    .filter((n) => n.replace(/^[0.]+/, '').replace('.', '').length > 7);
}

/** "a ± b" pairs whose u has more than 2 significant digits or whose decimals differ. */
function badUncertainty(text: string): string[] {
  const bad: string[] = [];
  for (const m of text.matchAll(/(−?\d+(?:\.(\d+))?) ± (\d+(?:\.(\d+))?)/g)) {
    const [whole, , valueDecimals = '', u = '', uDecimals = ''] = m;
    const significant = u.replace('.', '').replace(/^0+/, '');
    if (significant.length > 2 && uDecimals.length > 0) bad.push(whole);
    if (valueDecimals.length !== uDecimals.length) bad.push(whole);
  }
  return bad;
}

function texts(figures: readonly FigureText[]): string[] {
  return figures.flatMap((f) => [f.value, f.note ?? '']);
}

function expectClean(all: readonly string[]): void {
  for (const text of all) {
    expect(rawFloats(text), text).toEqual([]);
    expect(badUncertainty(text), text).toEqual([]);
  }
}

const base = {
  readingsPerPoint: 5,
  gateS: 0.1,
  settle: { mode: 'auto', maxS: 2 },
  limits: { maxControlV: 5, currentLimitA: 0.02 },
  safe: { controlV: 0, outputOff: true },
};

describe('sweep screen figures', () => {
  it('a 0.2 V-step sweep of the relaxation DUT (voltages like 4.300000000000001) shows no raw float', async () => {
    const s = await simSweep('relaxation', 2, { ...base, start: 0.6, stop: 4.8, step: 0.2, direction: 'up-down' });
    const a = analyzeSweep(s.input);
    // The reproduction's voltage really is in the data: sums of 0.2 V steps are not round.
    expect(a.points.some((p) => String(p.v).length > 8)).toBe(true);
    const figures = sweepKeyFigures(a);
    expect(figures.map((f) => f.testId)).toEqual(
      expect.arrayContaining(['tuning-range', 'kvco-min', 'kvco-max', 'stall-threshold', 'hysteresis', 'fit-model']),
    );
    const regions = sweepRegions(a).map((r) => r.title);
    expect(regions.length).toBeGreaterThanOrEqual(2);
    expectClean([...texts(figures), ...regions, readingText(a.points[20]?.meanHz, 10)]);
    // Figures carry their ±.
    expect(figures.find((f) => f.testId === 'kvco-max')?.value).toMatch(/ ± /);
    expect(figures.find((f) => f.testId === 'stall-threshold')?.value).toMatch(/ ± /);
  });
});

describe('drift screen figures', () => {
  /** A 30 s log at 1 s of an 18.44 kHz oscillator read with a 100 ms gate (10 Hz counts). */
  function shortLog(slopeHzPerS: number) {
    const n = 31;
    const timeS = Float64Array.from({ length: n }, (_, i) => i);
    const frequencyHz = Float64Array.from(
      timeS,
      (t, i) => Math.round((18442.667 + slopeHzPerS * t + (i % 3) * 4) / 10) * 10,
    );
    const temperatureC = Float64Array.from(timeS, (t) => 24.98 + 0.001 * t);
    return analyzeDrift({ timeS, frequencyHz, temperatureC }, { gateS: 0.1 });
  }

  it('a 30 s log: the drift rate is "not significant over 30.0 s (±σ)", never bold, and the mean stops at 10 Hz', () => {
    const a = shortLog(0);
    const figures = driftKeyFigures(a, 2.5);
    expectClean(texts(figures));
    const rate = figures.find((f) => f.testId === 'drift-rate');
    expect(rate?.value).toMatch(/^not significant over 30\.0 s \(±/);
    expect(rate?.significant).toBe(false);
    // 18.44 kHz at a 10 Hz resolution (the "18.4426667 kHz" showed digits 10 Hz cannot support).
    expect(figures.find((f) => f.testId === 'drift-mean')?.value).toMatch(/^18\.4\d kHz$/);
    expect(figures.find((f) => f.testId === 'drift-hold')?.value).toBe('2.500 V');
  });

  it('marks ADEV points at the ±1-count floor as their own series', () => {
    const a = shortLog(0);
    const columns = adevColumns(a);
    expect(columns.tauS.length).toBe(a.adev.length);
    for (const [i, p] of a.adev.entries()) expect(columns.limited[i]).toBe(p.resolutionLimited ? p.adev : null);
    // 10 Hz steps on 18.44 kHz: the 1 s point sits at the counter's floor 1/(gate·f) ≈ 5.4e-4.
    expect(a.adev[0]?.resolutionLimited).toBe(true);
    expect(columns.limited[0]).not.toBeNull();
  });
});

describe('runs screen figures', () => {
  it('pushing figures and the archive Kvco cell carry ± with the digits u supports', () => {
    const supplyV = Float64Array.from([4.5, 4.5, 4.75, 4.75, 5, 5, 5.25, 5.25, 5.5, 5.5]);
    const noise = [-3.3, 5.1, 1.7, -4.2, 2.9, 0.4, 6.3, -2.8, 1.1, 3.6];
    const frequencyHz = Float64Array.from(supplyV, (v, i) => 4.0e8 + 2e3 * (v - 5) + (noise[i] ?? 0));
    const figures = pushingKeyFigures(analyzePushing({ supplyV, frequencyHz }));
    expectClean(texts(figures));
    expect(figures.find((f) => f.testId === 'pushing-hz-per-v')?.value).toMatch(/ ± .*Hz\/V$/);
    expect(kvcoText(9734.123456789, 183.456)).toBe('9.73 ± 0.18 kHz/V');
  });
});
