/**
 * Fan-out of pushed BenchEvents to every subscriber (the IPC gate, each
 * WebSocket). A listener that throws misses that event only; one bad
 * subscriber never stops the others, and its error is reported (never
 * swallowed) through `onListenerError`, by default to stderr.
 */
import type { BenchEvent } from '../../app/contract/bench-api.ts';

export type ListenerErrorReporter = (error: unknown, event: BenchEvent) => void;

const reportToStderr: ListenerErrorReporter = (error, event) => {
  console.error(
    `tunebench: a subscriber to "${event.type}" events failed: ${error instanceof Error ? error.message : String(error)}`,
  );
};

export class EventHub {
  readonly #listeners = new Set<(event: BenchEvent) => void>();
  readonly #onListenerError: ListenerErrorReporter;

  constructor(onListenerError: ListenerErrorReporter = reportToStderr) {
    this.#onListenerError = onListenerError;
  }

  subscribe(listener: (event: BenchEvent) => void): () => void {
    // Each subscription gets its own wrapper so the same function may subscribe twice.
    const entry = (event: BenchEvent): void => listener(event);
    this.#listeners.add(entry);
    return () => {
      this.#listeners.delete(entry);
    };
  }

  get size(): number {
    return this.#listeners.size;
  }

  emit(event: BenchEvent): void {
    for (const listener of this.#listeners) {
      try {
        listener(event);
      } catch (error) {
        // A subscriber's own failure (a closed socket) must not stop the others.
        this.#onListenerError(error, event);
      }
    }
  }
}
