import { describe, expect, it } from 'vitest';
import { summarizeAnalysis } from './analysis-summary.ts';
import { analyzeDrift } from './drift-analysis.ts';
import { analyzePushing } from './pushing-analysis.ts';

describe('summarizeAnalysis', () => {
  it('drift: tempco, warm-up and the ADEV table with term counts', () => {
    const n = 64;
    const text = summarizeAnalysis(
      analyzeDrift({
        timeS: Float64Array.from({ length: n }, (_, i) => i),
        frequencyHz: Float64Array.from({ length: n }, (_, i) => 1e7 + 50 * (i / 63)),
        temperatureC: Float64Array.from({ length: n }, (_, i) => 25 + i / 63),
      }),
    );
    expect(text).toContain('tempco            5.000 ppm/°C'); // 50 Hz/°C on 10 MHz, exact: no ± at the numerical floor
    expect(text).toMatch(/tau\s+1.00 s\s+\S+\s+\(63 terms\)/);
  });
  it('pushing: Hz/V and ppm/V at the nominal supply', () => {
    const text = summarizeAnalysis(
      analyzePushing({
        supplyV: new Float64Array([3, 3.3, 3.6]),
        frequencyHz: new Float64Array([399.9e6, 400e6, 400.1e6]),
      }),
    );
    expect(text).toContain('(833 ppm/V) at 3.300 V supply');
  });
});
