import { describe, expect, it } from 'vitest';
import {
  formatDuration,
  formatNumber,
  formatPlain,
  formatSi,
  formatSiWithUncertainty,
  siPrefixFor,
} from './format-si.ts';

// SI prefixes: BIPM SI Brochure (9th ed.), Table 7 — from memory.
describe('formatSi', () => {
  it.each([
    [12_345_678, 'Hz', '12.35 MHz'],
    [0.25, 'V', '250.0 mV'],
    [1500, 'Hz/V', '1.500 kHz/V'],
    [4.7e-9, 'F', '4.700 nF'],
    [-2.2e-6, 'A', '−2.200 µA'],
    [999.99, 'Hz', '1.000 kHz'],
    [0, 'V', '0 V'],
    [NaN, 'V', '—'],
  ])('%d %s → %s', (value, unit, text) => {
    expect(formatSi(value, unit)).toBe(text);
  });
  it('uses the requested significant digits', () => {
    expect(formatSi(2.4e8, 'Hz', 6)).toBe('240.000 MHz');
    expect(siPrefixFor(3e9).symbol).toBe('G');
  });
});

describe('formatSiWithUncertainty', () => {
  it('rounds to the uncertainty’s two significant digits', () => {
    expect(formatSiWithUncertainty(12_345_678.9, 2_100, 'Hz')).toBe('12.3457 ± 0.0021 MHz');
    expect(formatSiWithUncertainty(0.55, 0.05, 'V')).toBe('550 ± 50 mV');
    expect(formatSiWithUncertainty(200_000, 0, 'Hz/V')).toBe('200.0 kHz/V');
  });
});

describe('formatNumber / formatPlain', () => {
  it('switches to exponent outside 1e-3 … 1e6 and uses a true minus', () => {
    expect(formatNumber(2.5e-5, 3)).toBe('2.50e-5');
    expect(formatNumber(-12.345, 3)).toBe('−12.3');
    expect(formatPlain(20.04, 'ppm/°C')).toBe('20.0 ppm/°C');
    expect(formatPlain(null, 'ppm/°C')).toBe('—');
  });
});

describe('formatDuration', () => {
  it('picks s, min or h', () => {
    expect(formatDuration(45)).toBe('45.0 s');
    expect(formatDuration(2880)).toBe('48.0 min');
    expect(formatDuration(9000)).toBe('2.50 h');
    expect(formatDuration(null)).toBe('—');
  });
});
