/**
 * A stored run at screen resolution, sent before its full columns
 * (`previewRun`): the run's meta and events like `openRun`'s RunDetail, and
 * in place of the samples one slice per pixel column of the plotted series
 * (app/analysis/pixel-preview.ts makes it). The page draws it at once,
 * marked as a preview, and analyses nothing until the full columns arrive.
 * Checked on both carriers: the call's parameters by bench-api-schemas.ts,
 * the reply by wire-schemas.ts' resultSchemas.
 */
import { z } from 'zod';
import type { KnownShape } from './known-shape.ts';
import { runMetaSchema } from './run-meta-schema.ts';

/** Most slices a preview may ask for (an 8K screen is 7680 px wide). */
export const MAX_PREVIEW_COLUMNS = 8192;

const cells = z.array(z.number().nullable());

export const previewSeriesSchema = z.looseObject({
  first: cells,
  min: cells,
  max: cells,
  last: cells,
  mean: cells,
  /** Valid values in each slice. */
  count: z.array(z.number().int().nonnegative()),
});

export const pixelPreviewSchema = z
  .looseObject({
    /** Name of the x column (time_s for a drift log). */
    x: z.string(),
    /** Number of slices; every per-slice array holds this many. */
    columns: z.number().int().nonnegative().max(MAX_PREVIEW_COLUMNS),
    /** Ends of the x range cut into slices (null when no row had an x). */
    xFrom: z.number().nullable(),
    xTo: z.number().nullable(),
    /** Rows in each slice, valid or not. */
    rows: z.array(z.number().int().nonnegative()),
    /** x of the first and of the last row of each slice (null: empty slice). */
    xFirst: cells,
    xLast: cells,
    series: z.record(z.string(), previewSeriesSchema),
  })
  .superRefine((preview, ctx) => {
    const lengths: [string, number][] = [
      ['rows', preview.rows.length],
      ['xFirst', preview.xFirst.length],
      ['xLast', preview.xLast.length],
    ];
    for (const [name, s] of Object.entries(preview.series)) {
      for (const key of ['first', 'min', 'max', 'last', 'mean', 'count'] as const)
        lengths.push([`series.${name}.${key}`, s[key].length]);
    }
    for (const [field, length] of lengths) {
      if (length !== preview.columns) {
        ctx.addIssue({
          code: 'custom',
          path: field.split('.'),
          message: `expected ${preview.columns} slices (columns), got ${length}`,
        });
        return;
      }
    }
    for (const [name, s] of Object.entries(preview.series)) {
      for (let c = 0; c < preview.columns; c += 1) {
        const lo = s.min[c];
        const hi = s.max[c];
        if ((lo === null) !== (s.count[c] === 0) || (typeof lo === 'number' && typeof hi === 'number' && lo > hi)) {
          ctx.addIssue({
            code: 'custom',
            path: ['series', name, 'min', c],
            message: `slice ${c}: min must be ≤ max and null exactly where count is 0`,
          });
          return;
        }
      }
    }
  });

/** One series over the slices; null where a slice holds no valid value. */
export type PreviewSeries = KnownShape<z.output<typeof previewSeriesSchema>>;

/** Written out (not inferred): KnownShape drops a record's string keys. Fields as in pixelPreviewSchema. */
export interface PixelPreview {
  x: string;
  columns: number;
  xFrom: number | null;
  xTo: number | null;
  rows: number[];
  xFirst: (number | null)[];
  xLast: (number | null)[];
  series: Record<string, PreviewSeries>;
}

export const runPreviewSchema = z.looseObject({
  meta: runMetaSchema,
  events: z.array(z.looseObject({ time_s: z.number(), type: z.string() })),
  /** Readings in the run (what the full columns will hold). */
  rowCount: z.number().int().nonnegative(),
  /** Null when the run is small enough that its full columns come as fast (or it has no plotted series). */
  preview: pixelPreviewSchema.nullable(),
});

export interface RunPreview {
  meta: KnownShape<z.output<typeof runMetaSchema>>;
  /** The run's events, as in RunDetail (spelt out here: bench-api.ts imports this file). */
  events: { time_s: number; type: string; [key: string]: unknown }[];
  rowCount: number;
  preview: PixelPreview | null;
}

/** The page's request: how many pixel columns its plot has. */
export const previewColumnsSchema = z
  .number()
  .int('must be a whole number of pixel columns')
  .min(1, 'must be at least 1')
  .max(MAX_PREVIEW_COLUMNS, `must be at most ${MAX_PREVIEW_COLUMNS}`);
