/**
 * Waits until the event loop has nothing left to do except wait on timers:
 * no pending setImmediate callbacks, no pending I/O requests (file system,
 * DNS, socket writes), and every microtask drained. A virtual clock may then
 * jump to its next timer without overtaking work still in flight.
 *
 * Pending requests are read from process.getActiveResourcesInfo(): request
 * objects (FSReqCallback, FSReqPromise, WriteWrap, …) are transient, while
 * handles (TCPWrap, TTYWrap, Timeout) are long-lived and are not "work".
 *
 * A request in flight is waited for in real time, however many loop turns
 * that takes (an fsync on a busy disk can take seconds): giving up early let
 * the clock jump while a file write was still going, so a campaign on the
 * virtual clock came out differently from run to run. Only a component that
 * keeps rescheduling itself with setImmediate is cut off after `maxTurns`.
 */

const IO_REQUEST = /Req|WriteWrap|ShutdownWrap/;
const IMMEDIATE = /Immediate/;
/** Loop turns spun while a request is in flight before waiting in 1 ms real-time steps (spares the CPU). */
const SPIN_TURNS = 200;
/** Real time after which a request that never ends (a socket write to a peer that stopped reading) is given up on. */
export const MAX_IO_WAIT_MS = 30_000;

function turn(): Promise<void> {
  return new Promise((resolve) => setImmediate(resolve));
}

function pause(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

type LoopState = 'idle' | 'immediate' | 'io';

function loopState(): LoopState {
  const resources = process.getActiveResourcesInfo();
  let state: LoopState = 'idle';
  for (let i = 0; i < resources.length; i++) {
    const name = resources[i] as string;
    if (IO_REQUEST.test(name)) return 'io';
    if (IMMEDIATE.test(name)) state = 'immediate';
  }
  return state;
}

/**
 * Resolves once the loop is idle. Gives up after `maxTurns` loop turns with
 * no request in flight (so a component that reschedules itself forever
 * cannot hang the caller), or after `maxIoWaitMs` of real time on requests.
 */
export function eventLoopIdle(maxTurns = 10_000, maxIoWaitMs = MAX_IO_WAIT_MS): Promise<void> {
  // Concurrent callers share one wait: two independent waiters would each see
  // the other's pending setImmediate and never find the loop idle.
  if (shared) return shared;
  const wait = (async () => {
    try {
      let turns = 0;
      let ioTurns = 0;
      let ioSinceMs: number | null = null;
      for (;;) {
        await turn();
        const state = loopState();
        if (state === 'idle') return;
        if (state === 'immediate') {
          ioTurns = 0;
          ioSinceMs = null;
          if (++turns >= maxTurns) return;
          continue;
        }
        ioSinceMs ??= performance.now();
        if (performance.now() - ioSinceMs >= maxIoWaitMs) return;
        if (++ioTurns > SPIN_TURNS) await pause(1);
      }
    } finally {
      shared = null;
    }
  })();
  shared = wait;
  return wait;
}

let shared: Promise<void> | null = null;
