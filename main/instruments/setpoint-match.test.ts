import { describe, expect, it } from 'vitest';
import { setpointMatches } from './setpoint-match.ts';

describe('setpointMatches (10 mV + 0.1 % of the target: programming resolution and rounding, common practice)', () => {
  it('accepts a readback inside the band and refuses one just outside, at 0 V and at 5 V', () => {
    expect(setpointMatches(0.0099, 0)).toBe(true);
    expect(setpointMatches(0.0101, 0)).toBe(false);
    // 5 V: band is 10 mV + 5 mV = 15 mV.
    expect(setpointMatches(5.0149, 5)).toBe(true);
    expect(setpointMatches(4.9851, 5)).toBe(true);
    expect(setpointMatches(5.0151, 5)).toBe(false);
    expect(setpointMatches(3.5, 0)).toBe(false);
  });
});
