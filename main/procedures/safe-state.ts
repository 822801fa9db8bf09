/**
 * The safe state: control voltage to the configured level, then the output
 * off (when configured). Best effort on every way out of a procedure: each
 * step is tried even when an earlier one failed, a dropped link is reopened
 * once before giving up, and every step is recorded as an event.
 */
import type { SafeState } from '../../app/contract/plans.ts';
import { DisconnectedError } from '../instruments/errors.ts';
import type { RoleName } from '../instruments/roles.ts';
import type { BenchRoles, EventBody } from './types.ts';

export interface SafeStateResult {
  ok: boolean;
  failures: string[];
}

/** One safe-state step on `role` (default the supply); also used by the campaign's safe state. */
export async function tryStep(
  bench: BenchRoles,
  step: string,
  action: () => Promise<void>,
  record: (event: EventBody) => void,
  failures: string[],
  role: RoleName = 'supply',
): Promise<void> {
  try {
    await action();
    record({ type: 'safe-state', step, ok: true });
    return;
  } catch (error) {
    const firstMessage = error instanceof Error ? error.message : String(error);
    if (error instanceof DisconnectedError && bench.reconnect) {
      // A link that dropped mid-run is the common case; one reopen is worth it.
      try {
        await bench.reconnect(role);
        await action();
        record({ type: 'safe-state', step, ok: true, afterReconnect: true });
        return;
      } catch (retryError) {
        const message = retryError instanceof Error ? retryError.message : String(retryError);
        failures.push(`${step}: ${message}`);
        record({ type: 'safe-state', step, ok: false, error: message, firstError: firstMessage });
        return;
      }
    }
    failures.push(`${step}: ${firstMessage}`);
    record({ type: 'safe-state', step, ok: false, error: firstMessage });
  }
}

/** Drives `channel` to the safe state; never throws. */
export async function goSafe(
  bench: BenchRoles,
  channel: number,
  safe: SafeState,
  record: (event: EventBody) => void,
): Promise<SafeStateResult> {
  const failures: string[] = [];
  await tryStep(bench, `control-voltage ${safe.controlV} V`, () => bench.supply.setVoltage(channel, safe.controlV), record, failures);
  if (safe.outputOff) {
    await tryStep(bench, 'output-off', () => bench.supply.setOutput(channel, false), record, failures);
  }
  return { ok: failures.length === 0, failures };
}
