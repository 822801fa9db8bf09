/**
 * Fan-out of pushed BenchEvents to every subscriber (the IPC gate, each
 * WebSocket). A listener that throws is dropped from that event only; one
 * bad subscriber never stops the others.
 */
import type { BenchEvent } from '../../app/contract/bench-api.ts';

export class EventHub {
  readonly #listeners = new Set<(event: BenchEvent) => void>();

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
      } catch {
        // A subscriber's own failure (a closed socket) is its business.
      }
    }
  }
}
