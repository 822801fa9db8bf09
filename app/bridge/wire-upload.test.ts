import { describe, expect, it } from 'vitest';
import { wireMessages } from './ws-client.ts';
import { IMPORT_PART_BYTES } from '../contract/wire.ts';
import { encodeImportParts, splitImportPart } from '../contract/wire-upload.ts';

describe('streamed import parts (app/contract/wire.ts)', () => {
  it('cut the UTF-8 bytes into full parts that join back to the same text, even through a character', () => {
    const text = `control_v,frequency_hz,note\n${'0.5,1000,µ°Ω\n'.repeat(60_000)}`;
    const parts = encodeImportParts({ id: 7, fileName: 'night.csv', dutId: 'osc-1' }, text);
    const split = parts.map((part) => splitImportPart(part));
    expect(split.every((s) => s !== null)).toBe(true);
    expect(split.map((s) => (s?.header as { part: number }).part)).toEqual(parts.map((_, i) => i));
    expect(split.slice(0, -1).every((s) => s?.bytes.byteLength === IMPORT_PART_BYTES)).toBe(true);
    const joined = new Uint8Array(split.reduce((n, s) => n + (s?.bytes.byteLength ?? 0), 0));
    let at = 0;
    for (const s of split) {
      joined.set(s?.bytes ?? new Uint8Array(), at);
      at += s?.bytes.byteLength ?? 0;
    }
    expect(new TextDecoder().decode(joined)).toBe(text);
  });

  it('the page client sends a short import as one JSON call and a long one as binary parts', () => {
    expect(wireMessages({ id: 1, method: 'importCsv', params: ['a.csv', 'x,y\n1,2\n', 'd'] })).toEqual([
      JSON.stringify({ id: 1, method: 'importCsv', params: ['a.csv', 'x,y\n1,2\n', 'd'] }),
    ]);
    const long = wireMessages({ id: 2, method: 'importCsv', params: ['b.csv', 'x'.repeat(600_000), 'd'] });
    expect(long).toHaveLength(3);
    expect(long.every((m) => m instanceof Uint8Array)).toBe(true);
  });

  it('refuses broken framing instead of guessing', () => {
    expect(splitImportPart(new Uint8Array([1, 2]))).toBeNull();
    expect(splitImportPart(new Uint8Array([255, 255, 0, 0, 1, 2, 3]))).toBeNull();
    const bad = new Uint8Array([3, 0, 0, 0, 0x7b, 0x7b, 0x7b]);
    expect(splitImportPart(bad)).toBeNull();
  });
});
