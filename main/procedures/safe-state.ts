/**
 * The safe state: control voltage to the configured level, then the output
 * off (when configured) — and proven by readback, because what a supply was
 * told is not what it did.
 *
 * 1. Every command goes out first, urgently: ahead of any queued command and
 *    of any resync, without the error-queue check, so a supply whose replies
 *    have wedged (link up, answers never end) still gets `VOLT 0` / `OUTP OFF`.
 * 2. Each step is then read back through the profile (`VOLT?`, `OUTP?`); a
 *    mismatch is written again, up to SAFE_STATE_TRIES reads in all.
 * 3. If a readback could not be made (timeout, dropped link, unproven
 *    alignment) the supply link is reopened once (a fresh TCP connection or
 *    a reopened serial port), every unconfirmed command written again, and
 *    read back again.
 * A step still unconfirmed is recorded `ok: false` with what was read, and
 * its message names the channel. Never throws.
 */
import type { SafeState } from '../../app/contract/plans.ts';
import { AlignmentError, DisconnectedError, TimeoutError } from '../instruments/errors.ts';
import type { RoleName, SupplyWriteOptions } from '../instruments/roles.ts';
import { ProcedureFailure } from './context.ts';
import { setpointMatches } from '../instruments/setpoint-match.ts';
import type { BenchRoles, EventBody } from './types.ts';

export interface SafeStateResult {
  ok: boolean;
  /** One line per unconfirmed step, naming the channel and what was read. */
  failures: string[];
}

/** Readbacks per step before it is given up on (each after a rewrite). */
export const SAFE_STATE_TRIES = 3;

/** One supply step that can be written and read back. */
export interface VerifiedStep {
  /** Event name, e.g. `control-voltage 0 V`, `output-off`. */
  name: string;
  channel: number;
  write(options?: SupplyWriteOptions): Promise<void>;
  /** Reads the state back: `ok` when it is what `write` set; `read` says what was read. */
  verify(): Promise<{ ok: boolean; read: string }>;
}

interface Check {
  ok: boolean;
  read: string | null;
  error: string | null;
  attempts: number;
  /** The readback itself failed for want of a working link. */
  linkTrouble: boolean;
}

export function voltageStep(bench: BenchRoles, channel: number, volts: number, name: string): VerifiedStep {
  return {
    name,
    channel,
    write: (options) => bench.supply.setVoltage(channel, volts, options),
    async verify() {
      const read = await bench.supply.getVoltageSetpoint(channel);
      return { ok: setpointMatches(read, volts), read: `${read} V` };
    },
  };
}

export function outputOffStep(bench: BenchRoles, channel: number, name = 'output-off'): VerifiedStep {
  return {
    name,
    channel,
    write: (options) => bench.supply.setOutput(channel, false, options),
    async verify() {
      const on = await bench.supply.getOutput(channel);
      return { ok: !on, read: on ? 'ON' : 'OFF' };
    },
  };
}

function messageOf(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

function isLinkTrouble(error: unknown): boolean {
  return error instanceof TimeoutError || error instanceof DisconnectedError || error instanceof AlignmentError;
}

async function confirm(step: VerifiedStep): Promise<Check> {
  let read: string | null = null;
  let error: string | null = null;
  for (let attempt = 1; attempt <= SAFE_STATE_TRIES; attempt += 1) {
    try {
      const result = await step.verify();
      read = result.read;
      error = null;
      if (result.ok) return { ok: true, read, error: null, attempts: attempt, linkTrouble: false };
    } catch (caught) {
      // A link that does not answer will not answer the next try either: reopen it first.
      error = messageOf(caught);
      if (isLinkTrouble(caught)) return { ok: false, read, error, attempts: attempt, linkTrouble: true };
    }
    if (attempt === SAFE_STATE_TRIES) break;
    try {
      await step.write();
    } catch (caught) {
      error = messageOf(caught);
      if (isLinkTrouble(caught)) return { ok: false, read, error, attempts: attempt, linkTrouble: true };
    }
  }
  return { ok: false, read, error, attempts: SAFE_STATE_TRIES, linkTrouble: false };
}

async function writeUrgently(steps: readonly VerifiedStep[], errors: Map<VerifiedStep, string>): Promise<void> {
  for (const step of steps) {
    try {
      await step.write({ urgent: true });
    } catch (error) {
      errors.set(step, messageOf(error));
    }
  }
}

/** Writes `steps`, then proves each by readback (see the module comment). Never throws. */
export async function driveVerified(
  bench: BenchRoles,
  steps: readonly VerifiedStep[],
  record: (event: EventBody) => void,
): Promise<SafeStateResult> {
  const writeErrors = new Map<VerifiedStep, string>();
  await writeUrgently(steps, writeErrors);
  const checks = new Map<VerifiedStep, Check>();
  let reconnected = false;
  for (;;) {
    for (const step of steps) {
      if (checks.get(step)?.ok === true) continue;
      checks.set(step, await confirm(step));
    }
    const stuck = steps.some((step) => checks.get(step)?.linkTrouble === true);
    if (!stuck || reconnected || !bench.reconnect) break;
    reconnected = true;
    try {
      await bench.reconnect('supply');
      record({ type: 'safe-state-reconnect', role: 'supply', ok: true });
    } catch (error) {
      record({ type: 'safe-state-reconnect', role: 'supply', ok: false, error: messageOf(error) });
      break;
    }
    await writeUrgently(
      steps.filter((step) => checks.get(step)?.ok !== true),
      writeErrors,
    );
  }
  const failures: string[] = [];
  for (const step of steps) {
    const check = checks.get(step) as Check;
    const firstError = writeErrors.get(step);
    const afterReconnect = reconnected && check.ok ? { afterReconnect: true } : {};
    if (check.ok) {
      record({
        type: 'safe-state',
        step: step.name,
        channel: step.channel,
        ok: true,
        read: check.read,
        attempts: check.attempts,
        ...afterReconnect,
      });
      continue;
    }
    const read = check.read ?? 'nothing';
    const why = check.error ?? `read back ${read}`;
    failures.push(
      `channel ${step.channel} ${step.name} not confirmed after ${check.attempts} readback(s): ${why}${check.read !== null && check.error !== null ? ` (last read ${read})` : ''}`,
    );
    record({
      type: 'safe-state',
      step: step.name,
      channel: step.channel,
      ok: false,
      read: check.read,
      attempts: check.attempts,
      error: why,
      ...(firstError === undefined ? {} : { firstError }),
    });
  }
  return { ok: failures.length === 0, failures };
}

/**
 * One best-effort step on `role` with no readback (a dropped link reopened
 * once): the campaign's chamber steps, which have no supply readback. Supply
 * steps use driveVerified.
 */
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
    const firstMessage = messageOf(error);
    if (error instanceof DisconnectedError && bench.reconnect) {
      try {
        await bench.reconnect(role);
        await action();
        record({ type: 'safe-state', step, ok: true, afterReconnect: true });
        return;
      } catch (retryError) {
        const message = messageOf(retryError);
        failures.push(`${step}: ${message}`);
        record({ type: 'safe-state', step, ok: false, error: message, firstError: firstMessage });
        return;
      }
    }
    failures.push(`${step}: ${firstMessage}`);
    record({ type: 'safe-state', step, ok: false, error: firstMessage });
  }
}

/** Drives `channel` to the safe state and proves it by readback; never throws. */
export async function goSafe(
  bench: BenchRoles,
  channel: number,
  safe: SafeState,
  record: (event: EventBody) => void,
): Promise<SafeStateResult> {
  const steps = [voltageStep(bench, channel, safe.controlV, `control-voltage ${safe.controlV} V`)];
  if (safe.outputOff) steps.push(outputOffStep(bench, channel));
  return driveVerified(bench, steps, record);
}

/**
 * Reads `channel` as it is now (output state, setpoint). If its output is
 * on — left by a crashed run or by hand — records `found-output-on` and
 * drives it to the safe state before any limit is applied; a safe state that
 * cannot be confirmed stops the run before it writes anything else.
 */
export async function leaveFoundOutput(
  bench: BenchRoles,
  channel: number,
  safe: SafeState,
  record: (event: EventBody) => void,
): Promise<void> {
  const outputOn = await bench.supply.getOutput(channel);
  if (!outputOn) return;
  const setpointV = await bench.supply.getVoltageSetpoint(channel);
  record({ type: 'found-output-on', channel, setpointV });
  const result = await goSafe(bench, channel, safe, record);
  if (!result.ok)
    throw new ProcedureFailure(
      'limits',
      `channel ${channel} was found on at ${setpointV} V and could not be put in the safe state: ${result.failures.join('; ')}`,
    );
}
