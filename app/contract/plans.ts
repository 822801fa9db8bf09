/**
 * Schemas for bench files and procedure plans (resources/docs/reference.md). Shared by
 * the CLI, the main process (validating IPC/WebSocket payloads) and the
 * renderer (validation as you type). Numbers are SI; strings in the one
 * quantity grammar of si.ts ("250m" V, "20mA", "100ms", "15min") are
 * converted here, so nothing downstream sees a string. Every object refuses
 * unknown keys, naming the nearest known one.
 */
import { z } from 'zod';
import { anyQuantity, quantity, schemaRef, strictObject, time } from './schema-kit.ts';

export { describeIssues } from './schema-kit.ts';

/** A plan with more points than this is a typo, not a measurement (sweep levels, pushing steps, explicit points). */
export const MAX_PLAN_POINTS = 100_000;
/** A drift log with more readings than this (116 days at 1 s) is a typo; its samples file would pass 1 GB. */
export const MAX_DRIFT_READINGS = 10_000_000;
/** Longest settling wait a plan may ask for, s. */
export const MAX_SETTLE_S = 600;
/** Gate (aperture) range a plan may name; the counter's profile narrows it (default 1 µs–10 s). */
export const GATE_LIMITS_S = { min: 1e-6, max: 1000 } as const;
/** Time one reading takes beyond its gate: a query and a ~20-byte reply over LAN or a 115200-baud line (tunebench's own allowance). */
export const READING_ALLOWANCE_S = 0.02;
/** A tuning port draws µA to mA; a control-channel current limit above this needs limits.acknowledgeHighCurrent. */
export const HIGH_CURRENT_LIMIT_A = 0.1;

const volts = (bound?: (n: z.ZodNumber) => z.ZodNumber) => quantity('voltage', bound);
const frequency = (bound?: (n: z.ZodNumber) => z.ZodNumber) => quantity('frequency', bound);
/** A number with an optional SI prefix and unit V, A or Hz, for fields of other files (campaign plans). */
export const siNumber = anyQuantity();
/** A time in seconds in the one grammar ("100ms", "15min", "8h"; a bare number is seconds). */
export const durationS = time();
const amps = (bound?: (n: z.ZodNumber) => z.ZodNumber) => quantity('current', bound);
const settleTime = () =>
  time((n) =>
    n.max(MAX_SETTLE_S, `at most ${MAX_SETTLE_S} s (10 min): a longer wait is a typo or a job for a drift log`),
  );
const gate = () =>
  time((n) =>
    n.min(GATE_LIMITS_S.min, 'at least 1 µs ("1us")').max(GATE_LIMITS_S.max, `at most ${GATE_LIMITS_S.max} s`),
  )
    .default(0.1)
    .meta({
      description:
        'Counter gate (aperture) time, s. Default 0.1 s. 1 µs–10 s unless the counter profile declares another range (minGateS/maxGateS).',
    });

export const limitsSchema = strictObject({
  maxControlV: volts((n) => n.positive('must be greater than 0 V')).meta({
    description:
      'Highest control voltage the plan may ever write, V. Required. Every setpoint and safe.controlV must be ≤ this.',
  }),
  currentLimitA: amps((n) => n.positive('must be greater than 0 A')).meta({
    description: `Current limit programmed on the control channel before its output turns on, A. Required. Above ${HIGH_CURRENT_LIMIT_A * 1000} mA needs acknowledgeHighCurrent.`,
  }),
  ovpV: volts().optional().meta({
    description:
      'Over-voltage protection level on the control channel, V. Default maxControlV + 10 %. Must be ≥ maxControlV. Ignored (and recorded) on a supply without OVP.',
  }),
  acknowledgeHighCurrent: z
    .boolean()
    .optional()
    .meta({
      description: `Set true to allow currentLimitA above ${HIGH_CURRENT_LIMIT_A * 1000} mA (a tuning port draws µA–mA; more usually means a wrong channel or unit).`,
    }),
}).superRefine((limits, ctx) => {
  if (limits.currentLimitA > HIGH_CURRENT_LIMIT_A && limits.acknowledgeHighCurrent !== true) {
    ctx.addIssue({
      code: 'custom',
      path: ['currentLimitA'],
      message: `${limits.currentLimitA} A is above ${HIGH_CURRENT_LIMIT_A * 1000} mA, far more than a tuning port draws; if it is meant, add "acknowledgeHighCurrent": true to limits`,
    });
  }
});

export const safeStateSchema = strictObject({
  controlV: volts().default(0).meta({
    description:
      'Control voltage left on the channel on every way out, V. Default 0. Must be within 0…limits.maxControlV.',
  }),
  outputOff: z
    .boolean()
    .default(true)
    .meta({ description: "Turn the control channel's output off on every way out. Default true." }),
});

export const settleSchema = z
  .discriminatedUnion('mode', [
    strictObject({
      mode: z.literal('auto'),
      maxS: settleTime()
        .default(2)
        .meta({ description: 'Longest wait for a point to settle, s. Default 2 s; at most 600 s.' }),
      toleranceCounts: z.number().positive().max(1e6).default(2).meta({
        description:
          'Settled when the change is within this many counts of the gate resolution (1/gate Hz). Default 2.',
      }),
    }),
    strictObject({
      mode: z.literal('fixed'),
      seconds: settleTime().meta({ description: 'Fixed wait after each step, s. Required; at most 600 s.' }),
    }),
  ])
  .meta({
    description:
      'Settling after each control-voltage step: {"mode": "auto", "maxS", "toleranceCounts"} or {"mode": "fixed", "seconds"}.',
  });

const safeDefault = { controlV: 0, outputOff: true };

export const sweepPlanSchema = strictObject({
  $schema: schemaRef,
  start: volts().optional().meta({ description: 'First control voltage, V. Required unless points is given.' }),
  stop: volts().optional().meta({ description: 'Last control voltage, V. Required unless points is given.' }),
  step: volts()
    .optional()
    .meta({
      description: `Step between control voltages, V (> 0). Required unless points is given; at most ${MAX_PLAN_POINTS} levels.`,
    }),
  points: z
    .array(volts())
    .min(1)
    .max(MAX_PLAN_POINTS, `at most ${MAX_PLAN_POINTS} points`)
    .optional()
    .meta({
      description: `Explicit list of control voltages, V; replaces start/stop/step. 1–${MAX_PLAN_POINTS} values.`,
    }),
  direction: z
    .enum(['up', 'down', 'up-down'])
    .default('up')
    .meta({ description: 'Order of the visits: up, down or up-down (hysteresis). Default up.' }),
  readingsPerPoint: z
    .number()
    .int()
    .min(1)
    .max(1000)
    .default(3)
    .meta({ description: 'Counter readings at each point. Default 3; 1–1000.' }),
  readings: strictObject({
    min: z.number().int().min(2).max(1000).meta({ description: 'Fewest readings at each point (2–1000).' }),
    max: z.number().int().min(2).max(1000).meta({ description: 'Most readings at each point (2–1000; ≥ min).' }),
    targetHz: frequency((n) => n.positive('must be greater than 0 Hz')).meta({
      description: 'Stop reading a point once the standard error of its mean is at most this, Hz.',
    }),
  })
    .refine((r) => r.min <= r.max, { message: 'min must not exceed max', path: ['min'] })
    .optional()
    .meta({
      description:
        'Adaptive readings (replaces readingsPerPoint): read each point at least min and at most max times, stopping once the standard error of its mean reaches targetHz. Optional.',
    }),
  gateS: gate(),
  settle: settleSchema.default({ mode: 'auto', maxS: 2, toleranceCounts: 2 }),
  refineEdgeV: volts((n) =>
    n.refine((v) => v === 0 || (v >= 1e-6 && v <= 1), 'must be 0 (off) or between 1 µV and 1 V'),
  )
    .default(0.001)
    .meta({
      description:
        'Bisect the stall edge down to this resolution after the coarse pass, V. Default 1 mV; 0 turns it off; else 1 µV–1 V.',
    }),
  limits: limitsSchema.meta({ description: 'Supply limits for the control channel. Required.' }),
  safe: safeStateSchema
    .default(safeDefault)
    .meta({ description: 'Where the control channel is left on every way out (completion, stop, error, signal).' }),
  window: strictObject({
    fromV: volts().meta({ description: 'Lowest control voltage the loop can drive, V.' }),
    toV: volts().meta({ description: 'Highest control voltage the loop can drive, V; above fromV.' }),
  })
    .optional()
    .meta({
      description:
        "Tuning window the PLL can drive (its charge pump's compliance), V: the gain table quotes Kvco over it. Optional.",
    }),
}).superRefine((plan, ctx) => {
  if (plan.window && !(plan.window.toV > plan.window.fromV)) {
    ctx.addIssue({
      code: 'custom',
      path: ['window', 'toV'],
      message: `must be above window.fromV (${plan.window.fromV} V)`,
    });
  }
  if (plan.points === undefined) {
    for (const key of ['start', 'stop', 'step'] as const) {
      if (plan[key] === undefined)
        ctx.addIssue({ code: 'custom', path: [key], message: `required unless "points" is given` });
    }
    if (plan.step !== undefined && !(plan.step > 0))
      ctx.addIssue({ code: 'custom', path: ['step'], message: 'must be greater than 0' });
  }
});

export const driftPlanSchema = strictObject({
  $schema: schemaRef,
  controlV: volts().meta({ description: 'Control voltage held during the log, V. Required; ≤ limits.maxControlV.' }),
  intervalS: time((n) => n.positive('must be greater than 0 s'))
    .default(1)
    .meta({
      description: `Time between readings, s. Default 1 s. At least gateS + ${READING_ALLOWANCE_S * 1000} ms (one reading).`,
    }),
  durationS: time((n) => n.positive('must be greater than 0 s'))
    .default(8 * 3600)
    .meta({
      description: `Length of the log, s. Default 8 h ("8h"). At most ${MAX_DRIFT_READINGS} readings (durationS / intervalS).`,
    }),
  gateS: gate(),
  settle: settleSchema
    .optional()
    .meta({ description: 'Settling at controlV before the first logged reading. Default auto with maxS 10 s.' }),
  limits: limitsSchema.meta({ description: 'Supply limits for the control channel. Required.' }),
  safe: safeStateSchema
    .default(safeDefault)
    .meta({ description: 'Where the control channel is left on every way out (completion, stop, error, signal).' }),
}).superRefine((plan, ctx) => {
  for (const problem of driftTimingProblems(plan))
    ctx.addIssue({ code: 'custom', path: [problem.field], message: problem.message });
});

/** A drift interval shorter than one reading, or more readings than MAX_DRIFT_READINGS. */
export function driftTimingProblems(plan: {
  intervalS: number;
  durationS: number;
  gateS: number;
}): { field: 'intervalS' | 'durationS'; message: string }[] {
  const problems: { field: 'intervalS' | 'durationS'; message: string }[] = [];
  const minIntervalS = plan.gateS + READING_ALLOWANCE_S;
  if (plan.intervalS < minIntervalS * (1 - 1e-9)) {
    problems.push({
      field: 'intervalS',
      message: `${plan.intervalS} s is shorter than one reading (gateS ${plan.gateS} s + ${READING_ALLOWANCE_S * 1000} ms); use at least ${Number(minIntervalS.toPrecision(6))} s or a shorter gate`,
    });
  }
  if (plan.durationS / plan.intervalS > MAX_DRIFT_READINGS) {
    problems.push({
      field: 'durationS',
      message: `gives more than ${MAX_DRIFT_READINGS} readings at intervalS ${plan.intervalS} s; use a longer interval or a shorter log`,
    });
  }
  return problems;
}

export const pushingPlanSchema = strictObject({
  $schema: schemaRef,
  controlV: volts().meta({
    description: 'Control voltage held while the DUT supply is stepped, V. Required; ≤ limits.maxControlV.',
  }),
  supplyStartV: volts().meta({ description: 'First DUT supply voltage, V. Required; ≤ maxSupplyV.' }),
  supplyStopV: volts().meta({ description: 'Last DUT supply voltage, V. Required; ≤ maxSupplyV.' }),
  supplyStepV: volts((n) => n.positive('must be greater than 0 V')).meta({
    description: `Step of the DUT supply, V (> 0). Required; at most ${MAX_PLAN_POINTS} steps.`,
  }),
  readingsPerPoint: z
    .number()
    .int()
    .min(1)
    .max(1000)
    .default(5)
    .meta({ description: 'Counter readings at each supply step. Default 5; 1–1000.' }),
  gateS: gate(),
  settleS: settleTime()
    .default(0.5)
    .meta({ description: 'Wait after each supply step, s. Default 0.5 s; at most 600 s.' }),
  maxSupplyV: volts((n) => n.positive('must be greater than 0 V')).meta({
    description:
      "Highest DUT supply voltage the plan may write, V. Required. The DUT-supply channel's OVP is set to maxSupplyV + 5 % (at least 50 mV above).",
  }),
  limits: limitsSchema.meta({ description: 'Supply limits for the control channel. Required.' }),
  safe: safeStateSchema
    .default(safeDefault)
    .meta({ description: 'Where the control channel is left on every way out (completion, stop, error, signal).' }),
});

export const instrumentConfigSchema = strictObject({
  address: z.string().min(1).max(300).meta({
    description:
      'Where the instrument is: tcp://HOST:PORT, serial:PATH?baud=…, TCPIP[n]::HOST::PORT::SOCKET, ASRL<PATH>::INSTR or sim[:role]. Required.',
  }),
  profile: z.string().min(1).max(1000).optional().meta({
    description:
      "Profile name (user profile folder, then resources/profiles/) or path to a profile file. Default: the role's standard SCPI profile.",
  }),
});

export const benchConfigSchema = strictObject({
  $schema: schemaRef,
  supply: strictObject({
    ...instrumentConfigSchema.shape,
    controlChannel: z
      .number()
      .int()
      .min(1)
      .max(64)
      .default(1)
      .meta({ description: 'Supply channel wired to the tuning port. Default 1.' }),
    dutSupplyChannel: z.number().int().min(1).max(64).default(2).meta({
      description: 'Supply channel powering the DUT (stepped by pushing). Default 2; must differ from controlChannel.',
    }),
  }).meta({ description: 'The programmable supply: tuning port and DUT supply. Required.' }),
  counter: instrumentConfigSchema.meta({ description: 'The frequency counter. Required.' }),
  thermometer: instrumentConfigSchema
    .optional()
    .meta({ description: 'Optional; without it temperature columns stay empty.' }),
  chamber: instrumentConfigSchema.optional().meta({
    description: 'Temperature chamber (campaigns only); the thermometer on the DUT is the soak reference. Optional.',
  }),
});

export type SweepPlan = z.output<typeof sweepPlanSchema>;
export type SweepPlanInput = z.input<typeof sweepPlanSchema>;
export type DriftPlan = z.output<typeof driftPlanSchema>;
export type PushingPlan = z.output<typeof pushingPlanSchema>;
export type BenchConfig = z.output<typeof benchConfigSchema>;
export type Limits = z.output<typeof limitsSchema>;
export type SafeState = z.output<typeof safeStateSchema>;
