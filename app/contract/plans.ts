/**
 * Schemas for bench files and procedure plans (CONTRACTS.md). Shared by the
 * CLI, the main process (validating IPC/WebSocket payloads) and the renderer
 * (validation as you type). Numbers are SI; strings with SI prefixes are
 * accepted and converted here, so nothing downstream sees a string.
 */
import { z } from 'zod';
import { excerptOf } from './excerpt.ts';
import { parseDurationS, parseSiNumber } from './si.ts';

/** A number, or a string such as "250m" / "1.5k". */
const numberOrPrefixed = z.union([z.number(), z.string()], {
  error: (issue) =>
    issue.input === undefined
      ? 'required: a number, optionally with an SI prefix (e.g. 0.25 or "250m")'
      : `expected a number, optionally with an SI prefix (e.g. 0.25 or "250m"), got ${excerptOf(issue.input)}`,
});
const durationOrText = z.union([z.number(), z.string()], {
  error: (issue) =>
    issue.input === undefined
      ? 'required: a duration such as 90, "90s", "15m" or "8h"'
      : `expected a duration such as 90, "90s", "15m" or "8h", got ${excerptOf(issue.input)}`,
});

export const siNumber = numberOrPrefixed.transform((value, ctx) => {
  const parsed = typeof value === 'number' ? value : parseSiNumber(value);
  if (parsed === null || !Number.isFinite(parsed)) {
    ctx.addIssue({ code: 'custom', message: `expected a number, optionally with an SI prefix (e.g. 0.25 or "250m"), got ${excerptOf(value)}` });
    return z.NEVER;
  }
  return parsed;
});

/** A duration in seconds: a number, or "90s", "15m", "8h". */
export const durationS = durationOrText.transform((value, ctx) => {
  const parsed = typeof value === 'number' ? value : parseDurationS(value);
  if (parsed === null || !(parsed >= 0)) {
    ctx.addIssue({ code: 'custom', message: `expected a duration such as 90, "90s", "15m" or "8h", got ${excerptOf(value)}` });
    return z.NEVER;
  }
  return parsed;
});

export const limitsSchema = z.object({
  /** Highest control voltage the plan may ever write, V. */
  maxControlV: siNumber,
  /** Current limit on the control channel, A. */
  currentLimitA: siNumber,
  /** Over-voltage protection level on the control channel, V (optional; default maxControlV + 10 %). */
  ovpV: siNumber.optional(),
});

export const safeStateSchema = z.object({
  controlV: siNumber.default(0),
  outputOff: z.boolean().default(true),
});

export const settleSchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('auto'), maxS: durationS.default(2), toleranceCounts: z.number().positive().default(2) }),
  z.object({ mode: z.literal('fixed'), seconds: durationS }),
]);

export const sweepPlanSchema = z
  .object({
    start: siNumber.optional(),
    stop: siNumber.optional(),
    step: siNumber.optional(),
    /** Explicit list of control voltages; replaces start/stop/step. */
    points: z.array(siNumber).min(1).optional(),
    direction: z.enum(['up', 'down', 'up-down']).default('up'),
    readingsPerPoint: z.number().int().min(1).max(1000).default(3),
    gateS: durationS.default(0.1),
    settle: settleSchema.default({ mode: 'auto', maxS: 2, toleranceCounts: 2 }),
    /** Bisect the stall edge down to this resolution after the coarse pass, V; 0 disables. */
    refineEdgeV: siNumber.default(0.001),
    limits: limitsSchema,
    safe: safeStateSchema.default({ controlV: 0, outputOff: true }),
    /** Tuning window the PLL can drive (its charge pump's compliance), V: the gain table quotes Kvco over it. */
    window: z.strictObject({ fromV: siNumber, toV: siNumber }).optional(),
  })
  .superRefine((plan, ctx) => {
    if (plan.window && !(plan.window.toV > plan.window.fromV)) {
      ctx.addIssue({ code: 'custom', path: ['window', 'toV'], message: `must be above window.fromV (${plan.window.fromV} V)` });
    }
    if (plan.points === undefined) {
      for (const key of ['start', 'stop', 'step'] as const) {
        if (plan[key] === undefined) ctx.addIssue({ code: 'custom', path: [key], message: `required unless "points" is given` });
      }
      if (plan.step !== undefined && !(plan.step > 0)) ctx.addIssue({ code: 'custom', path: ['step'], message: 'must be greater than 0' });
    }
  });

export const driftPlanSchema = z.object({
  controlV: siNumber,
  intervalS: durationS.default(1),
  durationS: durationS.default(8 * 3600),
  gateS: durationS.default(0.1),
  /** Settling at controlV before the first logged reading (optional; default auto, maxS 10 s). */
  settle: settleSchema.optional(),
  limits: limitsSchema,
  safe: safeStateSchema.default({ controlV: 0, outputOff: true }),
});

export const pushingPlanSchema = z.object({
  controlV: siNumber,
  supplyStartV: siNumber,
  supplyStopV: siNumber,
  supplyStepV: siNumber,
  readingsPerPoint: z.number().int().min(1).max(1000).default(5),
  gateS: durationS.default(0.1),
  settleS: durationS.default(0.5),
  /** Highest DUT supply voltage the plan may write, V. */
  maxSupplyV: siNumber,
  limits: limitsSchema,
  safe: safeStateSchema.default({ controlV: 0, outputOff: true }),
});

const addressSchema = z.string().min(1);

export const instrumentConfigSchema = z.object({
  address: addressSchema,
  profile: z.string().optional(),
});

export const benchConfigSchema = z.object({
  supply: instrumentConfigSchema.extend({
    controlChannel: z.number().int().min(1).default(1),
    dutSupplyChannel: z.number().int().min(1).default(2),
  }),
  counter: instrumentConfigSchema,
  thermometer: instrumentConfigSchema.optional(),
  /** Temperature chamber (campaigns only); the thermometer on the DUT is the soak reference. */
  chamber: instrumentConfigSchema.optional(),
});

export type SweepPlan = z.output<typeof sweepPlanSchema>;
export type SweepPlanInput = z.input<typeof sweepPlanSchema>;
export type DriftPlan = z.output<typeof driftPlanSchema>;
export type PushingPlan = z.output<typeof pushingPlanSchema>;
export type BenchConfig = z.output<typeof benchConfigSchema>;
export type Limits = z.output<typeof limitsSchema>;
export type SafeState = z.output<typeof safeStateSchema>;

/** Turns a zod error into one line per field: `limits.maxControlV: expected …`. */
export function describeIssues(error: z.ZodError): string {
  return error.issues
    .map((issue) => `${issue.path.length > 0 ? issue.path.join('.') : '(root)'}: ${issue.message}`)
    .join('\n');
}
