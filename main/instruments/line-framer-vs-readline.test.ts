/**
 * Why tunebench frames lines itself instead of with @serialport/parser-readline
 * (issue 10 item 8). On ordinary replies the two agree line for line, however
 * the bytes are cut; but an IEEE 488.2 definite-length block (`#<n><len><payload>`,
 * section 8.7.9 — from memory) may carry newline bytes in its payload, and the
 * readline parser, which knows only its delimiter, cuts such a reply apart.
 * So one framer serves every transport (serial, TCP, sim), and the readline
 * parser stays the reference these tests hold it to.
 */
import { ReadlineParser } from '@serialport/parser-readline';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LineFramer } from './line-framer.ts';

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

function withFramer(chunks: Uint8Array[]): string[] {
  const lines: string[] = [];
  const framer = new LineFramer((line) => lines.push(line.toString('utf8')));
  for (const chunk of chunks) framer.push(chunk);
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
});
