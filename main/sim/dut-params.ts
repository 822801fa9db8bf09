/**
 * DUT model parameters (resources/duts/*.json), validated with zod so a bad
 * file names the field. SI units throughout: ohms, farads, henries, volts,
 * seconds, hertz; ppm where the trade quotes ppm.
 */
import { z } from 'zod';
import { schemaRef, strictObject } from '../../app/contract/schema-kit.ts';

/**
 * Every value is bounded to a physical range (wide enough for any bench
 * oscillator, narrow enough that the model never computes an infinity):
 * `max` is the largest magnitude accepted.
 */
const positive = (what: string, max: number) =>
  z
    .number({ error: `${what} must be a number` })
    .positive(`${what} must be > 0`)
    .max(max, `${what} must be ≤ ${max}`);
const finite = (what: string, max: number) =>
  z
    .number({ error: `${what} must be a number` })
    .min(-max, `${what} must be ≥ ${-max}`)
    .max(max, `${what} must be ≤ ${max}`);
const nonNegative = (what: string, max: number) =>
  z
    .number({ error: `${what} must be a number` })
    .nonnegative(`${what} must be ≥ 0`)
    .max(max, `${what} must be ≤ ${max}`);

const commonFields = {
  $schema: schemaRef,
  id: z.string().min(1),
  /** Scenario in words, shown to the user. */
  description: z.string().default(''),
  supply: strictObject({
    /** The DUT's nominal supply; the bench's supply channel 2 starts here. */
    nominalV: positive('supply.nominalV', 100),
    /** Below this the oscillator does not start. */
    minV: positive('supply.minV', 100),
    /** Current drawn at nominal supply (the load is modelled as a resistor). */
    currentA: positive('supply.currentA', 10),
  }),
  tuning: strictObject({
    /** First-order time constant of the tuning node (RC filter in the tuning line). */
    settleTauS: positive('tuning.settleTauS', 1000),
    /** Input resistance of the tuning port, seen by supply channel 1. */
    inputResistanceOhm: positive('tuning.inputResistanceOhm', 1e12),
  }),
  /** Fractional frequency change per °C around referenceC. */
  tempcoPpmPerC: finite('tempcoPpmPerC', 1e4),
  referenceC: finite('referenceC', 200).default(25),
  /**
   * Fractional change per °C of the tuning sensitivity: the core sees the
   * tuning node scaled by (1 + k·(T − referenceC)), so Kvco and the stall edge
   * move with temperature. Default 0.
   */
  tuningTempcoPpmPerC: finite('tuningTempcoPpmPerC', 1e5).default(0),
  /** Thermal time constant of the DUT (board and package) to the air around it, s. Default 300. */
  thermalTauS: positive('thermalTauS', 1e6).default(300),
  warmup: strictObject({
    /** Fractional offset at power-on, decaying exponentially to zero. */
    offsetPpm: finite('warmup.offsetPpm', 1e5),
    tauS: positive('warmup.tauS', 1e6),
  }),
  /** Frequency change per volt of DUT supply away from nominal. */
  pushingHzPerV: finite('pushingHzPerV', 1e9),
  noise: strictObject({
    /** White frequency noise: fractional σ of a 1 s average (scales as 1/√gate). */
    whiteFmAt1s: nonNegative('noise.whiteFmAt1s', 1e-3),
    /** Random-walk frequency wander, ppm per √hour. */
    randomWalkPpmPerSqrtHour: nonNegative('noise.randomWalkPpmPerSqrtHour', 1e3).default(0),
  }),
};

export const relaxationDutSchema = strictObject({
  kind: z.literal('relaxation'),
  ...commonFields,
  timing: strictObject({
    chargeResistanceOhm: positive('timing.chargeResistanceOhm', 1e12),
    capacitanceF: positive('timing.capacitanceF', 1),
    dischargeResistanceOhm: positive('timing.dischargeResistanceOhm', 1e12),
    /** The discharge path pulls the capacitor toward this rail. */
    dischargeTargetV: finite('timing.dischargeTargetV', 100),
  }),
  thresholds: strictObject({
    lowerV: finite('thresholds.lowerV', 100),
    upperV: finite('thresholds.upperV', 100),
    /** RMS noise on the comparator thresholds; becomes timing jitter through dv/dt. */
    noiseV: nonNegative('thresholds.noiseV', 1),
  }),
  chargeDrive: strictObject({
    /** Vc = gain·Vtune + offsetV, limited to supply − headroomV (source compliance). */
    gain: positive('chargeDrive.gain', 100),
    offsetV: finite('chargeDrive.offsetV', 100),
    headroomV: nonNegative('chargeDrive.headroomV', 100),
  }),
});

export const varactorDutSchema = strictObject({
  kind: z.literal('varactor-lc'),
  ...commonFields,
  tank: strictObject({
    inductanceH: positive('tank.inductanceH', 1),
    parasiticCapacitanceF: nonNegative('tank.parasiticCapacitanceF', 1e-3),
  }),
  varactor: strictObject({
    /** Zero-bias junction capacitance. */
    cj0F: positive('varactor.cj0F', 1e-3),
    /** Built-in potential φ. */
    builtInV: positive('varactor.builtInV', 10),
    /** Grading exponent γ: 1/2 abrupt, 1/3 linearly graded, > 1/2 hyperabrupt. */
    gradingExponent: positive('varactor.gradingExponent', 5),
    /** Below this reverse bias the diode conducts, the tank loses Q and the loop stops. */
    minReverseV: finite('varactor.minReverseV', 100),
  }),
});

export const dutParamsSchema = z
  .discriminatedUnion('kind', [relaxationDutSchema, varactorDutSchema])
  .superRefine((dut, ctx) => {
    if (dut.supply.minV > dut.supply.nominalV) {
      ctx.addIssue({
        code: 'custom',
        path: ['supply', 'minV'],
        message: 'supply.minV must not exceed supply.nominalV',
      });
    }
    if (dut.kind === 'relaxation' && dut.thresholds.lowerV >= dut.thresholds.upperV) {
      ctx.addIssue({
        code: 'custom',
        path: ['thresholds', 'upperV'],
        message: 'thresholds.upperV must exceed thresholds.lowerV',
      });
    }
  });

export type RelaxationDutParams = z.infer<typeof relaxationDutSchema>;
export type VaractorDutParams = z.infer<typeof varactorDutSchema>;
export type DutParams = z.infer<typeof dutParamsSchema>;

/** Error for a DUT file or object that fails validation; the message names the field. */
export class DutParamsError extends Error {
  override name = 'DutParamsError';
}

function describeIssues(error: z.ZodError, source: string): string {
  const lines = error.issues.map((issue) => {
    const field = issue.path.length > 0 ? issue.path.join('.') : '(root)';
    return `${field}: ${issue.message}`;
  });
  return `${source}: invalid DUT model — ${lines.join('; ')}`;
}

export function parseDutParams(value: unknown, source = 'DUT'): DutParams {
  const result = dutParamsSchema.safeParse(value);
  if (!result.success) throw new DutParamsError(describeIssues(result.error, source));
  return result.data;
}
