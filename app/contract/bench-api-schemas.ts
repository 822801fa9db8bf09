/**
 * Parameter schemas for every BenchApi method. main/ receives each call's
 * parameters as `unknown` (from IPC or the WebSocket) and passes them through
 * `parseCallParams` before any service code sees them. Plans reuse the schemas
 * of ./plans.ts, so SI strings ("250m") become numbers here.
 *
 * Each method lists its parameter names so an error can name the field the
 * way a user thinks of it: `plan.limits.maxControlV`, not `params[0]…`.
 */
import { z } from 'zod';
import type { BenchMethod, DesktopMethod } from './bench-api.ts';
import { hasUnsafeChars } from './excerpt.ts';
import { MAX_IMPORT_BYTES, MAX_IMPORT_TEXT } from './wire.ts';
import {
  benchConfigSchema,
  driftPlanSchema,
  limitsSchema,
  pushingPlanSchema,
  siNumber,
  sweepPlanSchema,
} from './plans.ts';
import { campaignPlanSchema } from './campaign-plan.ts';
import { previewColumnsSchema } from './run-preview.ts';
import { csvPartRowSchema, csvPartRowsSchema, runWindowRequestSchema } from './run-window.ts';

/** A bring-up setting from the Bench screen: control voltage, output, and the limits it must keep. */
export const manualControlSchema = z.object({ controlV: siNumber, output: z.boolean(), limits: limitsSchema });

/**
 * A run id names a folder under the runs directory, so it may never carry a
 * path separator, a `..`, a leading dot or a control character. Same rule as
 * main/store/run-id.ts (which the store applies again).
 */
export const runIdSchema = z
  .string()
  .min(1, 'must not be empty')
  .max(128, 'must be at most 128 characters')
  .regex(
    /^[A-Za-z0-9][A-Za-z0-9_.-]*$/,
    'may hold only letters, digits, "-", "_" and "." (no path separators), starting with a letter or digit',
  )
  .refine((id) => !id.includes('..'), 'must not contain ".."');

/** DUT identifier typed by the operator; printable text: no line breaks, C0/C1 controls or bidi overrides (they rewrite terminal lines). */
export const dutIdSchema = z
  .string()
  .min(1, 'must not be empty')
  .max(100, 'must be at most 100 characters')
  .refine(
    (text) => !hasUnsafeChars(text),
    'must not contain control characters, line breaks or bidi-override characters',
  );

/** Operator note: free text, line breaks allowed, other control characters not. */
export const noteTextSchema = z
  .string()
  .min(1, 'must not be empty')
  .max(20_000, 'must be at most 20000 characters')
  .refine(
    (text) => !hasUnsafeChars(text, '\t\n\r'),
    'must not contain control characters (other than tab and line breaks) or bidi-override characters',
  );

/** A file name as picked in a file dialog: the base name only. */
export const fileNameSchema = z
  .string()
  .min(1, 'must not be empty')
  .max(255, 'must be at most 255 characters')
  .regex(/^[^/\\]*$/, 'must be a file name without a folder (no / or \\)')
  .regex(/^[^\u0000-\u001f]*$/, 'must not contain control characters');

/** CSV text read in the renderer; the cap holds a week-long 1 s log while bounding memory (./wire.ts). */
export const csvTextSchema = z
  .string()
  .min(1, 'must not be empty')
  // Counted in UTF-16 units here; a streamed upload (./wire.ts) counts its UTF-8 bytes against the same cap.
  .max(MAX_IMPORT_BYTES, `is too large (at most ${MAX_IMPORT_TEXT})`);

interface MethodParams {
  names: readonly string[];
  schema: z.ZodType<unknown[]>;
}

function params<T extends [z.ZodType, ...z.ZodType[]]>(names: { [K in keyof T]: string }, items: T): MethodParams {
  return { names, schema: z.tuple(items) };
}

const none = (): MethodParams => ({ names: [], schema: z.tuple([]) });

export const benchMethodParams: Readonly<Record<BenchMethod | DesktopMethod, MethodParams>> = {
  listSerialPorts: none(),
  listProfiles: none(),
  connect: params(['config'], [z.union([z.literal('sim'), benchConfigSchema])]),
  disconnect: none(),
  getConnection: none(),
  getBenchStatus: none(),
  manualControl: params(['request'], [manualControlSchema]),
  startSweep: params(['plan', 'dutId'], [sweepPlanSchema, dutIdSchema]),
  startDrift: params(['plan', 'dutId'], [driftPlanSchema, dutIdSchema]),
  startPushing: params(['plan', 'dutId'], [pushingPlanSchema, dutIdSchema]),
  pauseRun: none(),
  resumeRun: none(),
  stopRun: none(),
  listRuns: none(),
  previewRun: params(['id', 'columns'], [runIdSchema, previewColumnsSchema]),
  openRun: params(['id'], [runIdSchema]),
  windowRun: params(['id', 'request'], [runIdSchema, runWindowRequestSchema]),
  analyzeRun: params(['id'], [runIdSchema]),
  runCsvPart: params(['id', 'fromRow', 'rows'], [runIdSchema, csvPartRowSchema, csvPartRowsSchema]),
  renameRun: params(['id', 'dutId'], [runIdSchema, dutIdSchema]),
  addNote: params(['id', 'text'], [runIdSchema, noteTextSchema]),
  deleteRun: params(['id'], [runIdSchema]),
  restoreRun: params(['id'], [runIdSchema]),
  importCsv: params(['fileName', 'csvText', 'dutId'], [fileNameSchema, csvTextSchema, dutIdSchema]),
  printDatasheetPdf: params(['fileName'], [fileNameSchema]),
  startCampaign: params(['plan'], [campaignPlanSchema]),
  resumeCampaign: params(['id'], [runIdSchema]),
  stopCampaign: none(),
  confirmUnitChange: none(),
  getCampaign: none(),
  listCampaigns: none(),
  campaignDatasheet: params(['id'], [runIdSchema]),
};

export function isBenchMethod(name: unknown): name is BenchMethod | DesktopMethod {
  return typeof name === 'string' && Object.prototype.hasOwnProperty.call(benchMethodParams, name);
}

export type ParamsResult = { ok: true; args: unknown[] } | { ok: false; message: string; field?: string };

/**
 * Validates one call's parameter array. On failure the message names the
 * method and the field; `field` is the dotted path starting at the
 * parameter's name (e.g. `plan.limits.maxControlV`).
 */
export function parseCallParams(method: BenchMethod | DesktopMethod, raw: unknown): ParamsResult {
  const spec = benchMethodParams[method];
  if (!Array.isArray(raw)) {
    return {
      ok: false,
      message: `${method}: params must be an array of ${spec.names.length} value(s) [${spec.names.join(', ')}]`,
      field: 'params',
    };
  }
  if (raw.length !== spec.names.length) {
    return {
      ok: false,
      message: `${method}: expected ${spec.names.length} parameter(s) [${spec.names.join(', ')}], got ${raw.length}`,
      field: 'params',
    };
  }
  const parsed = spec.schema.safeParse(raw);
  if (parsed.success) return { ok: true, args: parsed.data };
  const issue = parsed.error.issues[0];
  if (!issue) return { ok: false, message: `${method}: invalid parameters`, field: 'params' };
  const [index, ...rest] = issue.path;
  const head = typeof index === 'number' ? (spec.names[index] ?? `params.${index}`) : 'params';
  const field = [head, ...rest.map(String)].join('.');
  return { ok: false, message: `${method}: ${field}: ${issue.message}`, field };
}
