/**
 * Issue 9 item 5 reproductions: figures that claimed more than the data
 * support. Each failed before: a 30 s log printed a drift rate and a warm-up
 * of 0 min side by side, ADEV at the counter's ±1-count floor was not marked,
 * and an exact straight line reported picohertz residuals.
 */
import { describe, expect, it } from 'vitest';
import { summarizeAnalysis } from './analysis-summary.ts';
import { analyzeDrift } from './drift-analysis.ts';
import { analyzeSweep } from './sweep-analysis.ts';
import { gaussian } from './tuning-laws.test-support.ts';

/** A short log of an 18.44 kHz oscillator read with a 100 ms gate (whole counts: 10 Hz steps), one reading per second. */
function shortLog(seconds: number) {
  const rnd = gaussian(9);
  const n = seconds + 1;
  const timeS = Float64Array.from({ length: n }, (_, i) => i);
  const frequencyHz = Float64Array.from({ length: n }, () => Math.round((18442.7 + 4 * rnd()) / 10) * 10);
  return { timeS, frequencyHz };
}

describe('drift figures from short logs', () => {
  it('30 s log: drift rate not significant, warm-up undetermined rather than 0 min, ADEV marked resolution-limited', () => {
    const a = analyzeDrift(shortLog(30), { gateS: 0.1 });
    expect(a.driftSignificant).toBe(false);
    expect(a.warmUp.warmUpS).toBeNull();
    expect(a.warmUp.determined).toBe(false);
    // ±1 count in 0.1 s at 18.44 kHz: 10 Hz / 18.44 kHz = 5.4e-4.
    expect(a.resolutionFloor).toBeCloseTo(10 / a.meanHz, 12);
    expect(a.adev[0]?.resolutionLimited).toBe(true);
    const text = summarizeAnalysis(a);
    expect(text).toMatch(/drift after it +not significant over 30\.0 s \(±/);
    expect(text).toMatch(/warm-up +undetermined/);
    expect(text).toMatch(/resolution-limited \(±1 count\)/);
    // 10 Hz resolution: no digit below 10 Hz in the mean.
    expect(text).toMatch(/mean frequency +18\.44 kHz/);
  });
  it('2 s log: warned as too short for a drift rate', () => {
    const a = analyzeDrift(shortLog(2), { gateS: 0.1 });
    expect(a.warnings.some((w) => /only 2 interval\(s\) in the log/.test(w))).toBe(true);
    expect(a.driftSignificant).toBe(false);
  });
});

describe('an exact straight line', () => {
  it('reports residual SD 0 and linearity 0, not rounding noise', () => {
    const v = Float64Array.from({ length: 21 }, (_, i) => 0.5 + i * 0.2);
    const a = analyzeSweep({ controlV: v, frequencyHz: v.map((x) => 1e5 + 2e5 * x) });
    expect(a.fit.residualStdDevHz).toBe(0);
    expect(a.kvco.linear.maxLinearityErrorPct).toBe(0);
    const text = summarizeAnalysis(a);
    expect(text).toMatch(/residual SD 0 Hz/);
    expect(text).toMatch(/worst linearity error 0 %/);
  });
});
