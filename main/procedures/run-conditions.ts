/**
 * The conditions a run was taken under — the DUT supply voltage and the
 * temperature — read once at the start (output on, before the first point)
 * and once at the end (after the safe state). Each read is best effort: a
 * condition that cannot be read is null and a `fault` event, never a reason
 * to stop a run or to delay its safe state.
 */
import type { RecordedConditions } from '../../app/contract/bench-api.ts';
import type { ProcedureContext } from './context.ts';

export type ConditionsPhase = 'start' | 'end';

/** A fresh record with nothing read yet. */
export function emptyConditions(): RecordedConditions {
  return { dutSupplyV: { start: null, end: null }, temperatureC: { start: null, end: null } };
}

/** A finite reading, or null (recorded as a fault) when the read throws or is not a number. */
async function tryRead(
  ctx: ProcedureContext,
  role: 'supply' | 'thermometer',
  operation: string,
  read: () => Promise<number>,
): Promise<number | null> {
  try {
    const value = await read();
    if (Number.isFinite(value)) return value;
    ctx.event({ type: 'fault', role, operation, error: `not a finite reading (${String(value)})` });
  } catch (error) {
    ctx.event({
      type: 'fault',
      role,
      operation,
      error: error instanceof Error ? error.message : String(error),
      errorName: error instanceof Error ? error.name : undefined,
    });
  }
  return null;
}

/**
 * Reads the conditions now, stores them under `phase` in `record`, and
 * records a `conditions` event ({ phase, dut_supply_v, temperature_c }).
 * The DUT supply is measured when the supply can, else its setpoint is read.
 */
export async function recordConditions(
  ctx: ProcedureContext,
  phase: ConditionsPhase,
  record: RecordedConditions,
): Promise<void> {
  const { supply, thermometer, dutSupplyChannel } = ctx.bench;
  const dutSupplyV = supply.capabilities.measureVoltage
    ? await tryRead(ctx, 'supply', 'conditions-measure-voltage', () => supply.measureVoltage(dutSupplyChannel))
    : await tryRead(ctx, 'supply', 'conditions-voltage-setpoint', () => supply.getVoltageSetpoint(dutSupplyChannel));
  const temperatureC = thermometer
    ? await tryRead(ctx, 'thermometer', 'conditions-temperature', () => thermometer.readTemperature())
    : null;
  record.dutSupplyV[phase] = dutSupplyV;
  record.temperatureC[phase] = temperatureC;
  ctx.event({ type: 'conditions', phase, dut_supply_v: dutSupplyV, temperature_c: temperatureC });
}
