/**
 * BenchApi over a WebSocket (browser mode), wire format in contract/wire.ts.
 * This module joins three parts, one job each: ReconnectingSocket
 * (ws-reconnect.ts: the socket, reconnect with a growing delay, link state),
 * CallQueue (ws-call-queue.ts: ids, calls waiting for the socket, calls in
 * flight, failing them with `linkLost` when the socket drops) and
 * InboundDecoder (ws-inbound.ts: what each message from main means, checked
 * against the wire schemas). Events fan out to subscribers.
 */
import type { BenchApi, BenchEvent, BenchMethod } from '../contract/bench-api.ts';
import { BENCH_METHODS, MAX_IMPORT_BYTES, MAX_IMPORT_TEXT, type WireCall } from '../contract/wire.ts';
import { encodeImportParts } from '../contract/wire-upload.ts';
import { BenchCallError } from './bench-call-error.ts';
import { CallQueue } from './ws-call-queue.ts';
import { checkResult, InboundDecoder, type InboundSink } from './ws-inbound.ts';
import { ReconnectingSocket, type LinkState, type SocketLike, type Timers } from './ws-reconnect.ts';

export type { LinkState, SocketLike, Timers } from './ws-reconnect.ts';

export interface WsBenchOptions {
  url: string;
  createSocket: (url: string) => SocketLike;
  timers?: Timers;
  /** Delays between reconnect attempts, ms; the last repeats. Default 250 → 4000. */
  reconnectDelaysMs?: readonly number[];
}

export interface WsBench {
  api: BenchApi;
  link: {
    getState(): LinkState;
    subscribe(listener: (state: LinkState) => void): () => void;
    /** Stops reconnecting and closes the socket. */
    close(): void;
  };
}

/** An import whose text is longer than this goes as binary parts (contract/wire.ts). */
const STREAM_IMPORT_ABOVE_CHARS = 64 * 1024;

/**
 * The messages that carry one call: one JSON text, or for a long CSV import
 * binary parts of its UTF-8 bytes (contract/wire.ts), so no message is large,
 * main never parses the file on its own thread, and a Stop from any page is
 * read between parts.
 */
export function wireMessages(call: WireCall): (string | Uint8Array)[] {
  const [fileName, text, dutId] = call.params;
  if (
    call.method !== 'importCsv' ||
    typeof text !== 'string' ||
    typeof fileName !== 'string' ||
    typeof dutId !== 'string' ||
    text.length <= STREAM_IMPORT_ABOVE_CHARS
  ) {
    return [JSON.stringify(call)];
  }
  return encodeImportParts({ id: call.id, fileName, dutId }, text);
}

export function createWsBench(options: WsBenchOptions): WsBench {
  const queue = new CallQueue();
  const decoder = new InboundDecoder();
  const eventListeners = new Set<(event: BenchEvent) => void>();

  function emit(event: BenchEvent): void {
    for (const listener of eventListeners) listener(event);
  }

  const sink: InboundSink = {
    event: emit,
    problem: (message) => emit({ type: 'error', message }),
    reply(id, outcome) {
      const pending = queue.take(id);
      if (!pending) return; // a reply to a call already failed by a dropped link
      const checked = checkResult(pending.method, outcome);
      if (checked.ok) pending.resolve(checked.value);
      else pending.reject(checked.error);
    },
  };

  const link = new ReconnectingSocket({
    ...options,
    onOpen: () => sendWaiting(),
    onMessage: (data) => decoder.decode(data, sink),
    onLost: () => {
      decoder.reset();
      queue.failInFlight();
    },
  });

  function sendWaiting(): void {
    queue.sendWaiting(
      () => link.canSend,
      (call) => {
        for (const message of wireMessages(call)) link.send(message);
      },
    );
  }

  function call(method: BenchMethod, params: unknown[]): Promise<unknown> {
    return new Promise((resolve, reject) => {
      if (link.closed) {
        reject(new BenchCallError(method, 'the link to the bench is closed', { linkLost: true }));
        return;
      }
      const text = params[1];
      // UTF-8 never takes fewer bytes than UTF-16 units, so this much text is over the cap for sure; main counts the bytes.
      if (method === 'importCsv' && typeof text === 'string' && text.length > MAX_IMPORT_BYTES) {
        reject(new BenchCallError(method, `csvText: is too large (at most ${MAX_IMPORT_TEXT})`, { field: 'csvText' }));
        return;
      }
      queue.add({ method, resolve, reject }, params);
      sendWaiting();
    });
  }

  const methods: Partial<Record<BenchMethod, (...params: unknown[]) => Promise<unknown>>> = {};
  for (const method of BENCH_METHODS) methods[method] = (...params: unknown[]) => call(method, params);
  // The loop above fills every BenchMethod; each reply is checked against its schema (checkResult).
  const api = {
    ...methods,
    subscribe(listener: (event: BenchEvent) => void) {
      eventListeners.add(listener);
      return () => eventListeners.delete(listener);
    },
  } as unknown as BenchApi;

  return {
    api,
    link: {
      getState: () => link.state,
      subscribe: (listener) => link.subscribe(listener),
      close() {
        queue.failInFlight();
        link.close();
      },
    },
  };
}
