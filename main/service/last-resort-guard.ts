/**
 * The one last-resort guard of every process that can hold a bench (`serve`,
 * the Electron main process, the CLI's recording commands). On an uncaught
 * exception, an unhandled rejection, SIGTERM/SIGINT/SIGHUP, or a heap close
 * to its limit, it has the holder drive each connected supply to its safe
 * state and record that in the run, then ends the process. A holder that
 * hangs does not keep the process alive: the deadline exits anyway.
 *
 * Running out of memory kills V8 with no event to catch, so the heap is
 * watched instead and the bench made safe while there is still room to act.
 */
import { getHeapStatistics } from 'node:v8';

export type GuardCause =
  | { kind: 'crash'; what: 'uncaughtException' | 'unhandledRejection'; error: string }
  | { kind: 'signal'; signal: string }
  | { kind: 'memory'; usedMb: number; limitMb: number };

export interface BenchHolder {
  /**
   * Drives every connected supply to its safe state and records why in the run in progress; never rejects.
   * `exitCode`: the run's own verdict when it ended by itself meanwhile (the process exits with no less).
   */
  leaveSafe(cause: GuardCause): Promise<{ ok: boolean; exitCode?: number }>;
}

/** The bits of `process` the guard uses, so tests can pass an EventEmitter. */
export interface GuardSource {
  on(event: string, listener: (...args: unknown[]) => void): unknown;
  off(event: string, listener: (...args: unknown[]) => void): unknown;
}

export interface HeapReading {
  usedBytes: number;
  limitBytes: number;
}

export interface LastResortGuardOptions {
  source: GuardSource;
  holder: BenchHolder;
  exit: (code: number) => void;
  log: (line: string) => void;
  /**
   * Signals, when the process has its own clean stop for them (the CLI stops
   * its run and finishes normally): called instead of the guard's own path.
   * A second signal still takes the guard's path.
   */
  onSignal?: (signal: string) => void;
  /**
   * Heap watch; false turns it off. Default: V8's heap statistics every
   * 250 ms; acts when less than `headroom` is left (15 % of the limit, at
   * least 96 MiB — V8's limit includes the young generation, up to ~64 MiB,
   * which an old-space exhaustion never reaches).
   */
  memory?: false | { read?: () => HeapReading; headroomFraction?: number; periodMs?: number };
  /** Longest the holder may take before the process exits anyway, ms. Default 20 000. */
  deadlineMs?: number;
}

export const GUARDED_SIGNALS = ['SIGTERM', 'SIGINT', 'SIGHUP'] as const;

function v8Heap(): HeapReading {
  const stats = getHeapStatistics();
  return { usedBytes: stats.used_heap_size, limitBytes: stats.heap_size_limit };
}

function describeCause(cause: GuardCause): string {
  if (cause.kind === 'crash') return `${cause.what}: ${cause.error}`;
  if (cause.kind === 'signal') return `signal ${cause.signal}`;
  return `memory: heap at ${cause.usedMb} of ${cause.limitMb} MB`;
}

/** Installs the guard; returns its remover (for a clean, ordinary exit). */
export function installLastResortGuard(options: LastResortGuardOptions): () => void {
  const deadlineMs = options.deadlineMs ?? 20_000;
  let handling = false;
  let signalsSeen = 0;

  const act = (cause: GuardCause, code: number): void => {
    if (handling) return;
    handling = true;
    options.log(`tunebench: ${describeCause(cause)} — leaving the bench safe before exiting`);
    const deadline = setTimeout(() => {
      options.log(
        `tunebench: the safe state did not finish within ${deadlineMs / 1000} s; exiting — check the supply now`,
      );
      options.exit(code || 1);
    }, deadlineMs);
    void options.holder
      .leaveSafe(cause)
      .catch((): { ok: boolean; exitCode?: number } => ({ ok: false }))
      .then((result) => {
        clearTimeout(deadline);
        if (!result.ok)
          options.log('tunebench: the safe state could not be confirmed on every step — check the supply now');
        options.exit(Math.max(result.exitCode ?? 0, result.ok ? code : code || 1));
      });
  };

  const crash = (what: 'uncaughtException' | 'unhandledRejection') => (error: unknown) => {
    let text: string;
    try {
      text = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
    } catch {
      text = 'unprintable error';
    }
    act({ kind: 'crash', what, error: text.slice(0, 500) }, 1);
  };
  const onException = crash('uncaughtException');
  const onRejection = crash('unhandledRejection');
  options.source.on('uncaughtException', onException);
  options.source.on('unhandledRejection', onRejection);

  const signalListeners = GUARDED_SIGNALS.map((signal) => {
    const listener = (): void => {
      signalsSeen += 1;
      if (options.onSignal && signalsSeen === 1) options.onSignal(signal);
      else act({ kind: 'signal', signal }, 0);
    };
    options.source.on(signal, listener);
    return [signal, listener] as const;
  });

  let watch: ReturnType<typeof setInterval> | null = null;
  if (options.memory !== false) {
    const read = options.memory?.read ?? v8Heap;
    const headroomFraction = options.memory?.headroomFraction ?? 0.15;
    watch = setInterval(() => {
      const heap = read();
      const headroom = Math.max(headroomFraction * heap.limitBytes, 96 * 2 ** 20);
      if (heap.limitBytes > 0 && heap.usedBytes > heap.limitBytes - headroom) {
        act(
          {
            kind: 'memory',
            usedMb: Math.round(heap.usedBytes / 2 ** 20),
            limitMb: Math.round(heap.limitBytes / 2 ** 20),
          },
          1,
        );
      }
    }, options.memory?.periodMs ?? 250);
    watch.unref();
  }

  return () => {
    options.source.off('uncaughtException', onException);
    options.source.off('unhandledRejection', onRejection);
    for (const [signal, listener] of signalListeners) options.source.off(signal, listener);
    if (watch) clearInterval(watch);
  };
}
