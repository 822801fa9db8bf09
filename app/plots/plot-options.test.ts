import { describe, expect, it } from 'vitest';
import type uPlot from 'uplot';
import { readPlotColors } from './plot-colors.ts';
import { resolvedRange, tickLabels, timeAxis } from './plot-options.ts';

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

describe('a value scale honours the readings resolution', () => {
  it('spans at least two whole steps of the finest tick the data resolve, snapped to them', () => {
    // Readings 399,991,610-399,991,630 Hz from a counter resolving 32 Hz (finest step 50 Hz): two steps, the readings inside.
    expect(resolvedRange(399_991_610, 399_991_630, 50)).toEqual([399_991_600, 399_991_700]);
    // Flat temperature 23.67 °C at 0.01 °C: 23.66-23.68, not uPlot's 0-40 °C.
    const [lo, hi] = resolvedRange(23.67, 23.67, 0.01) as [number, number];
    expect(lo).toBeCloseTo(23.66, 9);
    expect(hi).toBeCloseTo(23.68, 9);
    // A wide range: padded by a tenth of its span and snapped outward to whole steps.
    expect(resolvedRange(13_000, 14_000, 10)).toEqual([12_900, 14_100]);
    expect(resolvedRange(null, 5, 10)).toEqual([null, 5]);
  });
});
