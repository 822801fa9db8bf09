/**
 * Plan drafts as the operator types them (strings, so "250m" and half-typed
 * numbers survive), turned into schema input and checked on every keystroke
 * with the shared zod schemas. Errors are keyed by the plan's field path.
 */
import { driftPlanSchema, sweepPlanSchema, type DriftPlan, type SweepPlan } from '../contract/plans.ts';
import type { z } from 'zod';

export interface LimitsDraft {
  maxControlV: string;
  currentLimitA: string;
}

export interface SweepDraft {
  start: string;
  stop: string;
  step: string;
  direction: 'up' | 'down' | 'up-down';
  readingsPerPoint: string;
  gateS: string;
  settleMode: 'auto' | 'fixed';
  settleS: string;
  refineEdgeV: string;
}

export interface DriftDraft {
  controlV: string;
  intervalS: string;
  durationS: string;
  gateS: string;
}

// A demo scenario of our own: a clock-multiplier VCO tuned over 0.2–4.8 V.
export const DEFAULT_LIMITS: LimitsDraft = { maxControlV: '5', currentLimitA: '20m' };
export const DEFAULT_SWEEP: SweepDraft = {
  start: '0.2',
  stop: '4.8',
  step: '0.1',
  direction: 'up',
  readingsPerPoint: '3',
  gateS: '0.1',
  settleMode: 'auto',
  settleS: '2',
  refineEdgeV: '5m',
};
export const DEFAULT_DRIFT: DriftDraft = { controlV: '2.5', intervalS: '1s', durationS: '15min', gateS: '0.1' };

export type FieldErrors = Record<string, string>;

export type Checked<T> = { ok: true; plan: T; errors: FieldErrors } | { ok: false; errors: FieldErrors };

/** Text → number where the text is a plain integer, else the text (the schema explains). */
function integerOrText(text: string): number | string {
  return /^\s*\d+\s*$/.test(text) ? Number(text) : text;
}

/** Empty fields become undefined so the schema reports "required" rather than a parse error. */
function orUndefined(text: string): string | undefined {
  return text.trim() === '' ? undefined : text.trim();
}

function collect(error: z.ZodError): FieldErrors {
  const errors: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length > 0 ? issue.path.join('.') : '(plan)';
    errors[key] ??= issue.message;
  }
  return errors;
}

function limitsInput(limits: LimitsDraft) {
  return { maxControlV: orUndefined(limits.maxControlV), currentLimitA: orUndefined(limits.currentLimitA) };
}

/** Limits the plan must respect before it goes to main (main checks again). */
function checkAgainstLimits(errors: FieldErrors, field: string, valueV: number | undefined, maxV: number): void {
  if (valueV !== undefined && valueV > maxV && !errors[field])
    errors[field] = `above the control-voltage limit of ${maxV} V`;
}

export function checkSweepDraft(draft: SweepDraft, limits: LimitsDraft): Checked<SweepPlan> {
  const settle =
    draft.settleMode === 'auto'
      ? { mode: 'auto' as const, maxS: orUndefined(draft.settleS) }
      : { mode: 'fixed' as const, seconds: orUndefined(draft.settleS) };
  const parsed = sweepPlanSchema.safeParse({
    start: orUndefined(draft.start),
    stop: orUndefined(draft.stop),
    step: orUndefined(draft.step),
    direction: draft.direction,
    readingsPerPoint: integerOrText(draft.readingsPerPoint),
    gateS: orUndefined(draft.gateS),
    settle,
    refineEdgeV: orUndefined(draft.refineEdgeV),
    limits: limitsInput(limits),
  });
  if (!parsed.success) return { ok: false, errors: collect(parsed.error) };
  const plan = parsed.data;
  const errors: FieldErrors = {};
  if (plan.start !== undefined && plan.stop !== undefined && plan.stop <= plan.start)
    errors.stop = 'must be above start';
  checkAgainstLimits(errors, 'start', plan.start, plan.limits.maxControlV);
  checkAgainstLimits(errors, 'stop', plan.stop, plan.limits.maxControlV);
  if (
    plan.start !== undefined &&
    plan.stop !== undefined &&
    plan.step !== undefined &&
    (plan.stop - plan.start) / plan.step > 100_000
  ) {
    errors.step = 'gives more than 100 000 points; use a larger step';
  }
  return Object.keys(errors).length > 0 ? { ok: false, errors } : { ok: true, plan, errors };
}

export function checkDriftDraft(draft: DriftDraft, limits: LimitsDraft): Checked<DriftPlan> {
  const parsed = driftPlanSchema.safeParse({
    controlV: orUndefined(draft.controlV),
    intervalS: orUndefined(draft.intervalS),
    durationS: orUndefined(draft.durationS),
    gateS: orUndefined(draft.gateS),
    limits: limitsInput(limits),
  });
  if (!parsed.success) return { ok: false, errors: collect(parsed.error) };
  const errors: FieldErrors = {};
  checkAgainstLimits(errors, 'controlV', parsed.data.controlV, parsed.data.limits.maxControlV);
  if (!(parsed.data.intervalS > 0)) errors.intervalS = 'must be greater than 0';
  return Object.keys(errors).length > 0 ? { ok: false, errors } : { ok: true, plan: parsed.data, errors };
}

/** Points a sweep will visit (per direction), for the summary line. */
export function sweepPointCount(plan: SweepPlan): number {
  if (plan.points) return plan.points.length;
  if (plan.start === undefined || plan.stop === undefined || plan.step === undefined) return 0;
  return Math.floor((plan.stop - plan.start) / plan.step + 1e-9) + 1;
}
