import { describe, expect, it } from 'vitest';
import { listVolts } from './list-volts.ts';
import { analyzeSweep } from './sweep-analysis.ts';

describe('listVolts', () => {
  it('lists up to eight voltages as they are, more as the first eight and the count', () => {
    expect(listVolts([1.5, 2])).toBe('1.5, 2');
    expect(listVolts([1, 2, 3, 4, 5, 6, 7, 8])).toBe('1, 2, 3, 4, 5, 6, 7, 8');
    expect(listVolts([1, 2, 3, 4, 5, 6, 7, 8, 9, 10])).toBe('1, 2, 3, 4, 5, 6, 7, 8 … (10 voltages)');
  });

  it('a sweep whose finely spaced single readings fall back at thousands of points warns in one short line', () => {
    // 20,000 points 4 µV apart, one reading each, 2 kHz/V with ±0.5 Hz of scatter: the
    // step (8 mHz) is far below the scatter, so the measured curve falls back all over.
    const n = 20_000;
    const controlV = Float64Array.from({ length: n }, (_, i) => 0.5 + i * 4e-6);
    const frequencyHz = Float64Array.from(controlV, (v, i) => 8000 + 2000 * v + Math.sin(i * 12.9898) * 0.5);
    const result = analyzeSweep({ controlV, frequencyHz }, {});
    const count = result.kvco.signChangeAtV.length;
    expect(count).toBeGreaterThan(100);
    const warning = result.warnings.find((w) => w.includes('falls back beyond its uncertainty'));
    expect(warning).toContain(`… (${count} voltages) V inside the window`);
    expect((warning ?? '').length).toBeLessThan(300);
  });
});
