import { describe, expect, it } from 'vitest';
import { hzAtResolution } from './units.ts';

describe('counter readings with the digits their resolution supports', () => {
  it('a 0.1 s gate (10 Hz counts) and a 1 s gate (1 Hz) on a 13.78 kHz oscillator', () => {
    expect(hzAtResolution(13_780, 10)).toBe('13.78 kHz');
    expect(hzAtResolution(13_781, 1)).toBe('13.781 kHz');
    // A 400 MHz LO read with a 10 ms gate counts in 100 Hz steps.
    expect(hzAtResolution(400_123_400, 100)).toBe('400.1234 MHz');
    expect(hzAtResolution(13_780, null)).toBe('13.78000 kHz');
    expect(hzAtResolution(null, 10)).toBe('—');
  });
});
