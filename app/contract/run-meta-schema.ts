/**
 * run.json (CONTRACTS.md "Run folder", schema `tunebench.run/1`) as a zod
 * schema. One definition for every reader: the store checks files with it,
 * the renderer checks replies and events with it. Objects are loose so keys a
 * later version adds (e.g. `conditions`) pass through.
 */
import { z } from 'zod';

export const RUN_SCHEMA = 'tunebench.run/1';

/** A condition read at the start and at the end of a run; null when it could not be read. */
const conditionSpanSchema = z.object({ start: z.number().nullable(), end: z.number().nullable() });

export const runMetaSchema = z.looseObject({
  schema: z.literal(RUN_SCHEMA),
  id: z.string(),
  kind: z.enum(['sweep', 'drift', 'pushing']),
  status: z.enum(['running', 'complete', 'aborted', 'interrupted', 'failed']),
  startedAt: z.string(),
  endedAt: z.string().nullable(),
  dut: z.looseObject({ id: z.string(), notes: z.string() }),
  instruments: z.array(z.looseObject({ role: z.string(), idn: z.string(), address: z.string() })),
  plan: z.unknown(),
  software: z.looseObject({ version: z.string() }),
  /** Conditions read at the start and end of the run (sweeps; absent in older runs); a malformed record reads as absent. */
  conditions: z
    .object({ dutSupplyV: conditionSpanSchema, temperatureC: conditionSpanSchema })
    .optional()
    .catch(undefined),
  /** Why a `failed` run failed (e.g. the disk refused its files), when the disk let us record it. */
  failure: z.string().optional(),
  /** True when the run was taken on the simulated bench (absent: real instruments, or an older run — see isSimulatedBench). */
  simulated: z.boolean().optional(),
});

/**
 * True when any instrument of a run was the built-in simulated bench: an
 * in-process `sim` address, or a `tunebench sim` server's identity
 * ("tunebench,SIM-…"). Run folders record it as run.json `simulated: true`.
 */
export function isSimulatedBench(instruments: readonly { idn: string; address: string }[]): boolean {
  return instruments.some((i) => i.address === 'sim' || i.address.startsWith('sim:') || /^tunebench,SIM-/i.test(i.idn));
}
