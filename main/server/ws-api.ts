/**
 * Carries the BenchApi over one WebSocket (browser mode), in the format of
 * app/contract/wire.ts. Every message is checked before anything runs; a
 * malformed one gets an error reply naming the field, and the connection and
 * the server keep going: nothing a page sends can throw past this dispatcher.
 *
 * One page must not starve the bench or the server:
 * - at most MAX_IN_FLIGHT calls per socket; big-result calls (openRun,
 *   importCsv, listRuns) run one at a time per socket;
 * - Stop, pause and disconnect skip both limits and are served at once;
 * - replies wait while the socket has SLOW_CLIENT_BYTES unsent, and a page
 *   that does not drain them within DRAIN_WAIT_MS is dropped.
 */
import type { WebSocket } from 'ws';
import { z } from 'zod';
import type { BenchApi, BenchEvent } from '../../app/contract/bench-api.ts';
import { checkPayloadBounds } from '../../app/contract/payload-bounds.ts';
import type { WireReply } from '../../app/contract/wire.ts';
import { encodeBinaryReply } from '../../app/contract/wire-binary.ts';
import { frameParts } from '../../app/contract/wire-parts.ts';
import { callBenchApi, describeError, type CallOutcome } from '../service/call-guard.ts';
import { ImportUploads, type OpenImport } from './import-upload.ts';

/** Replies to messages with no readable id carry this id. */
export const NO_ID = -1;

/** Live readouts are dropped (never samples or run events) while a slow client has this much unsent. */
const LIVE_BACKLOG_BYTES = 1 << 20;
/** Unsent bytes above which a reply waits for the page to read. */
export const SLOW_CLIENT_BYTES = 16 << 20;
/** How long a reply waits for the page to drain before the page is dropped. */
export const DRAIN_WAIT_MS = 10_000;
/** Calls one socket may have running at once (Stop and the like not counted). */
export const MAX_IN_FLIGHT = 8;

/** Served at once, whatever else is queued or running: they make the bench safe. */
const PRIORITY_METHODS = new Set(['stopRun', 'pauseRun', 'disconnect', 'getConnection']);
/** Calls whose work or answer can be large: one at a time per socket. */
const HEAVY_METHODS = new Set(['previewRun', 'openRun', 'importCsv', 'listRuns', 'runCsvPart']);

const wireCallSchema = z.object({
  id: z.number().int().nonnegative().max(Number.MAX_SAFE_INTEGER),
  method: z.string().max(100),
  params: z.array(z.unknown()),
});

type ParsedCall = { ok: true; id: number; method: string; params: unknown[] };

export function parseWireCall(text: string): ParsedCall | WireReply {
  let message: unknown;
  try {
    message = JSON.parse(text);
  } catch {
    return {
      id: NO_ID,
      ok: false,
      error: { message: 'message: not valid JSON (expected {"id", "method", "params"})', field: 'message' },
    };
  }
  const rawId = (message as { id?: unknown } | null)?.id;
  const id = typeof rawId === 'number' && Number.isSafeInteger(rawId) && rawId >= 0 ? rawId : NO_ID;
  const bounds = checkPayloadBounds(message, 'message');
  if (!bounds.ok) return { id, ok: false, error: { message: bounds.message, field: bounds.field } };
  const parsed = wireCallSchema.safeParse(message);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = issue && issue.path.length > 0 ? issue.path.map(String).join('.') : 'message';
    const detail = issue ? issue.message : 'invalid';
    return {
      id,
      ok: false,
      error: { message: `${field}: ${detail} (expected {"id": integer, "method": string, "params": array})`, field },
    };
  }
  return { ok: true, ...parsed.data };
}

export interface BenchSocketOptions {
  /** Streamed imports (binary parts); refused when absent. */
  openImport?: OpenImport;
  /** How long a reply waits for the page to drain before the page is dropped. Default DRAIN_WAIT_MS. */
  drainWaitMs?: number | undefined;
  /** Called when the page is dropped for not reading its replies. */
  onDropped?: (reason: string) => void;
}

export function attachBenchSocket(socket: WebSocket, api: BenchApi, options: BenchSocketOptions = {}): void {
  const uploads = new ImportUploads(options.openImport);
  let inFlight = 0;
  let heavyChain: Promise<unknown> = Promise.resolve();
  let dropped = false;

  const drop = (reason: string): void => {
    if (dropped) return;
    dropped = true;
    options.onDropped?.(reason);
    socket.terminate();
  };
  const open = (): boolean => !dropped && socket.readyState === socket.OPEN;
  const sendText = (payload: WireReply | { event: BenchEvent }): void => {
    if (open()) socket.send(JSON.stringify(payload));
  };
  /** Waits until the page has read enough of what it was sent; false when it was dropped instead. */
  const drained = async (): Promise<boolean> => {
    const waitMs = options.drainWaitMs ?? DRAIN_WAIT_MS;
    const deadline = Date.now() + waitMs;
    while (open() && socket.bufferedAmount > SLOW_CLIENT_BYTES) {
      if (Date.now() > deadline) {
        drop(`the page read nothing for ${waitMs / 1000} s with ${socket.bufferedAmount} bytes unsent`);
        return false;
      }
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    return open();
  };

  const reply = async (id: number, outcome: CallOutcome): Promise<void> => {
    if (!(await drained())) return;
    if (!outcome.ok) return sendText({ id, ok: false, error: outcome.error });
    const wire: WireReply = { id, ok: true, result: outcome.result };
    // A result with typed arrays (a stored run's columns) goes as one binary frame (app/contract/wire.ts).
    const frame = encodeBinaryReply(wire);
    if (frame === null) return sendText(wire);
    // Consecutive parts of one frame, sent in one go so nothing lands between them.
    for (const part of frameParts(frame)) socket.send(part, { binary: true });
  };

  const run = (id: number, method: string, call: () => Promise<CallOutcome>): void => {
    const priority = PRIORITY_METHODS.has(method);
    if (!priority && inFlight >= MAX_IN_FLIGHT) {
      sendText({
        id,
        ok: false,
        error: {
          message: `${method}: refused, ${MAX_IN_FLIGHT} calls from this page are still running; wait for their answers`,
          field: 'method',
        },
      });
      return;
    }
    if (!priority) inFlight += 1;
    const work = (): Promise<void> => call().then((outcome) => reply(id, outcome));
    let task: Promise<void>;
    if (HEAVY_METHODS.has(method)) {
      task = heavyChain.then(work, work);
      heavyChain = task;
    } else task = work();
    void task
      .catch(() => sendText({ id, ok: false, error: { message: `${method}: failed inside the server` } }))
      .finally(() => {
        if (!priority) inFlight -= 1;
      });
  };

  const onMessage = (text: string): void => {
    const call = parseWireCall(text);
    if (!('method' in call)) return sendText(call);
    run(call.id, call.method, () => callBenchApi(api, call.method, call.params));
  };

  const onImportPart = (message: Uint8Array): void => {
    const step = uploads.accept(message);
    if (step.kind === 'refused')
      sendText({ id: step.id, ok: false, error: { message: step.message, field: step.field } });
    else if (step.kind === 'done') {
      run(step.id, 'importCsv', () =>
        step.result.then(
          (meta): CallOutcome => ({ ok: true, result: meta }),
          (error: unknown): CallOutcome => ({ ok: false, error: describeError(error) }),
        ),
      );
    }
  };

  const unsubscribe = api.subscribe((event) => {
    if (event.type === 'live' && socket.bufferedAmount > LIVE_BACKLOG_BYTES) return;
    if (socket.bufferedAmount > 4 * SLOW_CLIENT_BYTES) return drop('the page stopped reading its events');
    sendText({ event });
  });
  socket.on('message', (data, isBinary) => {
    try {
      const bytes = Array.isArray(data) ? Buffer.concat(data) : Buffer.isBuffer(data) ? data : Buffer.from(data);
      // Binary messages are import parts only (app/contract/wire.ts); everything else is JSON text.
      if (isBinary) {
        onImportPart(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength));
        // One part per turn of the event loop: a page streaming a file must not hold up another page's Stop.
        socket.pause();
        setImmediate(() => socket.resume());
      } else onMessage(bytes.toString());
    } catch {
      // A last net: no message may take the server down.
      sendText({ id: NO_ID, ok: false, error: { message: 'message: could not be handled', field: 'message' } });
    }
  });
  socket.on('close', () => {
    unsubscribe();
    uploads.clear();
  });
  socket.on('error', () => socket.terminate());
}
