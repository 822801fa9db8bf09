/**
 * The calls of a WebSocket BenchApi client between `api.x()` and its reply:
 * ids in call order, calls waiting for an open socket (sent in order once it
 * opens), calls in flight matched to their reply by id, and what happens to
 * each when the link drops (in flight: fail with `linkLost`, since main may or
 * may not have acted; unsent: keep waiting). No socket and no decoding here.
 */
import type { BenchMethod } from '../contract/bench-api.ts';
import type { WireCall } from '../contract/wire.ts';
import { BenchCallError } from './bench-call-error.ts';

export interface PendingCall {
  method: BenchMethod;
  resolve: (value: unknown) => void;
  reject: (error: BenchCallError) => void;
}

export class CallQueue {
  private nextId = 1;
  private readonly unsent: { call: WireCall; pending: PendingCall }[] = [];
  private readonly inFlight = new Map<number, PendingCall>();

  /** Queues a call with the next id; it goes out on the next `sendWaiting`. */
  add(pending: PendingCall, params: unknown[]): WireCall {
    const call: WireCall = { id: this.nextId, method: pending.method, params };
    this.nextId += 1;
    this.unsent.push({ call, pending });
    return call;
  }

  get waiting(): number {
    return this.unsent.length;
  }

  get inFlightCount(): number {
    return this.inFlight.size;
  }

  /** Sends waiting calls, oldest first, while `canSend()` holds; each is in flight before it is sent. */
  sendWaiting(canSend: () => boolean, send: (call: WireCall) => void): void {
    while (canSend()) {
      const item = this.unsent.shift();
      if (!item) break;
      this.inFlight.set(item.call.id, item.pending);
      send(item.call);
    }
  }

  /** The call a reply with this id answers, taken out of flight; undefined for an unknown or failed id. */
  take(id: number): PendingCall | undefined {
    const pending = this.inFlight.get(id);
    if (pending) this.inFlight.delete(id);
    return pending;
  }

  /** Fails every call in flight: the link dropped before their replies came. */
  failInFlight(): void {
    for (const [id, pending] of this.inFlight) {
      this.inFlight.delete(id);
      pending.reject(
        new BenchCallError(pending.method, 'link to the bench lost before the reply came', { linkLost: true }),
      );
    }
  }
}
