/** Fakes of the socket and timers that the WebSocket client's parts take (ws-reconnect.ts). */
import type { SocketLike, Timers } from '../ws-reconnect.ts';

/** A WebSocket stand-in: the test opens, drops and answers it by hand. */
export class FakeSocket implements SocketLike {
  readyState = 0;
  binaryType = 'blob';
  sent: string[] = [];
  onopen: (() => void) | null = null;
  onclose: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onmessage: ((message: { data: unknown }) => void) | null = null;
  constructor(readonly url: string) {}
  send(data: string): void {
    if (this.readyState !== 1) throw new Error('send on a socket that is not open');
    this.sent.push(data);
  }
  close(): void {
    this.drop();
  }
  accept(): void {
    this.readyState = 1;
    this.onopen?.();
  }
  drop(): void {
    this.readyState = 3;
    this.onclose?.();
  }
  reply(message: unknown): void {
    this.onmessage?.({ data: JSON.stringify(message) });
  }
  /** As a browser WebSocket with binaryType "arraybuffer" hands over a binary message. */
  replyBinary(frame: Uint8Array): void {
    this.onmessage?.({ data: frame.buffer.slice(frame.byteOffset, frame.byteOffset + frame.byteLength) });
  }
  calls(): { id: number; method: string; params: unknown[] }[] {
    return this.sent.map((text) => JSON.parse(text) as { id: number; method: string; params: unknown[] });
  }
}

/** Timers that run only when the test says, in the order they were set. */
export class FakeTimers implements Timers {
  queue: { callback: () => void; delayMs: number }[] = [];
  setTimeout(callback: () => void, delayMs: number): unknown {
    const entry = { callback, delayMs };
    this.queue.push(entry);
    return entry;
  }
  clearTimeout(handle: unknown): void {
    this.queue = this.queue.filter((entry) => entry !== handle);
  }
  runNext(): number {
    const entry = this.queue.shift();
    if (!entry) throw new Error('no timer queued');
    entry.callback();
    return entry.delayMs;
  }
}
