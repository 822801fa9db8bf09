import { describe, expect, it } from 'vitest';
import { tickLabels } from './plot-options.ts';

describe('tick labels', () => {
  it('uses one prefix per axis and enough decimals to separate ticks', () => {
    expect(tickLabels([2.8999e6, 2.89995e6, 2.9e6], 50, 'Hz')).toEqual(['2.89990 MHz', '2.89995 MHz', '2.90000 MHz']);
    expect(tickLabels([0, 1, 2], 1, 'V')).toEqual(['0 V', '1 V', '2 V']);
    expect(tickLabels([-0.02, 0, 0.02], 0.02, 'Hz')).toEqual(['−20 mHz', '0 mHz', '20 mHz']);
    expect(tickLabels([1.75, 2, 2.25], 0.25, 'V')).toEqual(['1.75 V', '2.00 V', '2.25 V']);
  });
});
