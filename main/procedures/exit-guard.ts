/**
 * Process-level ways out: SIGINT/SIGTERM stop the run cleanly (the procedure
 * then drives the safe state itself), and an uncaught error anywhere in the
 * process still gets the supply to its safe state before the process exits.
 */
import type { SafeState } from '../../app/contract/plans.ts';
import type { RunControl } from './run-control.ts';
import { goSafe } from './safe-state.ts';
import type { BenchRoles, EventBody } from './types.ts';

/** The bits of `process` used here, so tests can pass an EventEmitter. */
export interface SignalSource {
  on(event: string, listener: (...args: unknown[]) => void): unknown;
  off(event: string, listener: (...args: unknown[]) => void): unknown;
}

/** Stops `control` on SIGINT/SIGTERM; a second signal is left to the default handler's job by the caller. Returns a disposer. */
export function stopOnSignals(control: RunControl, source: SignalSource, signals: readonly string[] = ['SIGINT', 'SIGTERM']): () => void {
  const listeners = signals.map((name) => {
    const listener = (): void => control.stop('signal');
    source.on(name, listener);
    return [name, listener] as const;
  });
  return () => {
    for (const [name, listener] of listeners) source.off(name, listener);
  };
}

/**
 * On an uncaught exception or unhandled rejection: safe state (best effort,
 * recorded through `record`), then `exit(1)`. Returns a disposer.
 */
export function safeOnCrash(
  bench: BenchRoles,
  safe: SafeState,
  source: SignalSource,
  record: (event: EventBody) => void,
  exit: (code: number) => void,
): () => void {
  let handling = false;
  const onCrash = (error: unknown): void => {
    if (handling) return;
    handling = true;
    record({ type: 'crash', error: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
    void goSafe(bench, bench.controlChannel, safe, record).finally(() => exit(1));
  };
  source.on('uncaughtException', onCrash);
  source.on('unhandledRejection', onCrash);
  return () => {
    source.off('uncaughtException', onCrash);
    source.off('unhandledRejection', onCrash);
  };
}
