/** Bounded reopen of a dropped link: a few tries, waiting longer each time, on the injected clock. */
import type { Clock } from '../time/clock.ts';
import { DisconnectedError } from './errors.ts';
import type { Transport } from './transport.ts';

export interface ReconnectPolicy {
  /** Tries before giving up; 0 means the session never reopens on its own (explicit reconnect still tries once). */
  attempts: number;
  /** Wait before the second try, s; the n-th wait is n times this. */
  delayS: number;
}

/** Resolves with the number of tries used, or rejects with DisconnectedError. */
export async function reopenWithRetry(transport: Transport, clock: Clock, policy: ReconnectPolicy): Promise<number> {
  const attempts = Math.max(1, policy.attempts);
  let lastError: unknown = null;
  for (let attempt = 1; attempt <= attempts; attempt += 1) {
    try {
      await transport.open();
      return attempt;
    } catch (error) {
      lastError = error;
      if (attempt < attempts) await clock.sleep(policy.delayS * attempt);
    }
  }
  const detail = lastError instanceof Error ? lastError.message : String(lastError);
  throw new DisconnectedError(transport.address, `reopen failed after ${attempts} attempt(s): ${detail}`, {
    cause: lastError,
  });
}
