import { describe, expect, it } from 'vitest';
import { excerpt, parseQuantity, parseTime } from './si.ts';

// SI prefixes and unit symbols: BIPM, The International System of Units (SI brochure, 9th ed.), tables 7 and 8 (from memory).
describe('the one quantity grammar', () => {
  it('a time needs its unit; a bare number is seconds', () => {
    const cases: [string, number][] = [
      ['100ms', 0.1],
      ['90s', 90],
      ['15min', 900],
      ['8h', 28800],
      ['2d', 172800],
      ['250us', 250e-6],
      ['250µs', 250e-6],
      ['0.5', 0.5],
      ['1e-3', 1e-3],
    ];
    for (const [text, seconds] of cases) {
      const parsed = parseTime(text);
      expect(parsed.ok && parsed.value, text).toBeCloseTo(seconds, 12);
    }
  });

  it('refuses a bare "m" on a time, offering both readings', () => {
    const parsed = parseTime('100m');
    expect(parsed.ok).toBe(false);
    expect(!parsed.ok && parsed.error).toBe(
      '"100m" is ambiguous for a time: write "100ms" (0.1 s) or "100min" (6000 s)',
    );
  });

  it.each(['100u', '1.5k', '5 sec', 'soon', '10V', ''])('refuses "%s" as a time', (text) => {
    const parsed = parseTime(text);
    expect(parsed.ok).toBe(false);
    expect(!parsed.ok && parsed.error).toMatch(/expected a time such as/);
  });

  it('voltage, current and frequency take SI prefixes and their own unit only', () => {
    expect(parseQuantity('500m', 'voltage')).toEqual({ ok: true, value: 0.5 });
    expect(parseQuantity('500mV', 'voltage')).toEqual({ ok: true, value: 0.5 });
    expect(parseQuantity('20mA', 'current')).toEqual({ ok: true, value: 0.02 });
    expect(parseQuantity('10MHz', 'frequency')).toEqual({ ok: true, value: 1e7 });
    expect(parseQuantity('2.5k', 'frequency')).toEqual({ ok: true, value: 2500 });
    expect(parseQuantity('20mA', 'voltage').ok).toBe(false);
    expect(parseQuantity('3s', 'voltage').ok).toBe(false);
  });

  it('an echoed value is cut short', () => {
    expect(excerpt('x'.repeat(10_000)).length).toBeLessThanOrEqual(61);
    expect(excerpt(new Array(1_000_000).fill(0))).toBe('an array of 1000000 values');
  });
});
