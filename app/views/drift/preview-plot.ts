/**
 * A run's pixel preview (app/contract/run-preview.ts) as the drift time
 * plot's data, in the same series order as the full data's envelope: time,
 * frequency mean, frequency lowest, frequency highest, temperature mean.
 * Each slice sits at the middle of its first and last reading; a slice
 * without a valid value is null, so the line breaks there as it does in
 * the full plot. Zoomed, only the slices in view are passed (the preview
 * has no finer detail; the full columns bring it).
 */
import type { PixelPreview, PreviewSeries } from '../../contract/run-preview.ts';

export type PreviewPlotData = [number[], (number | null)[], (number | null)[], (number | null)[], (number | null)[]];

export function previewPlotData(
  preview: PixelPreview,
  frequency: string,
  temperature: string,
  view: { xMin: number; xMax: number } | null,
): PreviewPlotData {
  const out: PreviewPlotData = [[], [], [], [], []];
  const f: PreviewSeries | undefined = preview.series[frequency];
  const t: PreviewSeries | undefined = preview.series[temperature];
  const from = preview.xFrom ?? 0;
  const width = preview.columns > 0 ? ((preview.xTo ?? from) - from) / preview.columns : 0;
  for (let c = 0; c < preview.columns; c += 1) {
    const first = preview.xFirst[c] ?? null;
    const last = preview.xLast[c] ?? null;
    const x = first !== null && last !== null ? (first + last) / 2 : from + (c + 0.5) * width;
    if (view && (x < view.xMin || x > view.xMax)) continue;
    // An empty slice between two others breaks the line; leading and trailing ones are left out.
    if (first === null && (out[0].length === 0 || c === preview.columns - 1)) continue;
    out[0].push(x);
    out[1].push(f?.mean[c] ?? null);
    out[2].push(f?.min[c] ?? null);
    out[3].push(f?.max[c] ?? null);
    out[4].push(t?.mean[c] ?? null);
  }
  return out;
}
