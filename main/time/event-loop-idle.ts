/**
 * Waits until the event loop has nothing left to do except wait on timers:
 * no pending setImmediate callbacks, no pending I/O requests (file system,
 * DNS, socket writes), and every microtask drained. A virtual clock may then
 * jump to its next timer without overtaking work still in flight.
 *
 * Pending requests are read from process.getActiveResourcesInfo(): request
 * objects (FSReqCallback, FSReqPromise, WriteWrap, …) are transient, while
 * handles (TCPWrap, TTYWrap, Timeout) are long-lived and are not "work".
 */

const TRANSIENT = /Req|WriteWrap|ShutdownWrap|Immediate/;

function turn(): Promise<void> {
  return new Promise((resolve) => setImmediate(resolve));
}

function busy(): boolean {
  const resources = process.getActiveResourcesInfo();
  for (let i = 0; i < resources.length; i++) {
    if (TRANSIENT.test(resources[i] as string)) return true;
  }
  return false;
}

/**
 * Resolves once the loop is idle. Gives up after `maxTurns` loop turns so a
 * component that reschedules itself forever cannot hang the caller.
 */
export function eventLoopIdle(maxTurns = 10_000): Promise<void> {
  // Concurrent callers share one wait: two independent waiters would each see
  // the other's pending setImmediate and never find the loop idle.
  if (shared) return shared;
  const wait = (async () => {
    try {
      for (let i = 0; i < maxTurns; i++) {
        await turn();
        if (!busy()) return;
      }
    } finally {
      shared = null;
    }
  })();
  shared = wait;
  return wait;
}

let shared: Promise<void> | null = null;
