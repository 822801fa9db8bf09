/**
 * What a run contributes to the gain table besides its analysis — its label
 * and the conditions it was taken under — worked out one way for both the
 * `tunebench datasheet` command and the renderer's gain-table screen, so the
 * two write the same files.
 */
import { z } from 'zod';
import type { RunOrigin } from './datasheet.ts';
import { isSimulatedBench } from '../contract/run-meta-schema.ts';
import { meanOfFinite } from './mean-finite.ts';
import type { PlanHints, RunHints } from './run-conditions.ts';

export { datasheetRunLabel, runConditions, type PlanHints, type RunHints } from './run-conditions.ts';

// Each field on its own: a malformed one is ignored, the others still count (they are hints).
const planHintsSchema = z.looseObject({
  gateS: z.number().positive().optional().catch(undefined),
  supplyV: z.number().optional().catch(undefined),
  dutSupplyV: z.number().optional().catch(undefined),
  window: z.object({ fromV: z.number(), toV: z.number() }).optional().catch(undefined),
});

/** Plan hints from a run's plan (unvalidated: any shape). */
export function planHints(plan: unknown): PlanHints {
  const parsed = planHintsSchema.safeParse(plan);
  if (!parsed.success) return {};
  const hints: PlanHints = {};
  for (const key of ['gateS', 'supplyV', 'dutSupplyV'] as const) {
    const value = parsed.data[key];
    if (value !== undefined && Number.isFinite(value)) hints[key] = value;
  }
  const w = parsed.data.window;
  if (w && Number.isFinite(w.fromV) && Number.isFinite(w.toV) && w.toV > w.fromV)
    hints.window = { fromV: w.fromV, toV: w.toV };
  return hints;
}

// run.json `conditions` ({ start, end } per condition, null when not read); malformed parts are ignored.
const spanSchema = z
  .looseObject({
    start: z.number().nullable().optional().catch(undefined),
    end: z.number().nullable().optional().catch(undefined),
  })
  .optional()
  .catch(undefined);
const recordedSchema = z.looseObject({ dutSupplyV: spanSchema, temperatureC: spanSchema });

function spanMean(
  span: { start?: number | null | undefined; end?: number | null | undefined } | undefined,
): number | undefined {
  if (!span) return undefined;
  return meanOfFinite([span.start ?? Number.NaN, span.end ?? Number.NaN]) ?? undefined;
}

/** Hints from a run's run.json (unvalidated: any shape): its plan and recorded `conditions`, if any. */
export function runHints(meta: { plan: unknown; conditions?: unknown }): RunHints {
  const hints: RunHints = planHints(meta.plan);
  const parsed = recordedSchema.safeParse(meta.conditions);
  if (!parsed.success) return hints;
  const temperatureC = spanMean(parsed.data.temperatureC);
  const dutSupplyV = spanMean(parsed.data.dutSupplyV);
  if (temperatureC !== undefined) hints.recordedTemperatureC = temperatureC;
  if (dutSupplyV !== undefined) hints.recordedDutSupplyV = dutSupplyV;
  return hints;
}

/** What run.json says that decides whether a run may enter a gain table (status, DUT, simulated bench). */
export function runOrigin(meta: {
  status: string;
  dut: { id: string };
  instruments: { idn: string; address: string }[];
  simulated?: boolean;
}): RunOrigin {
  const kind = (meta.dut as { kind?: unknown }).kind;
  return {
    status: meta.status,
    dutId: meta.dut.id,
    dutKind: typeof kind === 'string' ? kind : null,
    simulated: meta.simulated === true || isSimulatedBench(meta.instruments),
  };
}
