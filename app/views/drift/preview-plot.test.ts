import { describe, expect, it } from 'vitest';
import { pixelPreview } from '../../analysis/pixel-preview.ts';
import { previewPlotData } from './preview-plot.ts';

describe('previewPlotData (the preview as the drift time plot draws it)', () => {
  const x = Float64Array.from([0, 1, 2, 3, 16, 17, 18, 19]);
  const f = Float64Array.from([10, 12, 11, 13, 20, 22, 21, 23]);
  const t = Float64Array.from([23, 23, 23.1, 23.1, 24, 24, 24.1, 24.1]);
  const preview = pixelPreview({
    x: { name: 'time_s', values: x },
    series: [
      { name: 'frequency_hz', values: f },
      { name: 'temperature_c', values: t },
    ],
    n: 8,
    columns: 5,
  });

  it('gives time, mean, lowest, highest and temperature per slice, with a break across the empty slices', () => {
    const [xs, mid, lo, hi, temp] = previewPlotData(preview, 'frequency_hz', 'temperature_c', null);
    // Slices of 3.8 s: rows 0–3 in the first, none in the next three, rows 4–7 in the last.
    [1.5, 5.7, 9.5, 13.3, 17.5].forEach((expected, i) => expect(xs[i]).toBeCloseTo(expected, 12));
    expect(xs).toHaveLength(5);
    expect(mid).toEqual([11.5, null, null, null, 21.5]);
    expect(lo).toEqual([10, null, null, null, 20]);
    expect(hi).toEqual([13, null, null, null, 23]);
    expect(temp[0]).toBeCloseTo(23.05, 12);
    expect(temp[4]).toBeCloseTo(24.05, 12);
  });

  it('passes only the slices in a zoomed view', () => {
    const [xs] = previewPlotData(preview, 'frequency_hz', 'temperature_c', { xMin: 15, xMax: 20 });
    expect(xs).toEqual([17.5]);
  });
});
