/** Listener sets shared by the transports: subscribe, unsubscribe, emit. */
import type { TransportEvents } from './transport.ts';

export class TransportListeners {
  private readonly data = new Set<TransportEvents['data']>();
  private readonly close = new Set<TransportEvents['close']>();

  on<E extends keyof TransportEvents>(event: E, listener: TransportEvents[E]): () => void {
    const set = this[event] as Set<TransportEvents[E]>;
    set.add(listener);
    return () => {
      set.delete(listener);
    };
  }

  emitData(chunk: Uint8Array): void {
    for (const listener of this.data) listener(chunk);
  }

  emitClose(reason: Error | null): void {
    for (const listener of this.close) listener(reason);
  }
}
