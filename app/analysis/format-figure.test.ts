import { describe, expect, it } from 'vitest';
import { belowFloor, formatFigure, formatSignificance, isSignificant } from './format-figure.ts';

describe('formatFigure: only the digits a figure supports', () => {
  it('value ± uncertainty to two significant digits of u (GUM §7.2.6, section number from memory; common practice)', () => {
    expect(formatFigure(18442.6667, 'Hz', { uncertainty: 5.77 })).toBe('18.4427 ± 0.0058 kHz');
    expect(formatFigure(-2.02e3, 'Hz/V', { uncertainty: 480 })).toBe('−2.02 ± 0.48 kHz/V');
    expect(formatFigure(-26055, 'ppm/h', { uncertainty: 18192 })).toBe('−26000 ± 18000 ppm/h');
    expect(formatFigure(1.5503, 'V', { uncertainty: 0.0005 })).toBe('1.55030 ± 0.00050 V');
  });
  it('without an uncertainty, a resolution limits the digits (issue 9: "18.4426667 kHz" at 10 Hz)', () => {
    expect(formatFigure(18442.6667, 'Hz', { resolution: 10 })).toBe('18.44 kHz');
    expect(formatFigure(412345678.9, 'Hz', { resolution: 10 })).toBe('412.34568 MHz');
  });
  it('prints a figure at or below the numerical floor as 0 (issue 9: "residual SD 0.8198 pHz")', () => {
    expect(formatFigure(0.8198e-12, 'Hz', { floor: 1e-6 })).toBe('0 Hz');
    expect(formatFigure(3.41e-14, '%', { floor: 1e-9 })).toBe('0 %');
    expect(belowFloor(0.8198e-12, 7e5)).toBe(true);
    expect(belowFloor(1, 7e5)).toBe(false);
  });
  it('plain units take no prefix; dimensionless figures print as numbers', () => {
    expect(formatFigure(-180.4, 'ppm/°C', { uncertainty: 2.1 })).toBe('−180.4 ± 2.1 ppm/°C');
    expect(formatFigure(2.25e-4, '')).toBe('2.250e-4');
    expect(formatFigure(null, 'Hz')).toBe('—');
  });
  it("at a resolution the prefix follows the rounded value; a reading that rounds to 0 keeps the resolution's decimals", () => {
    // 0.1 mV read back at a supply's 1 mV: "0.000 V", never "0 µV" (a prefix the reading does not resolve).
    expect(formatFigure(1e-4, 'V', { resolution: 1e-3 })).toBe('0.000 V');
    expect(formatFigure(0.04, '°C', { resolution: 0.1 })).toBe('0.0 °C');
    // 999.996 Hz at 0.01 Hz rounds to 1000.00 Hz: written in kHz to the same 0.01 Hz.
    expect(formatFigure(999.996, 'Hz', { resolution: 0.01 })).toBe('1.00000 kHz');
  });
  it('with `exponent`, a tiny dimensionless figure and its u read as (m ± u)e-N (an Allan point and its confidence)', () => {
    expect(formatFigure(5.4e-4, '', { uncertainty: 3e-5, exponent: true })).toBe('(5.40 ± 0.30)e-4');
    expect(formatFigure(0.05, '', { uncertainty: 0.003, exponent: true })).toBe('0.0500 ± 0.0030');
  });
});

describe('significance (|value| ≥ 2σ)', () => {
  it('an insignificant drift rate is said to be so, with its σ (issue 9: "−26055 ppm/h ± 18192 ppm/h")', () => {
    expect(isSignificant(-26055, 18192)).toBe(false);
    expect(formatSignificance(-26055, 18192, 'ppm/h', '30 s')).toBe('not significant over 30 s (±18000 ppm/h)');
    expect(formatSignificance(-3.2, 1.1, 'ppm/h', '8 h')).toBe('−3.2 ± 1.1 ppm/h');
  });
});
