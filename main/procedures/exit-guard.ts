/**
 * Process-level ways out: SIGINT/SIGTERM stop the run cleanly (the procedure
 * then drives the safe state itself). Crashes, memory pressure and the
 * signals of a process that owns a bench are the last-resort guard's job
 * (main/service/last-resort-guard.ts).
 */
import type { RunControl } from './run-control.ts';

/** The bits of `process` used here, so tests can pass an EventEmitter. */
export interface SignalSource {
  on(event: string, listener: (...args: unknown[]) => void): unknown;
  off(event: string, listener: (...args: unknown[]) => void): unknown;
}

/** Stops `control` on SIGINT/SIGTERM; a second signal is left to the default handler's job by the caller. Returns a disposer. */
export function stopOnSignals(
  control: RunControl,
  source: SignalSource,
  signals: readonly string[] = ['SIGINT', 'SIGTERM'],
): () => void {
  const listeners = signals.map((name) => {
    const listener = (): void => control.stop('signal');
    source.on(name, listener);
    return [name, listener] as const;
  });
  return () => {
    for (const [name, listener] of listeners) source.off(name, listener);
  };
}
