/**
 * `--dut` for the simulated bench, the same for `sim` and the recording
 * commands: a built-in model name or a DUT model file (JSON).
 */
import { isBuiltinDutName, type BuiltinDutName } from '../sim/builtin-duts.ts';
import type { DutParams } from '../sim/dut-params.ts';
import { loadDutParamsFile } from './sim-files.ts';
import { UsageError } from './types.ts';

export async function resolveSimDut(value: string | undefined): Promise<BuiltinDutName | DutParams> {
  if (value === undefined) return 'relaxation';
  if (isBuiltinDutName(value)) return value;
  if (!value.toLowerCase().endsWith('.json'))
    throw new UsageError(`--dut "${value}": expected relaxation, varactor or a FILE.json`);
  try {
    return await loadDutParamsFile(value);
  } catch (error) {
    throw new UsageError(`--dut: ${(error as Error).message}`);
  }
}

/** Which built-in DUT's default plans suit a simulated DUT. */
export function defaultsFor(dut: BuiltinDutName | DutParams): BuiltinDutName {
  if (typeof dut === 'string') return dut;
  return dut.kind === 'relaxation' ? 'relaxation' : 'varactor';
}
