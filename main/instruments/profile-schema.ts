/**
 * Instrument profiles: JSON files mapping each role operation to command
 * strings. Validated with zod; placeholders are checked per operation and
 * compiled once. A bad profile is refused with the field named.
 */
import { z } from 'zod';
import { schemaRef, strictObject } from '../../app/contract/schema-kit.ts';
import type { CommandTemplate } from './command-template.ts';

export const PROFILE_SCHEMA_ID = 'tunebench.profile/1';

const command = z.string().trim().min(1, 'must be a non-empty command string');
/** An operation that reads a reply must be a SCPI query: without "?" the instrument never answers, and silence would pass for "no signal". */
const query = command.refine(
  (text) => text.includes('?'),
  'must be a query (a SCPI query header ends in "?", e.g. "READ?")',
);
const positiveS = z.number().positive().finite();

const common = {
  $schema: schemaRef,
  schema: z.literal(PROFILE_SCHEMA_ID),
  description: z.string().optional(),
  /** Ends every command and reply line. */
  lineTerminator: z.enum(['\n', '\r\n', '\r']).default('\n'),
  /** Read SYST:ERR? after every write and fail the write when it holds errors. */
  checkErrorsAfterWrite: z.boolean().default(true),
  /** Commands sent once after connecting (no placeholders), e.g. "*CLS". */
  init: z.array(command).default([]),
};

export const supplyProfileSchema = strictObject({
  ...common,
  role: z.literal('supply'),
  timeouts: strictObject({ defaultS: positiveS.default(2) }).default({ defaultS: 2 }),
  capabilities: strictObject({
    channels: z.number().int().min(1).max(64),
    measureVoltage: z.boolean(),
    measureCurrent: z.boolean(),
    overVoltageProtection: z.boolean(),
  }),
  /**
   * The supply's ratings: a voltage read back (setpoint or measured) beyond
   * ±maxVoltageV, or a current beyond ±maxCurrentA, is not a measurement
   * but a fault.
   */
  ratings: strictObject({
    maxVoltageV: z.number().positive().max(1e4).default(100).meta({
      description: 'Rated voltage, V: a voltage read back beyond ± this is a fault, not a value. Default 100.',
    }),
    maxCurrentA: z.number().positive().max(1e3).default(20).meta({
      description: 'Rated current, A: a current read back beyond ± this is a fault, not a value. Default 20.',
    }),
  })
    .default({ maxVoltageV: 100, maxCurrentA: 20 })
    .meta({ description: "The supply's ratings; readbacks beyond them are faults." }),
  commands: strictObject({
    identify: query.default('*IDN?'),
    setVoltage: command,
    getVoltageSetpoint: query,
    setCurrentLimit: command,
    setOverVoltageProtection: command.optional(),
    setOutput: command,
    getOutput: query,
    measureVoltage: query.optional(),
    measureCurrent: query.optional(),
  }),
}).superRefine((profile, ctx) => {
  const needs: [keyof typeof profile.capabilities, keyof typeof profile.commands][] = [
    ['overVoltageProtection', 'setOverVoltageProtection'],
    ['measureVoltage', 'measureVoltage'],
    ['measureCurrent', 'measureCurrent'],
  ];
  for (const [capability, op] of needs) {
    if (profile.capabilities[capability] === true && profile.commands[op] === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['commands', op],
        message: `required because capabilities.${capability} is true`,
      });
    }
  }
});

export const counterProfileSchema = strictObject({
  ...common,
  role: z.literal('counter'),
  timeouts: strictObject({
    defaultS: positiveS.default(2),
    /** A reading may take the gate time plus this much before it counts as "no reply". */
    measureMarginS: positiveS.default(1),
  }).default({ defaultS: 2, measureMarginS: 1 }),
  /** Gate assumed until setGate is called, s. */
  defaultGateS: positiveS.default(0.1),
  /** Highest frequency the counter can measure, Hz: a reading above it is a fault, not a measurement. */
  maxInputHz: z.number().positive().max(1e12).default(3e9).meta({
    description:
      'Highest frequency the counter can measure, Hz: a reading above it is a fault, not a measurement. Default 3 GHz.',
  }),
  /**
   * Shape of a reading reply: `nr3` needs an exponent (+1.0E+04), `decimal`
   * a point or an exponent (NR2 or NR3), `any` also takes integers (NR1).
   * A reply of another shape (a stray "1") is a fault, never a frequency.
   */
  replyFormat: z.enum(['nr3', 'decimal', 'any']).default('decimal').meta({
    description:
      'Shape of a reading reply: nr3 needs an exponent, decimal a point or an exponent, any also takes integers. Another shape is a fault. Default decimal.',
  }),
  /** Shortest and longest gate the counter takes, s; plans outside are refused before a run starts. */
  minGateS: positiveS.default(1e-6),
  maxGateS: positiveS.max(1000).default(10),
  /** Which replies mean "no oscillation" rather than a fault. */
  noSignal: strictObject({
    notANumber: z.boolean().default(true),
    zero: z.boolean().default(true),
    timeout: z.boolean().default(true),
    /** Readings at or below this many Hz also count as zero. */
    belowHz: z.number().min(0).finite().default(0),
  }).default({ notANumber: true, zero: true, timeout: true, belowHz: 0 }),
  commands: strictObject({
    identify: query.default('*IDN?'),
    setGate: command,
    readFrequency: query,
  }),
});

export const thermometerProfileSchema = strictObject({
  ...common,
  role: z.literal('thermometer'),
  timeouts: strictObject({ defaultS: positiveS.default(2) }).default({ defaultS: 2 }),
  /** Unit the instrument replies in; converted to °C. */
  unit: z.enum(['C', 'K', 'F']).default('C'),
  /** Plausible readings, °C (after conversion): outside them a reading is a fault (an open or shorted probe). */
  plausibleC: strictObject({
    min: z.number().min(-273.15).default(-200).meta({ description: 'Lowest plausible reading, °C. Default −200.' }),
    max: z.number().max(5000).default(1000).meta({ description: 'Highest plausible reading, °C. Default 1000.' }),
  })
    .default({ min: -200, max: 1000 })
    .meta({
      description:
        'Plausible readings after conversion to °C: outside them a reading is a fault (an open or shorted probe).',
    }),
  commands: strictObject({
    identify: query.default('*IDN?'),
    readTemperature: query,
  }),
});

export const chamberProfileSchema = strictObject({
  ...common,
  role: z.literal('chamber'),
  timeouts: strictObject({ defaultS: positiveS.default(3) }).default({ defaultS: 3 }),
  capabilities: strictObject({ rampRate: z.boolean(), runStop: z.boolean() }),
  /** At the end of a campaign: drive to the plan's safeC ("setpoint") or switch conditioning off ("stop"). */
  endAction: z.enum(['setpoint', 'stop']).default('setpoint'),
  /** A setpoint read back within this many °C of what was written counts as taken. */
  setpointToleranceC: z.number().positive().finite().default(0.05),
  commands: strictObject({
    identify: command.default('*IDN?'),
    setSetpoint: command,
    getSetpoint: command,
    readAirTemperature: command,
    setRampRate: command.optional(),
    setRunning: command.optional(),
    getRunning: command.optional(),
  }),
}).superRefine((profile, ctx) => {
  const needs: [keyof typeof profile.capabilities, keyof typeof profile.commands][] = [
    ['rampRate', 'setRampRate'],
    ['runStop', 'setRunning'],
    ['runStop', 'getRunning'],
  ];
  for (const [capability, op] of needs) {
    if (profile.capabilities[capability] && profile.commands[op] === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['commands', op],
        message: `required because capabilities.${capability} is true`,
      });
    }
  }
  if (profile.endAction === 'stop' && !profile.capabilities.runStop) {
    ctx.addIssue({ code: 'custom', path: ['endAction'], message: '"stop" needs capabilities.runStop; use "setpoint"' });
  }
});

export const profileSchema = z.discriminatedUnion('role', [
  supplyProfileSchema,
  counterProfileSchema,
  thermometerProfileSchema,
  chamberProfileSchema,
]);

/** Placeholders each operation may use. */
export const PLACEHOLDERS = {
  supply: {
    identify: [],
    setVoltage: ['channel', 'volts'],
    getVoltageSetpoint: ['channel'],
    setCurrentLimit: ['channel', 'amps'],
    setOverVoltageProtection: ['channel', 'volts'],
    setOutput: ['channel', 'state'],
    getOutput: ['channel'],
    measureVoltage: ['channel'],
    measureCurrent: ['channel'],
  },
  counter: { identify: [], setGate: ['gateS'], readFrequency: ['gateS'] },
  thermometer: { identify: [], readTemperature: [] },
  chamber: {
    identify: [],
    setSetpoint: ['celsius'],
    getSetpoint: [],
    readAirTemperature: [],
    setRampRate: ['ratePerMin'],
    setRunning: ['state'],
    getRunning: [],
  },
} as const satisfies Record<string, Record<string, readonly string[]>>;

type Compiled<C> = { [K in keyof C]-?: undefined extends C[K] ? CommandTemplate | undefined : CommandTemplate };

export type SupplyProfile = Omit<z.output<typeof supplyProfileSchema>, 'commands'> & {
  name: string;
  commands: Compiled<z.output<typeof supplyProfileSchema>['commands']>;
};
export type CounterProfile = Omit<z.output<typeof counterProfileSchema>, 'commands'> & {
  name: string;
  commands: Compiled<z.output<typeof counterProfileSchema>['commands']>;
};
export type ThermometerProfile = Omit<z.output<typeof thermometerProfileSchema>, 'commands'> & {
  name: string;
  commands: Compiled<z.output<typeof thermometerProfileSchema>['commands']>;
};
export type ChamberProfile = Omit<z.output<typeof chamberProfileSchema>, 'commands'> & {
  name: string;
  commands: Compiled<z.output<typeof chamberProfileSchema>['commands']>;
};
export type InstrumentProfile = SupplyProfile | CounterProfile | ThermometerProfile | ChamberProfile;
export type ProfileInput = z.input<typeof profileSchema>;
