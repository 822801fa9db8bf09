import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LineFramer, type LineFramerOptions } from './line-framer.ts';

const encoder = new TextEncoder();

/** Feeds `bytes` cut at `cuts` and returns the decoded lines. */
function frame(bytes: Uint8Array, cuts: number[], options?: LineFramerOptions): string[] {
  const lines: string[] = [];
  const framer = new LineFramer((line) => lines.push(line.toString('utf8')), options);
  const points = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
  let from = 0;
  for (const point of [...points, bytes.length]) {
    // A fresh copy per chunk, reused afterwards, as a pooled serial read would.
    const chunk = Uint8Array.from(bytes.subarray(from, point));
    framer.push(chunk);
    chunk.fill(0x58);
    from = point;
  }
  return lines;
}

describe('LineFramer', () => {
  it('emits whole lines however the stream is cut, including inside multi-byte UTF-8 characters', () => {
    const lines = ['+4.00012345E+08', '-113,"Undefined header"', 'µV 25 °C ✓', '', '1'];
    const bytes = encoder.encode(lines.map((l) => `${l}\n`).join(''));
    // Every single cut point, then random multi-cuts.
    for (let cut = 0; cut <= bytes.length; cut += 1) expect(frame(bytes, [cut])).toEqual(lines);
    fc.assert(
      fc.property(fc.array(fc.nat(), { maxLength: 20 }), (cuts) => {
        expect(frame(bytes, cuts)).toEqual(lines);
      }),
    );
  });

  it('drops CR before LF by default and honours a CR LF terminator', () => {
    const bytes = encoder.encode('1.5\r\n2.5\r\n');
    for (let cut = 0; cut <= bytes.length; cut += 1) {
      expect(frame(bytes, [cut])).toEqual(['1.5', '2.5']);
      expect(frame(bytes, [cut], { terminator: '\r\n' })).toEqual(['1.5', '2.5']);
    }
    expect(frame(bytes, [], { trimCarriageReturn: false })).toEqual(['1.5\r', '2.5\r']);
    expect(frame(encoder.encode('a\rb\r'), [1], { terminator: '\r' })).toEqual(['a', 'b']);
  });

  it('keeps a partial line until its terminator arrives', () => {
    const lines: string[] = [];
    const framer = new LineFramer((line) => lines.push(line.toString()));
    framer.push(encoder.encode('12.'));
    expect(lines).toEqual([]);
    expect(framer.pendingBytes).toBe(3);
    framer.push(encoder.encode('5\n3'));
    expect(lines).toEqual(['12.5']);
    framer.reset();
    framer.push(encoder.encode('4\n'));
    expect(lines).toEqual(['12.5', '4']);
  });

  it('passes a definite block whose payload holds newlines as one line (IEEE 488.2 8.7.9, section number from memory)', () => {
    const payload = Uint8Array.from([0x0a, 0x00, 0xff, 0x0a, 0x0d, 0x0a, 0x41]);
    const bytes = new Uint8Array([...encoder.encode('#17'), ...payload, 0x0a, ...encoder.encode('next\n')]);
    for (let cut = 0; cut <= bytes.length; cut += 1) {
      const got: Buffer[] = [];
      const framer = new LineFramer((line) => got.push(Buffer.from(line)));
      framer.push(bytes.subarray(0, cut));
      framer.push(bytes.subarray(cut));
      expect(got.map((b) => Array.from(b))).toEqual([
        [...encoder.encode('#17'), ...payload],
        Array.from(encoder.encode('next')),
      ]);
    }
    // #0 is indefinite: the terminator ends it.
    expect(frame(encoder.encode('#0abc\n'), [])).toEqual(['#0abc']);
    expect(frame(encoder.encode('#H1F\n'), [2])).toEqual(['#H1F']);
  });

  it('drops an over-long partial line and reports it', () => {
    let dropped = 0;
    const lines: string[] = [];
    const framer = new LineFramer((line) => lines.push(line.toString()), {
      maxLineBytes: 8,
      onOverflow: (n) => {
        dropped = n;
      },
    });
    framer.push(encoder.encode('0123456789'));
    expect(dropped).toBe(10);
    framer.push(encoder.encode('ok\n'));
    expect(lines).toEqual(['ok']);
  });

  it('rejects an empty terminator, naming the option', () => {
    expect(() => new LineFramer(() => undefined, { terminator: '' })).toThrow(/terminator/);
  });
});
