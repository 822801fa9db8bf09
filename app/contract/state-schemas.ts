/**
 * Schemas of the bench's state as it crosses the process boundary: the
 * connection, the live readout and a run's progress. The types of
 * ./bench-api.ts are inferred from them (one source for each shape); the
 * WebSocket client checks what arrives with them. Objects are loose so fields
 * added to the contract later pass through.
 */
import { z } from 'zod';
import { READING_STATUSES } from './reading-status.ts';

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

export const readoutSchema = z.looseObject({
  controlSetV: nullableNumber,
  controlMeasV: nullableNumber,
  frequencyHz: nullableNumber,
  temperatureC: nullableNumber,
  timeS: z.number(),
});

export const progressSchema = z.looseObject({
  runId: z.string(),
  kind: z.enum(['sweep', 'drift', 'pushing']),
  phase: z.enum(['settling', 'reading', 'refining', 'logging', 'paused', 'finishing']),
  pointsDone: z.number(),
  pointsTotal: z.number(),
  etaS: nullableNumber,
  latest: z
    .looseObject({
      controlV: z.number(),
      frequencyHz: nullableNumber,
      status: z.enum(READING_STATUSES),
      /** The stepped DUT supply of a pushing run. */ supplyV: z.number().optional(),
    })
    .nullable(),
});

const isoTime = z.string().min(1);

export const benchStatusSchema = z.looseObject({
  source: z.enum(['run', 'idle', 'none']),
  output: z.boolean().nullable(),
  controlSetV: nullableNumber,
  controlMeasV: nullableNumber,
  frequencyHz: nullableNumber,
  temperatureC: nullableNumber,
  updatedAt: isoTime.nullable(),
  links: z.array(
    z.looseObject({
      role: z.enum(['supply', 'counter', 'thermometer']),
      state: z.enum(['up', 'lost']),
      detail: z.string().nullable(),
    }),
  ),
  paused: z.looseObject({ since: isoTime, controlV: nullableNumber }).nullable(),
  safeState: z
    .looseObject({
      runId: z.string(),
      reached: z.boolean(),
      at: isoTime,
      outputOff: z.boolean(),
      failures: z.array(z.string()),
    })
    .nullable(),
});
