import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decodeBinaryReply, encodeBinaryReply, TYPED_KEY, WireFrameError } from './wire-binary.ts';
import { FrameAssembler, frameParts } from './wire-parts.ts';

const asBuffer = (frame: Uint8Array): ArrayBuffer =>
  frame.buffer.slice(frame.byteOffset, frame.byteOffset + frame.byteLength) as ArrayBuffer;

describe('binary reply frame', () => {
  it('is not used for replies without typed arrays', () => {
    expect(encodeBinaryReply({ id: 1, ok: true, result: [1, 2, 3] })).toBeNull();
  });

  it('round-trips every double bit for bit, and coded text, as aligned views on the frame', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double()),
        fc.array(fc.integer({ min: 0, max: 255 })),
        fc.string(),
        (values, codes, note) => {
          const reply = {
            id: 7,
            ok: true,
            result: { note, f: new Float64Array(values), t: { levels: ['ok'], codes: new Uint8Array(codes) } },
          };
          const frame = encodeBinaryReply(reply) as Uint8Array;
          // Little-endian on the wire (app/contract/wire.ts); the header length leads.
          expect(new DataView(frame.buffer).getUint32(0, true)).toBeGreaterThan(0);
          const back = decodeBinaryReply(asBuffer(frame)) as typeof reply;
          expect(back.id).toBe(7);
          expect(back.result.note).toBe(note);
          expect(back.result.f).toBeInstanceOf(Float64Array);
          expect(back.result.f.byteOffset % 8).toBe(0);
          values.forEach((v, i) => expect(Object.is(back.result.f[i], v)).toBe(true));
          expect(back.result.t.codes).toEqual(new Uint8Array(codes));
        },
      ),
      { numRuns: 100 },
    );
  });

  it('refuses placeholders that are misaligned, not whole elements or outside the frame, naming the field', () => {
    const frame = encodeBinaryReply({ id: 3, ok: true, result: { xs: new Float64Array([1, 2, 4]) } }) as Uint8Array;
    const headerLength = new DataView(frame.buffer).getUint32(0, true);
    expect(new DataView(frame.buffer).getUint32(4, true)).toBe(frame.byteLength);
    const header = JSON.parse(new TextDecoder().decode(frame.subarray(8, 8 + headerLength))) as {
      result: { xs: Record<string, unknown> };
    };
    expect(header.result.xs).toEqual({ [TYPED_KEY]: 'f64', byteOffset: 0, byteLength: 24 });
    const withHeader = (xs: Record<string, unknown>): ArrayBuffer => {
      const text = new TextEncoder().encode(JSON.stringify({ id: 3, ok: true, result: { xs } }));
      const out = new Uint8Array(Math.ceil((8 + text.length) / 8) * 8 + 16);
      new DataView(out.buffer).setUint32(0, text.length, true);
      new DataView(out.buffer).setUint32(4, out.byteLength, true);
      out.set(text, 8);
      return out.buffer;
    };
    const attempt = (xs: Record<string, unknown>): WireFrameError => {
      try {
        decodeBinaryReply(withHeader(xs));
      } catch (error) {
        return error as WireFrameError;
      }
      throw new Error('expected a refusal');
    };
    expect(attempt({ [TYPED_KEY]: 'f64', byteOffset: 4, byteLength: 8 }).message).toMatch(/aligned/);
    expect(attempt({ [TYPED_KEY]: 'f64', byteOffset: 0, byteLength: 12 }).message).toMatch(/whole number/);
    expect(attempt({ [TYPED_KEY]: 'f64', byteOffset: 8, byteLength: 16 }).message).toMatch(/past the end/);
    const refused = attempt({ [TYPED_KEY]: 'f32', byteOffset: 0, byteLength: 8 });
    expect(refused.field).toBe('result.xs');
    expect(refused.id).toBe(3);
    const good = decodeBinaryReply(withHeader({ [TYPED_KEY]: 'f64', byteOffset: 0, byteLength: 16 })) as {
      result: { xs: Float64Array };
    };
    expect(good.result.xs).toEqual(new Float64Array([0, 0]));
  });

  it('is cut into parts and joined back whole, in one message or many', () => {
    const values = Float64Array.from({ length: 5000 }, (_, i) => Math.sin(i) * 1e6);
    const frame = encodeBinaryReply({ id: 9, ok: true, result: { values } }) as Uint8Array;
    for (const partBytes of [frame.byteLength, 4096, 1000, 13]) {
      const assembler = new FrameAssembler();
      const parts = frameParts(frame, partBytes);
      let whole: ArrayBuffer | null = null;
      parts.forEach((part, i) => {
        whole = assembler.push(asBuffer(part));
        expect(whole === null).toBe(i < parts.length - 1);
      });
      const back = decodeBinaryReply(whole as unknown as ArrayBuffer) as { result: { values: Float64Array } };
      expect(back.result.values).toEqual(values);
    }
    expect(() => new FrameAssembler().push(new ArrayBuffer(3))).toThrow(WireFrameError);
  });

  it('sends evenly spaced and constant arrays as their rule, and gets every value back bit for bit', () => {
    const time = Float64Array.from({ length: 1000 }, (_, i) => 0.5 + i * 0.1);
    const control = new Float64Array(1000).fill(-0);
    const absent = new Float64Array(1000).fill(Number.NaN);
    const ok = new Uint8Array(1000);
    const jittered = time.map((t, i) => (i === 500 ? t + 1e-9 : t));
    const frame = encodeBinaryReply({ id: 1, ok: true, result: { time, control, absent, ok, jittered } }) as Uint8Array;
    // Only the jittered column travels as bytes.
    expect(frame.byteLength).toBeLessThan(8 * 1000 + 1000);
    expect(frame.byteLength).toBeGreaterThan(8 * 1000);
    const back = decodeBinaryReply(asBuffer(frame)) as { result: Record<string, Float64Array | Uint8Array> };
    for (const [name, original] of Object.entries({ time, control, absent, ok, jittered })) {
      const got = back.result[name] as Float64Array | Uint8Array;
      expect(got.constructor).toBe(original.constructor);
      expect(got.length).toBe(original.length);
      original.forEach((v, i) => expect(Object.is(got[i], v), `${name}[${i}]`).toBe(true));
    }
  });
});
