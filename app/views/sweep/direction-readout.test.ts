import { describe, expect, it } from 'vitest';
import { sameSetpointValue } from './direction-readout.ts';

describe('cursor readout of an up-down sweep', () => {
  it('finds the falling reading at the setpoint of a rising one, and none where only one direction was read', () => {
    // Display rows ordered by setpoint: 1.0 V rising ×2 then falling; 2.0 V rising then falling.
    const x = [1, 1, 1, 2, 2];
    const falling = [null, null, 899_980, null, 950_000];
    expect(sameSetpointValue(x, falling, 0)).toBe(899_980);
    expect(sameSetpointValue(x, falling, 3)).toBe(950_000);
    expect(sameSetpointValue([1, 2], [null, 5], 0)).toBeNull();
  });
});
