/**
 * BenchApi over a WebSocket (browser mode), wire format in contract/wire.ts.
 * Calls are matched to replies by id; events fan out to subscribers. When the
 * socket drops, calls in flight fail with `linkLost` (main may or may not
 * have acted on them), calls not yet sent wait for the next connection, and
 * the client reconnects with a growing delay. The socket and timers are
 * injected so tests drive it with a fake.
 */
import type { BenchApi, BenchEvent, BenchMethod } from '../contract/bench-api.ts';
import { BENCH_METHODS, MAX_IMPORT_BYTES, MAX_IMPORT_TEXT, type WireCall } from '../contract/wire.ts';
import { encodeImportParts } from '../contract/wire-upload.ts';
import { decodeBinaryReply, WireFrameError } from '../contract/wire-binary.ts';
import { FrameAssembler } from '../contract/wire-parts.ts';
import { BenchCallError } from './bench-call-error.ts';
import { benchEventSchema, firstIssue, resultSchemas, wireInboundSchema } from '../contract/wire-schemas.ts';

/** The part of the DOM WebSocket this client uses. */
export interface SocketLike {
  readonly readyState: number;
  /** Set to "arraybuffer": binary replies (app/contract/wire.ts) are read in place. */
  binaryType?: string;
  send(data: string | Uint8Array): void;
  close(): void;
  onopen: (() => void) | null;
  onclose: (() => void) | null;
  onerror: (() => void) | null;
  onmessage: ((message: { data: unknown }) => void) | null;
}

export interface Timers {
  setTimeout(callback: () => void, delayMs: number): unknown;
  clearTimeout(handle: unknown): void;
}

export type LinkState = 'connecting' | 'open' | 'lost';

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

const OPEN = 1;
const DEFAULT_DELAYS_MS = [250, 500, 1000, 2000, 4000] as const;

const defaultTimers: Timers = {
  setTimeout: (callback, delayMs) => globalThis.setTimeout(callback, delayMs),
  clearTimeout: (handle) => globalThis.clearTimeout(handle as ReturnType<typeof globalThis.setTimeout>),
};

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

interface Pending {
  method: BenchMethod;
  resolve: (value: unknown) => void;
  reject: (error: BenchCallError) => void;
}

export function createWsBench(options: WsBenchOptions): WsBench {
  const timers = options.timers ?? defaultTimers;
  const delays = options.reconnectDelaysMs ?? DEFAULT_DELAYS_MS;
  const inFlight = new Map<number, Pending>();
  const unsent: { call: WireCall; pending: Pending }[] = [];
  const eventListeners = new Set<(event: BenchEvent) => void>();
  const linkListeners = new Set<(state: LinkState) => void>();
  let state: LinkState = 'connecting';
  let socket: SocketLike | null = null;
  let nextId = 1;
  let attempt = 0;
  let retryHandle: unknown = null;
  let closedByUser = false;
  const assembler = new FrameAssembler();

  function setState(next: LinkState): void {
    if (next === state) return;
    state = next;
    for (const listener of linkListeners) listener(next);
  }

  function emit(event: BenchEvent): void {
    for (const listener of eventListeners) listener(event);
  }

  function settle(
    id: number,
    outcome: { ok: true; result: unknown } | { ok: false; message: string; field?: string },
  ): void {
    const pending = inFlight.get(id);
    if (!pending) return; // a reply to a call already failed by a dropped link
    inFlight.delete(id);
    if (!outcome.ok) {
      pending.reject(
        new BenchCallError(pending.method, outcome.message, outcome.field ? { field: outcome.field } : {}),
      );
      return;
    }
    const checked = resultSchemas[pending.method].safeParse(outcome.result);
    if (pending.method === 'openRun') performance.mark('tunebench:ws:open-run-checked');
    if (checked.success) pending.resolve(checked.data);
    else {
      const issue = firstIssue(checked.error);
      pending.reject(
        new BenchCallError(pending.method, `unexpected reply from main: ${issue.message}`, {
          field: `result.${issue.field}`,
        }),
      );
    }
  }

  function onMessage(data: unknown): void {
    // Marks around big replies (a stored night's log) so benchmarks can split wire time from parse time.
    const binary = data instanceof ArrayBuffer;
    if (!binary && assembler.inProgress) {
      assembler.reset();
      emit({ type: 'error', message: 'main sent a text message in the middle of a binary reply; that reply is lost' });
    }
    let frame: ArrayBuffer | null = null;
    if (binary) {
      try {
        frame = assembler.push(data);
      } catch (error) {
        emit({ type: 'error', message: `main sent an unreadable binary reply (${String(error)})` });
        return;
      }
      if (frame === null) return; // more parts to come
    }
    const large = frame ? frame.byteLength > 1_000_000 : typeof data === 'string' && data.length > 1_000_000;
    if (large) performance.mark('tunebench:ws:large-message');
    let parsed: unknown;
    if (frame) {
      try {
        parsed = decodeBinaryReply(frame);
      } catch (error) {
        if (error instanceof WireFrameError && error.id !== null) {
          settle(error.id, { ok: false, message: `unreadable reply from main: ${error.message}`, field: error.field });
        } else emit({ type: 'error', message: `main sent an unreadable binary reply (${String(error)})` });
        return;
      }
    } else {
      try {
        parsed = JSON.parse(typeof data === 'string' ? data : String(data));
      } catch {
        emit({ type: 'error', message: 'main sent a message that is not JSON' });
        return;
      }
    }
    const message = wireInboundSchema.safeParse(parsed);
    if (!message.success) {
      const issue = firstIssue(message.error);
      emit({ type: 'error', message: `main sent an unreadable message (${issue.field}: ${issue.message})` });
      return;
    }
    const value = message.data;
    if (large) performance.mark('tunebench:ws:large-message-json');
    if ('event' in value) {
      const event = benchEventSchema.safeParse(value.event);
      if (event.success) emit(event.data);
      else {
        const issue = firstIssue(event.error);
        emit({ type: 'error', message: `main sent an unreadable event (event.${issue.field}: ${issue.message})` });
      }
    } else if (value.ok) settle(value.id, { ok: true, result: value.result });
    else
      settle(value.id, {
        ok: false,
        message: value.error.message,
        ...(value.error.field ? { field: value.error.field } : {}),
      });
  }

  function flushUnsent(): void {
    while (socket && socket.readyState === OPEN && unsent.length > 0) {
      const item = unsent.shift();
      if (!item) break;
      inFlight.set(item.call.id, item.pending);
      for (const message of wireMessages(item.call)) socket.send(message);
    }
  }

  function failInFlight(): void {
    for (const [id, pending] of inFlight) {
      inFlight.delete(id);
      pending.reject(
        new BenchCallError(pending.method, 'link to the bench lost before the reply came', { linkLost: true }),
      );
    }
  }

  function scheduleReconnect(): void {
    if (closedByUser || retryHandle !== null) return;
    const delay = delays[Math.min(attempt, delays.length - 1)] ?? 4000;
    attempt += 1;
    retryHandle = timers.setTimeout(() => {
      retryHandle = null;
      open();
    }, delay);
  }

  function open(): void {
    if (closedByUser) return;
    let created: SocketLike;
    try {
      created = options.createSocket(options.url);
    } catch {
      setState('lost');
      scheduleReconnect();
      return;
    }
    socket = created;
    created.binaryType = 'arraybuffer';
    created.onopen = () => {
      if (socket !== created) return;
      attempt = 0;
      setState('open');
      flushUnsent();
    };
    created.onmessage = (message) => {
      if (socket === created) onMessage(message.data);
    };
    created.onerror = () => {
      // A close always follows an error; reconnect is handled there.
    };
    created.onclose = () => {
      if (socket !== created) return;
      socket = null;
      assembler.reset();
      failInFlight();
      setState('lost');
      scheduleReconnect();
    };
  }

  function call(method: BenchMethod, params: unknown[]): Promise<unknown> {
    return new Promise((resolve, reject) => {
      if (closedByUser) {
        reject(new BenchCallError(method, 'the link to the bench is closed', { linkLost: true }));
        return;
      }
      const text = params[1];
      // UTF-8 never takes fewer bytes than UTF-16 units, so this much text is over the cap for sure; main counts the bytes.
      if (method === 'importCsv' && typeof text === 'string' && text.length > MAX_IMPORT_BYTES) {
        reject(new BenchCallError(method, `csvText: is too large (at most ${MAX_IMPORT_TEXT})`, { field: 'csvText' }));
        return;
      }
      const wireCall: WireCall = { id: nextId, method, params };
      nextId += 1;
      unsent.push({ call: wireCall, pending: { method, resolve, reject } });
      flushUnsent();
    });
  }

  const methods: Partial<Record<BenchMethod, (...params: unknown[]) => Promise<unknown>>> = {};
  for (const method of BENCH_METHODS) methods[method] = (...params: unknown[]) => call(method, params);
  // The loop above fills every BenchMethod; each reply is checked against its schema in settle().
  const api = {
    ...methods,
    subscribe(listener: (event: BenchEvent) => void) {
      eventListeners.add(listener);
      return () => eventListeners.delete(listener);
    },
  } as unknown as BenchApi;

  open();

  return {
    api,
    link: {
      getState: () => state,
      subscribe(listener) {
        linkListeners.add(listener);
        return () => linkListeners.delete(listener);
      },
      close() {
        closedByUser = true;
        if (retryHandle !== null) timers.clearTimeout(retryHandle);
        retryHandle = null;
        const current = socket;
        socket = null;
        failInFlight();
        current?.close();
        setState('lost');
      },
    },
  };
}
