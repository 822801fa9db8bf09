import { describe, expect, it } from 'vitest';
import type { BenchEvent } from '../contract/bench-api.ts';
import { encodeBinaryReply } from '../contract/wire-binary.ts';
import { frameParts } from '../contract/wire-parts.ts';
import { BenchCallError } from './bench-call-error.ts';
import { checkResult, InboundDecoder, type ReplyOutcome } from './ws-inbound.ts';

function collect() {
  const got: (
    | { kind: 'event'; event: BenchEvent }
    | { kind: 'reply'; id: number; outcome: ReplyOutcome }
    | { kind: 'problem'; message: string }
  )[] = [];
  const sink = {
    event: (event: BenchEvent) => got.push({ kind: 'event', event }),
    reply: (id: number, outcome: ReplyOutcome) => got.push({ kind: 'reply', id, outcome }),
    problem: (message: string) => got.push({ kind: 'problem', message }),
  };
  return { got, sink };
}

/** As a browser WebSocket with binaryType "arraybuffer" hands over a binary message. */
function arrayBuffer(bytes: Uint8Array): ArrayBuffer {
  return bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
}

describe('InboundDecoder', () => {
  it('passes replies on with their id, and main’s refusal with its field', () => {
    const decoder = new InboundDecoder();
    const { got, sink } = collect();
    decoder.decode(JSON.stringify({ id: 4, ok: true, result: [] }), sink);
    decoder.decode(
      JSON.stringify({ id: 5, ok: false, error: { message: 'expected a number', field: 'plan.controlV' } }),
      sink,
    );
    decoder.decode(JSON.stringify({ id: 6, ok: false, error: { message: 'no run r9' } }), sink);
    expect(got).toEqual([
      { kind: 'reply', id: 4, outcome: { ok: true, result: [] } },
      { kind: 'reply', id: 5, outcome: { ok: false, message: 'expected a number', field: 'plan.controlV' } },
      { kind: 'reply', id: 6, outcome: { ok: false, message: 'no run r9' } },
    ]);
  });

  it('checks events against their schema and names the field of a bad one', () => {
    const decoder = new InboundDecoder();
    const { got, sink } = collect();
    decoder.decode(JSON.stringify({ event: { type: 'peers', others: 2 } }), sink);
    decoder.decode(JSON.stringify({ event: { type: 'live', readout: { controlSetV: 'x' } } }), sink);
    expect(got[0]).toEqual({ kind: 'event', event: { type: 'peers', others: 2 } });
    expect(got[1]?.kind).toBe('problem');
    expect((got[1] as { message: string }).message).toMatch(
      /^main sent an unreadable event \(event\.readout\.controlSetV: /,
    );
  });

  it('reports text that is not JSON, and JSON that is no wire message, naming the field', () => {
    const decoder = new InboundDecoder();
    const { got, sink } = collect();
    decoder.decode('not json', sink);
    decoder.decode(JSON.stringify({ id: 'seven', ok: true }), sink);
    expect(got[0]).toEqual({ kind: 'problem', message: 'main sent a message that is not JSON' });
    expect(got[1]?.kind).toBe('problem');
    expect((got[1] as { message: string }).message).toMatch(/^main sent an unreadable message \(/);
  });

  it('reassembles a binary reply from its parts and hands it over once, whole', () => {
    const decoder = new InboundDecoder();
    const { got, sink } = collect();
    const frame = encodeBinaryReply({ id: 9, ok: true, result: { numeric: new Float64Array([1.5, -2, 3e9]) } });
    if (!frame) throw new Error('expected a binary frame');
    const parts = frameParts(frame, 32);
    expect(parts.length).toBeGreaterThan(2);
    for (const part of parts.slice(0, -1)) decoder.decode(arrayBuffer(part), sink);
    expect(got).toEqual([]);
    decoder.decode(arrayBuffer(parts[parts.length - 1] as Uint8Array), sink);
    expect(got).toHaveLength(1);
    const reply = got[0] as { kind: 'reply'; id: number; outcome: { ok: true; result: { numeric: Float64Array } } };
    expect(reply.id).toBe(9);
    expect(Array.from(reply.outcome.result.numeric)).toEqual([1.5, -2, 3e9]);
  });

  it('fails the one call whose binary frame points outside itself, naming the field', () => {
    const decoder = new InboundDecoder();
    const { got, sink } = collect();
    const frame = encodeBinaryReply({ id: 3, ok: true, result: { numeric: new Float64Array([1, 5, 6]) } });
    if (!frame) throw new Error('expected a binary frame');
    const cut = frame.slice(0, frame.length - 8);
    new DataView(cut.buffer).setUint32(4, cut.byteLength, true);
    decoder.decode(arrayBuffer(cut), sink);
    expect(got).toHaveLength(1);
    expect(got[0]).toMatchObject({ kind: 'reply', id: 3, outcome: { ok: false, field: 'result.numeric' } });
    expect((got[0] as { outcome: { message: string } }).outcome.message).toMatch(
      /^unreadable reply from main: .*past the end of the frame/,
    );
  });

  it('drops a half-received binary reply when text comes in between, or on reset', () => {
    const frame = encodeBinaryReply({ id: 2, ok: true, result: { numeric: new Float64Array(16) } });
    if (!frame) throw new Error('expected a binary frame');
    const [firstPart] = frameParts(frame, 32);
    if (!firstPart) throw new Error('expected parts');

    const decoder = new InboundDecoder();
    const { got, sink } = collect();
    decoder.decode(arrayBuffer(firstPart), sink);
    decoder.decode(JSON.stringify({ id: 1, ok: true, result: null }), sink);
    expect(got).toEqual([
      { kind: 'problem', message: 'main sent a text message in the middle of a binary reply; that reply is lost' },
      { kind: 'reply', id: 1, outcome: { ok: true, result: null } },
    ]);

    const afterReset = collect();
    decoder.decode(arrayBuffer(firstPart), afterReset.sink);
    decoder.reset();
    decoder.decode(JSON.stringify({ id: 7, ok: true, result: null }), afterReset.sink);
    expect(afterReset.got).toEqual([{ kind: 'reply', id: 7, outcome: { ok: true, result: null } }]);
  });
});

describe('checkResult', () => {
  it('gives the result checked against the method’s schema', () => {
    expect(checkResult('listProfiles', { ok: true, result: [{ name: 'counter-scpi', role: 'counter' }] })).toEqual({
      ok: true,
      value: [{ name: 'counter-scpi', role: 'counter' }],
    });
  });

  it('refuses a result of the wrong shape, naming the field under result', () => {
    const checked = checkResult('getConnection', { ok: true, result: { connected: 'yes' } });
    if (checked.ok) throw new Error('expected a refusal');
    expect(checked.error).toBeInstanceOf(BenchCallError);
    expect(checked.error.field).toBe('result.connected');
    expect(checked.error.message).toMatch(/unexpected reply from main/);
    expect(checked.error.linkLost).toBe(false);
  });

  it('turns main’s refusal into the call’s error, with its field', () => {
    const checked = checkResult('startDrift', { ok: false, message: 'expected a number', field: 'plan.controlV' });
    if (checked.ok) throw new Error('expected a refusal');
    expect(checked.error.field).toBe('plan.controlV');
    expect(checked.error.message).toBe('plan.controlV: expected a number');
    expect(checked.error.method).toBe('startDrift');
  });
});
