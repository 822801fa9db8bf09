/**
 * Carries the BenchApi over one WebSocket (browser mode), in the format of
 * app/contract/wire.ts. Every message is checked before anything runs; a
 * malformed one gets an error reply naming the field, and the connection and
 * the server keep going. Pushed events are sent as `{ event }`.
 */
import type { WebSocket } from 'ws';
import { z } from 'zod';
import type { BenchApi, BenchEvent } from '../../app/contract/bench-api.ts';
import type { WireReply } from '../../app/contract/wire.ts';
import { encodeBinaryReply } from '../../app/contract/wire-binary.ts';
import { frameParts } from '../../app/contract/wire-parts.ts';
import { callBenchApi } from '../service/call-guard.ts';

/** Replies to messages with no readable id carry this id. */
export const NO_ID = -1;

/** Live readouts are dropped (never samples or run events) while a slow client has this much unsent. */
const LIVE_BACKLOG_BYTES = 1 << 20;

const wireCallSchema = z.object({
  id: z.number().int().nonnegative().max(Number.MAX_SAFE_INTEGER),
  method: z.string().max(100),
  params: z.array(z.unknown()),
});

export function parseWireCall(text: string): { ok: true; id: number; method: string; params: unknown[] } | WireReply {
  let message: unknown;
  try {
    message = JSON.parse(text);
  } catch {
    return { id: NO_ID, ok: false, error: { message: 'message: not valid JSON (expected {"id", "method", "params"})', field: 'message' } };
  }
  const parsed = wireCallSchema.safeParse(message);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = issue && issue.path.length > 0 ? issue.path.map(String).join('.') : 'message';
    const rawId = (message as { id?: unknown } | null)?.id;
    const id = typeof rawId === 'number' && Number.isSafeInteger(rawId) && rawId >= 0 ? rawId : NO_ID;
    const detail = issue ? issue.message : 'invalid';
    return { id, ok: false, error: { message: `${field}: ${detail} (expected {"id": integer, "method": string, "params": array})`, field } };
  }
  return { ok: true, ...parsed.data };
}

export function attachBenchSocket(socket: WebSocket, api: BenchApi): void {
  const send = (payload: WireReply | { event: BenchEvent }): void => {
    if (socket.readyState === socket.OPEN) socket.send(JSON.stringify(payload));
  };
  const unsubscribe = api.subscribe((event) => {
    if (event.type === 'live' && socket.bufferedAmount > LIVE_BACKLOG_BYTES) return;
    send({ event });
  });
  socket.on('message', (data, isBinary) => {
    if (isBinary) {
      send({ id: NO_ID, ok: false, error: { message: 'message: binary frames are not accepted; send JSON text', field: 'message' } });
      return;
    }
    // A text frame arrives as one Buffer, or as fragments.
    const call = parseWireCall((Array.isArray(data) ? Buffer.concat(data) : Buffer.isBuffer(data) ? data : Buffer.from(data)).toString('utf8'));
    if (!('method' in call)) {
      send(call);
      return;
    }
    void callBenchApi(api, call.method, call.params).then((outcome) => {
      if (!outcome.ok) {
        send({ id: call.id, ok: false, error: outcome.error });
        return;
      }
      const reply: WireReply = { id: call.id, ok: true, result: outcome.result };
      // A result with typed arrays (a stored run's columns) goes as one binary frame (app/contract/wire.ts).
      const frame = encodeBinaryReply(reply);
      if (frame === null) send(reply);
      else if (socket.readyState === socket.OPEN) {
        // Consecutive parts of one frame, sent in one go so nothing lands between them.
        for (const part of frameParts(frame)) socket.send(part, { binary: true });
      }
    });
  });
  socket.on('close', unsubscribe);
  socket.on('error', () => socket.terminate());
}
