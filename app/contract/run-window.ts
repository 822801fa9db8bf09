/**
 * A big stored drift log is held by main, never by the page (issue 12: a
 * 10,000,000-reading log held whole made the page's renderer peak near
 * 1.9 GB). After its pixel preview (./run-preview.ts) the page asks:
 *  - `windowRun(id, request)`: the readings in an x range cut to the plot's
 *    slices (app/analysis/envelope.ts: lowest, highest and mean per slice,
 *    or the readings themselves once few enough are in view), so a zoom is
 *    refined from main;
 *  - `analyzeRun(id)`: the drift analysis, its frequency–temperature chunk
 *    means and the held control voltage, computed in main on every reading;
 *  - `runCsvPart(id, fromRow, rows)`: the plot's data as CSV text, a part at
 *    a time, so an export holds every reading without the page holding them.
 * Checked on both carriers: parameters by bench-api-schemas.ts, replies by
 * wire-schemas.ts' resultSchemas.
 */
import { z } from 'zod';
import type { KnownShape } from './known-shape.ts';
import { MAX_PREVIEW_COLUMNS } from './run-preview.ts';

/** A window holds at most this many points (slices or readings): widthPx/4 of an 8K screen, with room. */
export const MAX_WINDOW_POINTS = MAX_PREVIEW_COLUMNS;

/** Rows of one CSV part (about 10 MB of text). */
export const MAX_CSV_PART_ROWS = 250_000;

export const runWindowRequestSchema = z
  .strictObject({
    /** The x range in view; both null for the whole run. */
    xMin: z.number().nullable(),
    xMax: z.number().nullable(),
    /** The plot area's width in CSS pixels. */
    widthPx: z
      .number()
      .int('must be a whole number of pixels')
      .min(1, 'must be at least 1')
      .max(MAX_PREVIEW_COLUMNS, `must be at most ${MAX_PREVIEW_COLUMNS}`),
  })
  .refine((r) => (r.xMin === null) === (r.xMax === null) && (r.xMin === null || (r.xMax as number) >= r.xMin), {
    message: 'xMin and xMax are both null or both numbers with xMin ≤ xMax',
    path: ['xMax'],
  });

export type RunWindowRequest = z.output<typeof runWindowRequestSchema>;

const cells = z.array(z.number().nullable()).max(MAX_WINDOW_POINTS);

export const windowSeriesSchema = z.looseObject({ name: z.string(), mid: cells, lo: cells, hi: cells });

export const runWindowSchema = z
  .looseObject({
    /** True when the range was cut into slices; false when the readings themselves are sent. */
    dense: z.boolean(),
    x: z.array(z.number()).max(MAX_WINDOW_POINTS),
    series: z.array(windowSeriesSchema),
    /** Readings in the run (not in the window). */
    rowCount: z.number().int().nonnegative(),
  })
  .superRefine((w, ctx) => {
    w.series.forEach((s, k) => {
      for (const key of ['mid', 'lo', 'hi'] as const) {
        if (s[key].length !== w.x.length)
          ctx.addIssue({
            code: 'custom',
            path: ['series', k, key],
            message: `expected ${w.x.length} points (as x), got ${s[key].length}`,
          });
      }
    });
  });

export type RunWindow = KnownShape<z.output<typeof runWindowSchema>>;

const finite = z.number();
const stabilityPointSchema = z.looseObject({ m: finite, tauS: finite, deviation: finite, terms: finite });

/** The drift analysis as data (app/analysis/drift-analysis.ts DriftAnalysis; a type test pins the two). */
export const driftAnalysisSchema = z.looseObject({
  kind: z.literal('drift'),
  meanHz: finite,
  tempcoPpmPerC: finite.nullable(),
  tempcoHzPerC: finite.nullable(),
  driftPpmPerHour: finite.nullable(),
  adev: z.array(z.looseObject({ tauS: finite, adev: finite, terms: finite, resolutionLimited: z.boolean() })),
  resolutionFloor: finite.nullable(),
  driftSignificant: z.boolean(),
  tempcoSignificant: z.boolean(),
  tempcoUncertaintyHzPerC: finite.nullable(),
  tempcoUncertaintyPpmPerC: finite.nullable(),
  temperatureSpanC: finite.nullable(),
  meanTemperatureC: finite.nullable(),
  driftUncertaintyPpmPerHour: finite.nullable(),
  warmUp: z.looseObject({
    settled: z.boolean(),
    determined: z.boolean(),
    warmUpS: finite.nullable(),
    limitPpmPerHour: finite,
    windowS: finite,
  }),
  loop: z
    .looseObject({
      shape: z.enum(['up-down', 'down-up']),
      turnTemperatureC: finite,
      atTemperatureC: finite,
      widthHz: finite,
      widthPpm: finite,
      outgoingHzPerC: finite,
      returningHzPerC: finite,
    })
    .nullable(),
  allan: z.looseObject({
    tau0S: finite,
    samples: finite,
    adev: z.array(stabilityPointSchema),
    oadev: z.array(stabilityPointSchema),
    mdev: z.array(stabilityPointSchema),
  }),
  samples: finite,
  noOscillationSamples: finite,
  durationS: finite,
  warnings: z.array(z.string()),
});

export const tempcoChunksSchema = z
  .looseObject({
    temperatureC: z.array(finite).max(MAX_WINDOW_POINTS),
    frequencyHz: z.array(finite.nullable()).max(MAX_WINDOW_POINTS),
    lineHz: z.array(finite.nullable()).max(MAX_WINDOW_POINTS),
  })
  .refine((t) => t.frequencyHz.length === t.temperatureC.length && t.lineHz.length === t.temperatureC.length, {
    message: 'temperatureC, frequencyHz and lineHz must be equally long',
    path: ['lineHz'],
  });

export const runAnalysisSchema = z.looseObject({
  outcome: z.union([
    z.looseObject({ ok: z.literal(true), analysis: driftAnalysisSchema }),
    z.looseObject({ ok: z.literal(false), message: z.string() }),
  ]),
  /** Frequency against temperature as chunk means, with the tempco line; null without a tempco. */
  tempco: tempcoChunksSchema.nullable(),
  /** The control voltage of the first reading (a drift log holds it). */
  holdV: finite.nullable(),
});

export type DriftAnalysisData = KnownShape<z.output<typeof driftAnalysisSchema>>;
export type TempcoChunks = KnownShape<z.output<typeof tempcoChunksSchema>>;
export type RunAnalysis = KnownShape<z.output<typeof runAnalysisSchema>>;

export const csvPartRowSchema = z.number().int('must be a whole row number').min(0, 'must be at least 0');
export const csvPartRowsSchema = z
  .number()
  .int('must be a whole number of rows')
  .min(1, 'must be at least 1')
  .max(MAX_CSV_PART_ROWS, `must be at most ${MAX_CSV_PART_ROWS}`);

/** One part of a run's plot data as CSV: the header only in the part from row 0. */
export const csvPartSchema = z.looseObject({
  text: z.string(),
  /** Row after the last one in this part; equal to rowCount at the end. */
  nextRow: z.number().int().nonnegative(),
  rowCount: z.number().int().nonnegative(),
});

export type CsvPart = KnownShape<z.output<typeof csvPartSchema>>;
