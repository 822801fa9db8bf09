/**
 * What one WebSocket message from main means (browser mode): a pushed event,
 * the reply to call `id`, more parts of a binary reply still to come, or a
 * problem to show the user. Every message is checked against the wire schemas
 * (app/contract/wire-schemas.ts) before it counts; a binary reply is
 * reassembled from its parts (wire-parts.ts) and read in place
 * (wire-binary.ts). `checkResult` holds a reply's result to its method's
 * schema. No socket, no timers, no call bookkeeping: ws-client.ts does those.
 */
import type { BenchEvent, BenchMethod } from '../contract/bench-api.ts';
import { decodeBinaryReply, WireFrameError } from '../contract/wire-binary.ts';
import { FrameAssembler } from '../contract/wire-parts.ts';
import { benchEventSchema, firstIssue, resultSchemas, wireInboundSchema } from '../contract/wire-schemas.ts';
import { BenchCallError } from './bench-call-error.ts';

/** How main answered a call, before its result is checked. */
export type ReplyOutcome = { ok: true; result: unknown } | { ok: false; message: string; field?: string };

/** Where a decoded message goes, in the order the messages came. */
export interface InboundSink {
  event(event: BenchEvent): void;
  reply(id: number, outcome: ReplyOutcome): void;
  /** Main sent something unreadable; no call can be named. */
  problem(message: string): void;
}

/** A message this long (characters or bytes) gets performance marks, so benchmarks split wire time from parse time. */
const LARGE_MESSAGE = 1_000_000;

export class InboundDecoder {
  private readonly assembler = new FrameAssembler();

  /** Drops a half-received binary reply (the socket closed). */
  reset(): void {
    this.assembler.reset();
  }

  decode(data: unknown, sink: InboundSink): void {
    const binary = data instanceof ArrayBuffer;
    if (!binary && this.assembler.inProgress) {
      this.assembler.reset();
      sink.problem('main sent a text message in the middle of a binary reply; that reply is lost');
    }
    let frame: ArrayBuffer | null = null;
    if (binary) {
      try {
        frame = this.assembler.push(data);
      } catch (error) {
        sink.problem(`main sent an unreadable binary reply (${String(error)})`);
        return;
      }
      if (frame === null) return; // more parts to come
    }
    const large = frame ? frame.byteLength > LARGE_MESSAGE : typeof data === 'string' && data.length > LARGE_MESSAGE;
    if (large) performance.mark('tunebench:ws:large-message');
    let parsed: unknown;
    if (frame) {
      try {
        parsed = decodeBinaryReply(frame);
      } catch (error) {
        if (error instanceof WireFrameError && error.id !== null) {
          sink.reply(error.id, {
            ok: false,
            message: `unreadable reply from main: ${error.message}`,
            field: error.field,
          });
        } else sink.problem(`main sent an unreadable binary reply (${String(error)})`);
        return;
      }
    } else {
      try {
        parsed = JSON.parse(typeof data === 'string' ? data : String(data));
      } catch {
        sink.problem('main sent a message that is not JSON');
        return;
      }
    }
    const message = wireInboundSchema.safeParse(parsed);
    if (!message.success) {
      const issue = firstIssue(message.error);
      sink.problem(`main sent an unreadable message (${issue.field}: ${issue.message})`);
      return;
    }
    const value = message.data;
    if (large) performance.mark('tunebench:ws:large-message-json');
    if ('event' in value) {
      const event = benchEventSchema.safeParse(value.event);
      if (event.success) sink.event(event.data);
      else {
        const issue = firstIssue(event.error);
        sink.problem(`main sent an unreadable event (event.${issue.field}: ${issue.message})`);
      }
    } else if (value.ok) sink.reply(value.id, { ok: true, result: value.result });
    else
      sink.reply(value.id, {
        ok: false,
        message: value.error.message,
        ...(value.error.field ? { field: value.error.field } : {}),
      });
  }
}

/** A reply's outcome as the call's result, or the error naming the field that is wrong. */
export function checkResult(
  method: BenchMethod,
  outcome: ReplyOutcome,
): { ok: true; value: unknown } | { ok: false; error: BenchCallError } {
  if (!outcome.ok) {
    return {
      ok: false,
      error: new BenchCallError(method, outcome.message, outcome.field ? { field: outcome.field } : {}),
    };
  }
  const checked = resultSchemas[method].safeParse(outcome.result);
  if (method === 'openRun') performance.mark('tunebench:ws:open-run-checked');
  if (checked.success) return { ok: true, value: checked.data };
  const issue = firstIssue(checked.error);
  return {
    ok: false,
    error: new BenchCallError(method, `unexpected reply from main: ${issue.message}`, {
      field: `result.${issue.field}`,
    }),
  };
}
