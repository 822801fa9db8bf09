/**
 * Closing or reloading the page leaves the bench safe: the first of
 * `beforeunload` and `pagehide` stops a run (its procedure drives and records
 * the safe state) or drives an idle bench's control channel to 0 V with the
 * output off, through the service's last-resort path. The first SCPI writes
 * leave within that event's microtasks, while the port is still open; what
 * needs a reply after the page is gone cannot be waited for.
 */
import type { BenchHolder } from '../../main/service/last-resort-guard.ts';

export const PAGE_CLOSE_EVENTS = ['beforeunload', 'pagehide'] as const;

/** Listens on `target` (the window); returns the promise of the safe state once an event came, via `fired()`. */
export function guardPageClose(
  target: Pick<EventTarget, 'addEventListener'>,
  holder: BenchHolder,
): { fired(): Promise<{ ok: boolean }> | null } {
  let leaving: Promise<{ ok: boolean }> | null = null;
  const onClose = (event: Event): void => {
    leaving ??= holder.leaveSafe({ kind: 'signal', signal: event.type });
  };
  for (const type of PAGE_CLOSE_EVENTS) target.addEventListener(type, onClose);
  return { fired: () => leaving };
}
