/**
 * What a run contributes to the gain table besides its analysis — its label
 * and the conditions it was taken under — worked out one way for both the
 * `tunebench datasheet` command and the renderer's gain-table screen, so the
 * two write the same files.
 */
import { z } from 'zod';
import type { CsvKind } from './csv-columns.ts';
import type { RunConditions } from './datasheet.ts';
import { meanOfFinite } from './mean-finite.ts';

/** "run id (DUT id)", or the run id alone. */
export function datasheetRunLabel(runId: string, dutId: string): string {
  return `${runId}${dutId ? ` (${dutId})` : ''}`;
}

/** Plan fields that say something about the conditions (each optional). */
export interface PlanHints {
  gateS?: number;
  supplyV?: number;
  dutSupplyV?: number;
}

// Each field on its own: a malformed one is ignored, the others still count (they are hints).
const planHintsSchema = z.looseObject({
  gateS: z.number().positive().optional().catch(undefined),
  supplyV: z.number().optional().catch(undefined),
  dutSupplyV: z.number().optional().catch(undefined),
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
  return hints;
}

/**
 * Conditions of one run: mean measured temperature and supply (the plan's
 * supply when none was logged), gate from the plan. A pushing run varies the
 * supply on purpose, so it has no single supply condition.
 */
export function runConditions(
  kind: CsvKind,
  columns: { temperatureC?: ArrayLike<number> | null; supplyV?: ArrayLike<number> | null },
  hints: PlanHints,
): RunConditions {
  const supplyV = meanOfFinite(columns.supplyV) ?? hints.supplyV ?? hints.dutSupplyV ?? null;
  return { temperatureC: meanOfFinite(columns.temperatureC), supplyV: kind === 'pushing' ? null : supplyV, gateS: hints.gateS ?? null };
}
