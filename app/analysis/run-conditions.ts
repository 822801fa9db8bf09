/**
 * A run's label and the conditions it was taken under, from its columns and
 * the hints its run.json gives: the zod-free half of datasheet-run.ts (which
 * re-exports it), so analysing a plain CSV evaluates no schema code.
 */
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
  /** The plan's tuning window, V. */
  window?: { fromV: number; toV: number };
}

/** Plan hints plus the conditions run.json recorded around the run (each optional). */
export interface RunHints extends PlanHints {
  /** Mean of the temperatures read at the start and end of the run. */
  recordedTemperatureC?: number;
  /** Mean of the DUT supply voltages read at the start and end of the run. */
  recordedDutSupplyV?: number;
}

/**
 * Conditions of one run: mean logged temperature and supply; without a
 * logged column, the mean of those recorded at the run's start and end (then
 * the plan's supply); gate from the plan. A pushing run varies the supply on
 * purpose, so it has no single supply condition.
 */
export function runConditions(
  kind: CsvKind,
  columns: { temperatureC?: ArrayLike<number> | null; supplyV?: ArrayLike<number> | null },
  hints: RunHints,
): RunConditions {
  const supplyV =
    meanOfFinite(columns.supplyV) ?? hints.recordedDutSupplyV ?? hints.supplyV ?? hints.dutSupplyV ?? null;
  const temperatureC = meanOfFinite(columns.temperatureC) ?? hints.recordedTemperatureC ?? null;
  return { temperatureC, supplyV: kind === 'pushing' ? null : supplyV, gateS: hints.gateS ?? null };
}
