/**
 * The campaign plan (`tunebench campaign --plan FILE`): temperatures, DUT
 * supply corners and units, how to judge a soak, the chamber's limits, the
 * sweep taken at each condition and where the chamber goes at the end.
 * Shared by the CLI, the service and the renderer's plan editor. Like every
 * other file: each object refuses unknown keys naming the nearest known one,
 * and voltages, frequencies and times speak the one quantity grammar (si.ts).
 */
import { z } from 'zod';
import { sweepPlanSchema } from './plans.ts';
import { hasUnsafeChars } from './excerpt.ts';
import { quantity, schemaRef, strictObject, time } from './schema-kit.ts';

/** Temperatures a chamber setpoint may name, °C (liquid-nitrogen chambers reach −196 °C; ovens rarely pass 300 °C). */
export const CHAMBER_RANGE_C = { min: -200, max: 400 } as const;

const celsius = (field: string) =>
  z
    .number({ error: `${field}: expected a temperature in °C (a number)` })
    .finite(`${field}: must be finite`)
    .min(CHAMBER_RANGE_C.min, `at least ${CHAMBER_RANGE_C.min} °C`)
    .max(CHAMBER_RANGE_C.max, `at most ${CHAMBER_RANGE_C.max} °C`);
const volts = () => quantity('voltage');
const positiveVolts = () => quantity('voltage', (n) => n.positive('must be greater than 0 V'));
const ratePerMin = () => z.number().positive('must be greater than 0 °C/min').max(100, 'at most 100 °C/min');

export const soakSchema = strictObject({
  toleranceC: z.number().positive('must be greater than 0 °C').max(20).default(0.5).meta({
    description: 'Soaked only while every DUT reading of the dwell is within ± this of the setpoint, °C. Default 0.5.',
  }),
  maxSlopeCPerMin: z.number().positive('must be greater than 0 °C/min').default(0.1).meta({
    description: "… and the least-squares slope of the DUT's temperature is under this, °C/min. Default 0.1.",
  }),
  dwellS: time().default(600).meta({ description: 'How long the DUT must stay in band, s ("10min"). Default 600 s.' }),
  timeoutS: time((n) => n.positive('must be greater than 0 s'))
    .default(3 * 3600)
    .meta({
      description: 'Give up on a soak after this long, s ("3h"): an event, a message, then onTimeout. Default 3 h.',
    }),
  maxDriftPpmPerMin: z.number().positive().optional().meta({
    description:
      'Optional: the frequency at nominalControlV must also drift less than this, ppm/min (the control output is on while soaking).',
  }),
  onTimeout: z.enum(['sweep-anyway', 'skip', 'stop']).default('skip').meta({
    description:
      'What a soak timeout does: "skip" the temperature (default), "sweep-anyway" and mark the condition, or "stop" the campaign.',
  }),
  readIntervalS: time((n) => n.positive('must be greater than 0 s'))
    .default(10)
    .meta({
      description: 'How often the DUT thermometer (and the chamber air) is read while soaking, s. Default 10 s.',
    }),
});

export const chamberLimitsSchema = strictObject({
  minC: celsius('chamber.minC').meta({ description: 'Lowest setpoint the chamber may be given, °C. Required.' }),
  maxC: celsius('chamber.maxC').meta({
    description: 'Highest setpoint the chamber may be given, °C. Required; above minC.',
  }),
  maxRateCPerMin: ratePerMin().meta({
    description: 'Fastest ramp the chamber may be asked for, °C/min. Required; the DUT and the fixture set it.',
  }),
});

export const campaignPlanSchema = strictObject({
  $schema: schemaRef,
  temperaturesC: z
    .array(celsius('temperaturesC'))
    .min(1)
    .max(40)
    .meta({ description: 'Chamber setpoints, °C; each inside chamber.minC … chamber.maxC. Required; 1–40 values.' }),
  supplyV: z.array(positiveVolts()).min(1).max(20).meta({
    description: 'DUT supply voltages (corners, e.g. nominal and ±5 %), V; each ≤ maxSupplyV. Required; 1–20 values.',
  }),
  nominalSupplyV: positiveVolts().optional().meta({
    description: 'Nominal DUT supply, V, where tempcos and headroom are read. Default: the middle of supplyV.',
  }),
  maxSupplyV: positiveVolts().meta({
    description:
      'Highest DUT supply the campaign may write, V. Required. Checked before any write; the supply driver holds the channel under it.',
  }),
  units: z
    .array(
      z
        .string()
        .trim()
        .min(1, 'must not be empty')
        .max(100, 'must be at most 100 characters')
        .refine((id) => !hasUnsafeChars(id), 'must not contain control characters, line breaks or bidi overrides'),
    )
    .min(1)
    .max(100)
    .meta({
      description:
        'DUT ids, one per unit, in the order they go in; the operator changes the unit between them. Required.',
    }),
  soak: soakSchema
    .default(soakSchema.parse({}))
    .meta({ description: 'When the DUT counts as soaked at a setpoint, and what a soak that never settles does.' }),
  chamber: chamberLimitsSchema.meta({ description: "The chamber's limits, checked before any write to it. Required." }),
  sweep: sweepPlanSchema.meta({ description: 'The gain sweep taken at each condition (a sweep plan). Required.' }),
  safeC: celsius('safeC')
    .default(25)
    .meta({ description: 'Chamber setpoint at the end, on every way out and before a unit change, °C. Default 25.' }),
  nominalControlV: volts().optional().meta({
    description:
      'Control voltage where frequency and Kvco are compared across conditions, V. Default: the middle of the sweep.',
  }),
  headroomTargetHz: quantity('frequency', (n) => n.positive('must be greater than 0 Hz'))
    .optional()
    .meta({
      description:
        'Frequency the PLL must hold, Hz, for the headroom check. Default: the frequency at nominalControlV, nominal supply, nearest 25 °C.',
    }),
  tuningWindowV: z
    .tuple([volts(), volts()])
    .optional()
    .meta({ description: "Tuning window [low, high] the loop can drive, V. Default: the sweep's range." }),
  rampCPerMin: ratePerMin()
    .optional()
    .meta({ description: 'Ramp rate asked of the chamber, °C/min. Default chamber.maxRateCPerMin; never above it.' }),
}).superRefine((plan, ctx) => {
  const { minC, maxC, maxRateCPerMin } = plan.chamber;
  if (!(minC < maxC))
    ctx.addIssue({ code: 'custom', path: ['chamber', 'maxC'], message: `must be above chamber.minC (${minC} °C)` });
  plan.temperaturesC.forEach((t, i) => {
    if (t < minC || t > maxC)
      ctx.addIssue({
        code: 'custom',
        path: ['temperaturesC', i],
        message: `${t} °C is outside chamber.minC … chamber.maxC (${minC} … ${maxC} °C)`,
      });
  });
  if (plan.safeC < minC || plan.safeC > maxC)
    ctx.addIssue({
      code: 'custom',
      path: ['safeC'],
      message: `${plan.safeC} °C is outside chamber.minC … chamber.maxC (${minC} … ${maxC} °C)`,
    });
  if (plan.rampCPerMin !== undefined && plan.rampCPerMin > maxRateCPerMin) {
    ctx.addIssue({
      code: 'custom',
      path: ['rampCPerMin'],
      message: `${plan.rampCPerMin} °C/min exceeds chamber.maxRateCPerMin (${maxRateCPerMin} °C/min)`,
    });
  }
  plan.supplyV.forEach((v, i) => {
    if (v > plan.maxSupplyV)
      ctx.addIssue({
        code: 'custom',
        path: ['supplyV', i],
        message: `${v} V is above maxSupplyV (${plan.maxSupplyV} V)`,
      });
  });
  if (plan.nominalSupplyV !== undefined && plan.nominalSupplyV > plan.maxSupplyV)
    ctx.addIssue({
      code: 'custom',
      path: ['nominalSupplyV'],
      message: `${plan.nominalSupplyV} V is above maxSupplyV (${plan.maxSupplyV} V)`,
    });
  if (new Set(plan.units).size !== plan.units.length)
    ctx.addIssue({ code: 'custom', path: ['units'], message: 'unit ids must be distinct' });
  if (plan.tuningWindowV && !(plan.tuningWindowV[0] < plan.tuningWindowV[1])) {
    ctx.addIssue({ code: 'custom', path: ['tuningWindowV', 1], message: 'must be above tuningWindowV[0]' });
  }
});

export type CampaignPlan = z.output<typeof campaignPlanSchema>;
export type CampaignPlanInput = z.input<typeof campaignPlanSchema>;
export type SoakPlan = z.output<typeof soakSchema>;
export type ChamberLimitsPlan = z.output<typeof chamberLimitsSchema>;

/** The plan's nominal DUT supply: given, else the middle of the sorted corners. */
export function nominalSupplyOf(plan: Pick<CampaignPlan, 'supplyV' | 'nominalSupplyV'>): number {
  if (plan.nominalSupplyV !== undefined) return plan.nominalSupplyV;
  const sorted = [...plan.supplyV].sort((a, b) => a - b);
  return sorted[Math.floor((sorted.length - 1) / 2)] as number;
}

/** The sweep's control-voltage range: explicit points or start…stop. */
export function sweepRangeV(sweep: CampaignPlan['sweep']): [number, number] {
  const values = sweep.points ?? [sweep.start ?? 0, sweep.stop ?? 0];
  return [Math.min(...values), Math.max(...values)];
}

/** Control voltage where conditions are compared: given, else the middle of the sweep. */
export function nominalControlOf(plan: Pick<CampaignPlan, 'nominalControlV' | 'sweep'>): number {
  if (plan.nominalControlV !== undefined) return plan.nominalControlV;
  const [lo, hi] = sweepRangeV(plan.sweep);
  return (lo + hi) / 2;
}
