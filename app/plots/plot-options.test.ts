import { describe, expect, it } from 'vitest';
import type uPlot from 'uplot';
import { readPlotColors } from './plot-colors.ts';
import { tickLabels, timeAxis } from './plot-options.ts';

describe('tick labels', () => {
  it('uses one prefix per axis and enough decimals to separate ticks', () => {
    expect(tickLabels([2.8999e6, 2.89995e6, 2.9e6], 50, 'Hz')).toEqual(['2.89990 MHz', '2.89995 MHz', '2.90000 MHz']);
    expect(tickLabels([0, 1, 2], 1, 'V')).toEqual(['0 V', '1 V', '2 V']);
    expect(tickLabels([-0.02, 0, 0.02], 0.02, 'Hz')).toEqual(['−20 mHz', '0 mHz', '20 mHz']);
    expect(tickLabels([1.75, 2, 2.25], 0.25, 'V')).toEqual(['1.75 V', '2.00 V', '2.25 V']);
  });
});

describe('time axis labels', () => {
  it("leave a tick at either edge of the plot without text, where it would reach under the y axes' labels", () => {
    const axis = timeAxis(readPlotColors(null));
    // A 600 px wide plot (device pixel ratio 1 in Node) whose x scale maps seconds one to one onto pixels.
    const plot = { bbox: { width: 600 }, valToPos: (value: number) => value } as unknown as uPlot;
    const values = axis.values as (
      u: uPlot,
      splits: number[],
      axisIdx: number,
      space: number,
      incr: number,
    ) => string[];
    expect(values(plot, [10, 60, 120, 180, 590], 0, 78, 60)).toEqual(['', '1 min', '2 min', '3 min', '']);
  });
});
