/**
 * An in-memory Transport for session and driver tests: every complete line
 * the session writes goes to a responder, which answers with `feed`, possibly
 * in awkward pieces, late, or not at all. `drop()` simulates a pulled cable.
 */
import { DisconnectedError } from '../errors.ts';
import type { Transport, TransportEvents } from '../transport.ts';

export type Responder = (command: string, link: ScriptedTransport) => void;

export class ScriptedTransport implements Transport {
  readonly address: string;
  isOpen = false;
  /** Every line written, terminator removed, in order. */
  readonly written: string[] = [];
  opens = 0;
  /** Number of upcoming open() calls that fail (a link that will not come back yet). */
  failOpens = 0;
  private readonly listeners = { data: new Set<TransportEvents['data']>(), close: new Set<TransportEvents['close']>() };
  private partial = '';

  constructor(
    public responder: Responder = () => undefined,
    address = 'scripted://test',
  ) {
    this.address = address;
  }

  async open(): Promise<void> {
    if (this.failOpens > 0) {
      this.failOpens -= 1;
      throw new Error('connection refused (scripted)');
    }
    this.opens += 1;
    this.isOpen = true;
  }

  async write(data: Uint8Array | string): Promise<void> {
    if (!this.isOpen) throw new DisconnectedError(this.address, 'write on a closed link');
    this.partial += typeof data === 'string' ? data : new TextDecoder().decode(data);
    let at = this.partial.indexOf('\n');
    while (at !== -1) {
      const line = this.partial.slice(0, at);
      this.partial = this.partial.slice(at + 1);
      this.written.push(line);
      // Answer asynchronously, as a real link would.
      queueMicrotask(() => this.responder(line, this));
      at = this.partial.indexOf('\n');
    }
  }

  async close(): Promise<void> {
    if (!this.isOpen) return;
    this.isOpen = false;
    for (const listener of this.listeners.close) listener(null);
  }

  on<E extends keyof TransportEvents>(event: E, listener: TransportEvents[E]): () => void {
    const set = this.listeners[event] as Set<TransportEvents[E]>;
    set.add(listener);
    return () => set.delete(listener);
  }

  /** Delivers bytes to the session, cut at the given byte offsets. */
  feed(text: string | Uint8Array, cuts: number[] = []): void {
    const bytes = typeof text === 'string' ? new TextEncoder().encode(text) : text;
    let from = 0;
    for (const cut of [...cuts.filter((c) => c > 0 && c < bytes.length).sort((a, b) => a - b), bytes.length]) {
      const chunk = bytes.slice(from, cut);
      for (const listener of this.listeners.data) listener(chunk);
      from = cut;
    }
  }

  /** The link goes away without the session asking. */
  drop(reason = new Error('cable pulled')): void {
    this.isOpen = false;
    for (const listener of this.listeners.close) listener(reason);
  }
}
