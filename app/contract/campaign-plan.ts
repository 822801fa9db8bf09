/**
 * The campaign plan (`tunebench campaign --plan FILE`): temperatures, DUT
 * supply corners and units, how to judge a soak, the chamber's limits, the
 * sweep taken at each condition and where the chamber goes at the end.
 * Shared by the CLI, the service and the renderer's plan editor.
 */
import { z } from 'zod';
import { durationS, siNumber, sweepPlanSchema } from './plans.ts';

const celsius = (field: string) =>
  z.number({ error: `${field}: expected a temperature in °C (a number)` }).finite(`${field}: must be finite`);

export const soakSchema = z.object({
  /** DUT temperature within ± this of the setpoint, °C. */
  toleranceC: z.number().positive().default(0.5),
  /** … and its slope under this, °C/min … */
  maxSlopeCPerMin: z.number().positive().default(0.1),
  /** … for this long. */
  dwellS: durationS.default(600),
  /** Give up on a soak after this long (an event and a message; see onTimeout). */
  timeoutS: durationS.default(3 * 3600),
  /** Optional: the frequency at nominalControlV must also drift less than this, ppm/min. */
  maxDriftPpmPerMin: z.number().positive().optional(),
  /** What a soak timeout does: sweep anyway and mark the condition, skip it, or stop the campaign. */
  onTimeout: z.enum(['sweep-anyway', 'skip', 'stop']).default('skip'),
  /** How often the DUT thermometer is read during a soak. */
  readIntervalS: durationS.default(10),
});

export const chamberLimitsSchema = z.object({
  minC: celsius('chamber.minC'),
  maxC: celsius('chamber.maxC'),
  maxRateCPerMin: z.number().positive().finite(),
});

export const campaignPlanSchema = z
  .object({
    /** Chamber setpoints, °C. */
    temperaturesC: z.array(celsius('temperaturesC')).min(1).max(40),
    /** DUT supply voltages (e.g. nominal and ±5 %), V. */
    supplyV: z.array(siNumber).min(1).max(20),
    /** Nominal DUT supply, V (default: the middle of supplyV). Pushing and tempco are read there. */
    nominalSupplyV: siNumber.optional(),
    /** Highest DUT supply the campaign may write, V; checked before any write. */
    maxSupplyV: siNumber,
    /** DUT ids, one per unit; the operator changes the unit between them. */
    units: z.array(z.string().trim().min(1).max(100)).min(1).max(100),
    soak: soakSchema.default(soakSchema.parse({})),
    chamber: chamberLimitsSchema,
    sweep: sweepPlanSchema,
    /** Chamber setpoint at the end (also before a unit change), °C. */
    safeC: celsius('safeC').default(25),
    /** Control voltage where frequency and Kvco are compared across conditions (default: middle of the sweep). */
    nominalControlV: siNumber.optional(),
    /** Frequency the PLL must hold, Hz, for the headroom check (default: f at nominalControlV, nominal conditions). */
    headroomTargetHz: siNumber.optional(),
    /** Tuning window the loop can drive, V (default: the sweep's range). */
    tuningWindowV: z.tuple([siNumber, siNumber]).optional(),
    /** Ramp rate asked of the chamber, °C/min (default: chamber.maxRateCPerMin). */
    rampCPerMin: z.number().positive().optional(),
  })
  .superRefine((plan, ctx) => {
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
      if (!(v > 0) || v > plan.maxSupplyV)
        ctx.addIssue({
          code: 'custom',
          path: ['supplyV', i],
          message: `${v} V is not in 0 … maxSupplyV (${plan.maxSupplyV} V]`,
        });
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
