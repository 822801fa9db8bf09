/**
 * Schemas for what arrives over the WebSocket (browser mode). The server is
 * ours, but the socket is still a boundary: replies and events are checked
 * here and a mismatch names the field. Objects are loose so fields added to
 * the contract later pass through.
 */
import { z } from 'zod';
import type { BenchMethod, CodedTextColumn } from './bench-api.ts';
import {
  campaignEventSchemas,
  campaignSheetSchema,
  campaignSummarySchema,
  campaignViewSchema,
} from './campaign-schemas.ts';
import { runMetaSchema } from './run-meta-schema.ts';
import { runPreviewSchema } from './run-preview.ts';
import { csvPartSchema, runAnalysisSchema, runWindowSchema } from './run-window.ts';
import { benchStatusSchema, connectionStateSchema, progressSchema, readoutSchema } from './state-schemas.ts';

// NaN does not survive JSON; empty numeric cells of a plain array arrive as null and become NaN in the store.
// A hand-written loop rather than z.array(z.number()): stored runs reach a million cells per column.
// A Float64Array (from a binary reply, app/contract/wire.ts) is already numbers: taken as it is, no per-cell work.
const numericColumn = z.unknown().transform((value, ctx): number[] | Float64Array => {
  if (value instanceof Float64Array) return value;
  if (!Array.isArray(value)) {
    ctx.addIssue({ code: 'custom', message: 'expected a Float64Array or an array of numbers' });
    return z.NEVER;
  }
  const cells = value as unknown[];
  const out = new Array<number>(cells.length);
  for (let i = 0; i < cells.length; i += 1) {
    const cell = cells[i];
    if (typeof cell === 'number') out[i] = cell;
    else if (cell === null) out[i] = Number.NaN;
    else {
      ctx.addIssue({ code: 'custom', message: `expected a number or null at row ${i}, got ${typeof cell}` });
      return z.NEVER;
    }
  }
  return out;
});

/** Largest code in a coded text column (one pass over bytes, no per-cell schema). */
function maxCode(codes: Uint8Array | Uint16Array | Uint32Array): number {
  let max = -1;
  for (let i = 0; i < codes.length; i += 1) if ((codes[i] as number) > max) max = codes[i] as number;
  return max;
}

// Text columns (status, direction) are as long; same reasoning. Either strings or a dictionary with codes.
const textColumn = z.unknown().transform((value, ctx): string[] | CodedTextColumn => {
  if (!Array.isArray(value)) {
    const coded = value as Partial<CodedTextColumn> | null;
    const codes = coded?.codes;
    const levels = coded?.levels;
    if (!(codes instanceof Uint8Array || codes instanceof Uint16Array || codes instanceof Uint32Array)) {
      ctx.addIssue({
        code: 'custom',
        message: 'expected an array of strings or { levels, codes: Uint8Array | Uint16Array | Uint32Array }',
      });
      return z.NEVER;
    }
    if (!Array.isArray(levels) || !levels.every((level) => typeof level === 'string')) {
      ctx.addIssue({ code: 'custom', message: 'levels: expected an array of strings' });
      return z.NEVER;
    }
    const max = maxCode(codes);
    if (max >= levels.length) {
      ctx.addIssue({ code: 'custom', message: `codes: code ${max} has no level (${levels.length} levels)` });
      return z.NEVER;
    }
    return { levels, codes };
  }
  const cells = value as unknown[];
  for (let i = 0; i < cells.length; i += 1) {
    if (typeof cells[i] !== 'string') {
      ctx.addIssue({ code: 'custom', message: `expected a string at row ${i}` });
      return z.NEVER;
    }
  }
  return cells as string[];
});

const columnLength = (column: number[] | Float64Array | string[] | CodedTextColumn): number =>
  Array.isArray(column) || column instanceof Float64Array ? column.length : column.codes.length;

export const sampleColumnsSchema = z
  .looseObject({
    names: z.array(z.string()),
    numeric: z.record(z.string(), numericColumn),
    text: z.record(z.string(), textColumn),
    rowCount: z.number().int().nonnegative().optional(),
  })
  .superRefine((samples, ctx) => {
    // Every column holds rowCount values (a Float64Array: byteLength = rowCount·8); without rowCount, all alike.
    const columns: [string, number][] = [
      ...Object.entries(samples.numeric).map(([name, column]): [string, number] => [
        `numeric.${name}`,
        columnLength(column),
      ]),
      ...Object.entries(samples.text).map(([name, column]): [string, number] => [`text.${name}`, columnLength(column)]),
    ];
    const expected = samples.rowCount ?? columns[0]?.[1];
    for (const [field, length] of columns) {
      if (length !== expected) {
        ctx.addIssue({
          code: 'custom',
          path: field.split('.'),
          message: `expected ${expected} rows (rowCount), got ${length}`,
        });
        return;
      }
    }
  });

export const runDetailSchema = z.looseObject({
  meta: runMetaSchema,
  samples: sampleColumnsSchema,
  events: z.array(z.looseObject({ time_s: z.number(), type: z.string() })),
});

export { benchStatusSchema } from './state-schemas.ts';

export const benchEventSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('connection'), state: connectionStateSchema }),
  z.object({ type: z.literal('live'), readout: readoutSchema }),
  z.object({ type: z.literal('run-started'), meta: runMetaSchema }),
  z.object({
    type: z.literal('samples'),
    runId: z.string(),
    rows: z.array(
      z.record(
        z.string(),
        z.union([z.number(), z.string(), z.null()]).transform((cell) => cell ?? Number.NaN),
      ),
    ),
  }),
  z.object({ type: z.literal('progress'), progress: progressSchema }),
  z.object({ type: z.literal('run-ended'), meta: runMetaSchema }),
  z.object({
    type: z.literal('run-event'),
    runId: z.string(),
    event: z.looseObject({ time_s: z.number(), type: z.string() }),
  }),
  z.object({ type: z.literal('bench-status'), status: benchStatusSchema }),
  z.object({ type: z.literal('error'), message: z.string() }),
  z.object({ type: z.literal('peers'), others: z.number().int().nonnegative() }),
  ...campaignEventSchemas,
]);

export const wireInboundSchema = z.union([
  z.object({ id: z.number().int(), ok: z.literal(true), result: z.unknown() }),
  z.object({
    id: z.number().int(),
    ok: z.literal(false),
    error: z.object({ message: z.string(), field: z.string().optional() }),
  }),
  z.object({ event: z.unknown() }),
]);

const anything = z.unknown();

/** What each method's reply must look like. */
export const resultSchemas: Record<BenchMethod, z.ZodType> = {
  listSerialPorts: z.array(z.looseObject({ path: z.string(), manufacturer: z.string().nullable() })),
  listProfiles: z.array(z.looseObject({ name: z.string(), role: z.string() })),
  connect: connectionStateSchema,
  disconnect: connectionStateSchema,
  getConnection: connectionStateSchema,
  getBenchStatus: benchStatusSchema,
  manualControl: benchStatusSchema,
  startSweep: runMetaSchema,
  startDrift: runMetaSchema,
  startPushing: runMetaSchema,
  pauseRun: anything,
  resumeRun: anything,
  stopRun: anything,
  listRuns: z.array(runMetaSchema),
  previewRun: runPreviewSchema,
  openRun: runDetailSchema,
  windowRun: runWindowSchema,
  analyzeRun: runAnalysisSchema,
  runCsvPart: csvPartSchema,
  renameRun: runMetaSchema,
  addNote: anything,
  deleteRun: anything,
  restoreRun: runMetaSchema,
  importCsv: runMetaSchema,
  startCampaign: campaignViewSchema,
  resumeCampaign: campaignViewSchema,
  stopCampaign: anything,
  confirmUnitChange: anything,
  getCampaign: campaignViewSchema.nullable(),
  listCampaigns: z.array(campaignSummarySchema),
  campaignDatasheet: campaignSheetSchema,
};

/** "field.path: message" for the first issue, for one-line error text. */
export function firstIssue(error: z.ZodError): { field: string; message: string } {
  const issue = error.issues[0];
  const field = issue && issue.path.length > 0 ? issue.path.join('.') : '(root)';
  return { field, message: issue ? issue.message : 'invalid' };
}
