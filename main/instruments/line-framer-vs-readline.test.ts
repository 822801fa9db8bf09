/**
 * Why tunebench keeps a framer of its own beside @serialport/parser-readline
 * (issue 10 item 8). On ordinary replies the two agree line for line, however
 * the bytes are cut; but an IEEE 488.2 definite-length block (`#<n><len><payload>`,
 * section 8.7.9 — from memory) may carry newline bytes in its payload, and the
 * readline parser, which knows only its delimiter, cuts such a reply apart.
 * So the serial transport frames with the readline parser and hands lines that
 * open a block to LineFramer (ReadlineLines), and the transports that deliver
 * bytes without Node streams (TCP, sim, Web Serial) use LineFramer alone; both
 * paths must give the same lines, which the last tests here check.
 */
import { ReadlineParser } from '@serialport/parser-readline';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LineFramer, type LineFramerOptions } from './line-framer.ts';
import { ReadlineLines } from './readline-lines.ts';

function withReadline(chunks: Uint8Array[]): Promise<string[]> {
  return new Promise((resolve, reject) => {
    const parser = new ReadlineParser({ delimiter: '\n', encoding: 'utf8' });
    const lines: string[] = [];
    parser.on('data', (line: string) => lines.push(line.replace(/\r$/, '')));
    parser.on('error', reject);
    parser.on('end', () => resolve(lines));
    for (const chunk of chunks) parser.write(Buffer.from(chunk));
    parser.end();
  });
}

function withFramer(chunks: Uint8Array[], options?: LineFramerOptions): string[] {
  const lines: string[] = [];
  const framer = new LineFramer((line) => lines.push(line.toString('latin1')), options);
  for (const chunk of chunks) framer.push(chunk);
  return lines;
}

function withReadlineLines(chunks: Uint8Array[], options?: LineFramerOptions): string[] {
  const lines: string[] = [];
  const splitter = new ReadlineLines((line) => lines.push(line.toString('latin1')), options);
  for (const chunk of chunks) splitter.push(chunk);
  return lines;
}

function cut(bytes: Uint8Array, at: number[]): Uint8Array[] {
  const points = [...new Set(at.map((a) => a % (bytes.length + 1)))].sort((a, b) => a - b);
  const out: Uint8Array[] = [];
  let from = 0;
  for (const p of [...points, bytes.length]) {
    out.push(bytes.subarray(from, p));
    from = p;
  }
  return out;
}

describe('LineFramer against @serialport/parser-readline', () => {
  it('agrees on ordinary SCPI replies however the stream is cut', async () => {
    const reply = fc.stringMatching(/^[+\-0-9.E,A-Za-z"; ]{0,24}$/);
    await fc.assert(
      fc.asyncProperty(
        fc.array(reply, { minLength: 1, maxLength: 8 }),
        fc.array(fc.nat(), { maxLength: 6 }),
        async (replies, at) => {
          const bytes = new TextEncoder().encode(replies.map((r) => `${r}\r\n`).join(''));
          const chunks = cut(bytes, at);
          expect(withFramer(chunks)).toEqual(await withReadline(chunks));
        },
      ),
      { numRuns: 100 },
    );
  });

  it('keeps a definite block holding newline bytes whole, where the readline parser splits it', async () => {
    const payload = 'ab\ncd\n';
    const bytes = new TextEncoder().encode(`#16${payload}\n+1.5E+03\n`);
    expect(withFramer([bytes])).toEqual([`#16${payload}`, '+1.5E+03']);
    expect(await withReadline([bytes])).toEqual(['#16ab', 'cd', '+1.5E+03']);
  });

  it('drops an empty line (a stream does not pass an empty chunk), where the framer delivers it', async () => {
    const bytes = new TextEncoder().encode('1\n\n2\n');
    expect(withFramer([bytes])).toEqual(['1', '', '2']);
    expect(await withReadline([bytes])).toEqual(['1', '2']);
    // ReadlineLines asks the parser to keep the delimiter, so no line is empty on the way.
    expect(withReadlineLines([bytes])).toEqual(['1', '', '2']);
  });
});

describe('ReadlineLines (the serial path: readline parser, blocks rejoined by LineFramer)', () => {
  // A reply is ordinary text, or a definite block whose payload may hold LF, CR and '#'.
  const text = fc.stringMatching(/^[+\-0-9.E,A-Za-z"#; ]{0,16}$/);
  const block = fc
    .array(fc.constantFrom(0x0a, 0x0d, 0x23, 0x00, 0xff, 0x41, 0x31), { maxLength: 30 })
    .map((payload) => {
      const length = String(payload.length);
      return Buffer.concat([Buffer.from(`#${length.length}${length}`), Buffer.from(payload)]).toString('latin1');
    });
  const replies = fc.array(fc.oneof(text, block), { minLength: 1, maxLength: 8 });

  for (const [terminator, label] of [
    ['\n', 'LF'],
    ['\r\n', 'CR LF'],
    ['\r', 'CR'],
  ] as const) {
    it(`gives LineFramer's lines, blocks included, however the stream is cut (${label})`, () => {
      fc.assert(
        fc.property(replies, fc.array(fc.nat(), { maxLength: 8 }), fc.boolean(), (rs, at, crlf) => {
          const end = terminator === '\n' && crlf ? '\r\n' : terminator;
          const chunks = cut(Buffer.from(rs.map((r) => r + end).join(''), 'latin1'), at);
          expect(withReadlineLines(chunks, { terminator })).toEqual(withFramer(chunks, { terminator }));
        }),
        { numRuns: 300 },
      );
    });
  }

  it('keeps the block the bare readline parser splits whole, and the line after it', () => {
    const bytes = Buffer.from('#16ab\ncd\n\n+1.5E+03\r\n', 'latin1');
    const lines = withReadlineLines(cut(bytes, [2, 5, 9]));
    expect(lines).toEqual(['#16ab\ncd\n', '+1.5E+03']);
  });

  it('drops an over-long partial line, reports its size and reads on', () => {
    const dropped: number[] = [];
    const lines: string[] = [];
    const splitter = new ReadlineLines((line) => lines.push(line.toString()), {
      maxLineBytes: 8,
      onOverflow: (n) => dropped.push(n),
    });
    splitter.push(Buffer.from('01234'));
    expect(splitter.pendingBytes).toBe(5);
    splitter.push(Buffer.from('56789'));
    expect(dropped).toEqual([10]);
    expect(splitter.pendingBytes).toBe(0);
    splitter.push(Buffer.from('ok\n'));
    expect(lines).toEqual(['ok']);
  });

  it('forgets a partial line and a half-rejoined block on reset', () => {
    const lines: string[] = [];
    const splitter = new ReadlineLines((line) => lines.push(line.toString('latin1')));
    splitter.push(Buffer.from('#15ab\ncd'));
    expect(lines).toEqual([]);
    splitter.reset();
    expect(splitter.pendingBytes).toBe(0);
    splitter.push(Buffer.from('4.5\n'));
    expect(lines).toEqual(['4.5']);
  });
});
