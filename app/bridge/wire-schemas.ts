/**
 * Schemas for what arrives over the WebSocket (browser mode). The server is
 * ours, but the socket is still a boundary: replies and events are checked
 * here and a mismatch names the field. Objects are loose so fields added to
 * the contract later pass through.
 */
import { z } from 'zod';
import type { BenchMethod } from '../contract/bench-api.ts';

const nullableNumber = z.number().nullable();

export const connectionStateSchema = z.looseObject({
  connected: z.boolean(),
  simulated: z.boolean(),
  roles: z.array(
    z.looseObject({
      role: z.enum(['supply', 'counter', 'thermometer']),
      address: z.string(),
      idn: z.string(),
      simulated: z.boolean(),
    }),
  ),
  error: z.string().nullable(),
});

export const runMetaSchema = z.looseObject({
  schema: z.literal('tunebench.run/1'),
  id: z.string(),
  kind: z.enum(['sweep', 'drift', 'pushing']),
  status: z.enum(['running', 'complete', 'aborted', 'interrupted']),
  startedAt: z.string(),
  endedAt: z.string().nullable(),
  dut: z.looseObject({ id: z.string(), notes: z.string() }),
  instruments: z.array(z.looseObject({ role: z.string(), idn: z.string(), address: z.string() })),
  plan: z.unknown(),
  software: z.looseObject({ version: z.string() }),
});

// NaN does not survive JSON; empty numeric cells arrive as null and become NaN in the store.
// A hand-written loop rather than z.array(z.number()): stored runs reach a million cells per column.
const numericColumn = z.unknown().transform((value, ctx): number[] => {
  if (!Array.isArray(value)) {
    ctx.addIssue({ code: 'custom', message: 'expected an array of numbers' });
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

// Text columns (status, direction) are as long; same reasoning.
const textColumn = z.unknown().transform((value, ctx): string[] => {
  if (!Array.isArray(value)) {
    ctx.addIssue({ code: 'custom', message: 'expected an array of strings' });
    return z.NEVER;
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

export const runDetailSchema = z.looseObject({
  meta: runMetaSchema,
  samples: z.looseObject({
    names: z.array(z.string()),
    numeric: z.record(z.string(), numericColumn),
    text: z.record(z.string(), textColumn),
  }),
  events: z.array(z.looseObject({ time_s: z.number(), type: z.string() })),
});

const readoutSchema = z.looseObject({
  controlSetV: nullableNumber,
  controlMeasV: nullableNumber,
  frequencyHz: nullableNumber,
  temperatureC: nullableNumber,
  timeS: z.number(),
});

const progressSchema = z.looseObject({
  runId: z.string(),
  kind: z.enum(['sweep', 'drift', 'pushing']),
  phase: z.enum(['settling', 'reading', 'refining', 'logging', 'paused', 'finishing']),
  pointsDone: z.number(),
  pointsTotal: z.number(),
  etaS: nullableNumber,
  latest: z
    .looseObject({ controlV: z.number(), frequencyHz: nullableNumber, status: z.enum(['ok', 'no-signal', 'timeout', 'error']) })
    .nullable(),
});

export const benchEventSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('connection'), state: connectionStateSchema }),
  z.object({ type: z.literal('live'), readout: readoutSchema }),
  z.object({ type: z.literal('run-started'), meta: runMetaSchema }),
  z.object({
    type: z.literal('samples'),
    runId: z.string(),
    rows: z.array(z.record(z.string(), z.union([z.number(), z.string(), z.null()]).transform((cell) => cell ?? Number.NaN))),
  }),
  z.object({ type: z.literal('progress'), progress: progressSchema }),
  z.object({ type: z.literal('run-ended'), meta: runMetaSchema }),
  z.object({ type: z.literal('run-event'), runId: z.string(), event: z.looseObject({ time_s: z.number(), type: z.string() }) }),
  z.object({ type: z.literal('error'), message: z.string() }),
]);

export const wireInboundSchema = z.union([
  z.object({ id: z.number().int(), ok: z.literal(true), result: z.unknown() }),
  z.object({ id: z.number().int(), ok: z.literal(false), error: z.object({ message: z.string(), field: z.string().optional() }) }),
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
  startSweep: runMetaSchema,
  startDrift: runMetaSchema,
  startPushing: runMetaSchema,
  pauseRun: anything,
  resumeRun: anything,
  stopRun: anything,
  listRuns: z.array(runMetaSchema),
  openRun: runDetailSchema,
  renameRun: runMetaSchema,
  addNote: anything,
  deleteRun: anything,
  restoreRun: runMetaSchema,
  importCsv: runMetaSchema,
};

/** "field.path: message" for the first issue, for one-line error text. */
export function firstIssue(error: z.ZodError): { field: string; message: string } {
  const issue = error.issues[0];
  const field = issue && issue.path.length > 0 ? issue.path.join('.') : '(root)';
  return { field, message: issue ? issue.message : 'invalid' };
}
