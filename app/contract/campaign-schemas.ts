/**
 * What the campaign service sends the page (replies and pushed events), as
 * schemas: the page checks every message with them (wire-schemas.ts) and the
 * contract's types are inferred from them (bench-api.ts). Objects are loose
 * so fields added later pass through.
 */
import { z } from 'zod';
import type { KnownShape } from './known-shape.ts';

const nullableNumber = z.number().nullable();

export const campaignConditionViewSchema = z.looseObject({
  index: z.number().int().nonnegative(),
  unit: z.string(),
  temperatureC: z.number(),
  supplyV: z.number(),
  state: z.enum(['waiting', 'soaking', 'sweeping', 'done', 'failed', 'skipped']),
  runId: z.string().nullable(),
  message: z.string().nullable(),
});

/** The campaign as the screen shows it: its folder id, status and every condition's state. */
export const campaignViewSchema = z.looseObject({
  id: z.string(),
  status: z.enum(['running', 'complete', 'aborted', 'failed', 'interrupted']),
  reason: z.string().nullable(),
  /** This process is running it now (false: a finished or interrupted campaign read from the archive). */
  active: z.boolean(),
  /** The operator is asked to change the unit; the campaign waits for confirmUnitChange. */
  unitChange: z.looseObject({ from: z.string(), to: z.string(), safeC: z.number() }).nullable(),
  /** Whether every safe-state step was confirmed at the end (null while running). */
  safeStateOk: z.boolean().nullable(),
  conditions: z.array(campaignConditionViewSchema),
});

export const campaignSummarySchema = z.looseObject({
  id: z.string(),
  status: campaignViewSchema.shape.status,
  createdAt: z.string(),
  units: z.array(z.string()),
  conditions: z.number().int().nonnegative(),
  done: z.number().int().nonnegative(),
});

export const soakSampleSchema = z.looseObject({
  index: z.number().int().nonnegative(),
  timeS: z.number(),
  setpointC: z.number(),
  airC: nullableNumber,
  dutC: z.number(),
});

export const sweepPointSchema = z.looseObject({ controlV: z.number(), frequencyHz: nullableNumber });

/** The campaign datasheet as text cells (figures already formatted with their ±). */
export const campaignSheetSchema = z.looseObject({
  id: z.string(),
  simulated: z.boolean(),
  conditions: z.string(),
  rows: z.array(
    z.looseObject({ parameter: z.string(), conditions: z.string(), min: z.string(), typ: z.string(), max: z.string() }),
  ),
  headroomHeading: z.string(),
  headroom: z.array(
    z.looseObject({
      unit: z.string(),
      chamber: z.string(),
      dut: z.string(),
      controlV: z.string(),
      marginLow: z.string(),
      marginHigh: z.string(),
      stall: z.string(),
      holds: z.string(),
    }),
  ),
  markdown: z.string(),
});

export const campaignEventSchemas = [
  z.object({ type: z.literal('campaign'), campaign: campaignViewSchema }),
  z.object({ type: z.literal('campaign-soak'), samples: z.array(soakSampleSchema) }),
  z.object({
    type: z.literal('campaign-sweep'),
    index: z.number().int(),
    points: z.array(sweepPointSchema),
    /** The counter's gate of these readings (s): they resolve 1/gate, so the read-out writes no finer digit. */
    gateS: z.number().positive().finite().optional(),
  }),
] as const;

export type CampaignView = KnownShape<z.output<typeof campaignViewSchema>>;
export type CampaignConditionView = CampaignView['conditions'][number];
export type CampaignSummary = KnownShape<z.output<typeof campaignSummarySchema>>;
export type SoakSampleView = KnownShape<z.output<typeof soakSampleSchema>>;
export type SweepPointView = KnownShape<z.output<typeof sweepPointSchema>>;
export type CampaignSheet = KnownShape<z.output<typeof campaignSheetSchema>>;
