import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatCell } from './csv-cells.ts';
import { parseSamplesCsv } from './samples-csv.ts';

describe('parseSamplesCsv', () => {
  it('reads numeric and text columns, empty cells as NaN', () => {
    const parsed = parseSamplesCsv('time_s,control_v,frequency_hz,status\n0,0.5,,no-signal\n0.1,0.55,1234567.25,ok\n');
    expect(parsed.names).toEqual(['time_s', 'control_v', 'frequency_hz', 'status']);
    expect(parsed.numeric.control_v).toEqual([0.5, 0.55]);
    expect(parsed.numeric.frequency_hz?.[0]).toBeNaN();
    expect(parsed.numeric.frequency_hz?.[1]).toBe(1234567.25);
    expect(parsed.text.status).toEqual(['no-signal', 'ok']);
    expect(parsed.dropped).toEqual([]);
  });

  it('drops a torn last line (no trailing newline) instead of misreading it', () => {
    // "1234567.25" cut after "12": read as a number it would be 12 Hz.
    const parsed = parseSamplesCsv('time_s,frequency_hz\n0,1000\n1,12');
    expect(parsed.numeric.frequency_hz).toEqual([1000]);
    expect(parsed.dropped).toEqual([{ lineNumber: 3, reason: 'no-newline', text: '1,12' }]);
  });

  it('drops lines with the wrong field count, bad quotes or unparsable numbers, naming the line', () => {
    const parsed = parseSamplesCsv('time_s,frequency_hz,status\n0,1,ok\n1,2\n2,3.3.3,ok\n3,"x,ok\n4,5,ok\n');
    expect(parsed.numeric.time_s).toEqual([0, 4]);
    expect(parsed.dropped.map((d) => [d.lineNumber, d.reason])).toEqual([
      [3, 'field-count'],
      [4, 'bad-number'],
      [5, 'bad-quote'],
    ]);
  });

  it('accepts CRLF, a BOM and quoted text', () => {
    // RFC 4180 §2: CRLF line breaks; quoted fields with doubled inner quotes.
    const parsed = parseSamplesCsv('\ufefftime_s,note\r\n1,"a, ""b"""\r\n');
    expect(parsed.numeric.time_s).toEqual([1]);
    expect(parsed.text.note).toEqual(['a, "b"']);
  });

  it('round-trips every double written with formatCell (shortest round-trip form)', () => {
    // ECMA-262 Number::toString gives the shortest digits that parse back to the same double.
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double(), fc.double({ noNaN: true })), { minLength: 1, maxLength: 20 }),
        (rows) => {
          const text = `a_v,b_hz\n${rows.map(([a, b]) => `${formatCell(a)},${formatCell(b)}\n`).join('')}`;
          const parsed = parseSamplesCsv(text);
          expect(parsed.rowCount).toBe(rows.length);
          rows.forEach(([a, b], i) => {
            expect(Object.is(parsed.numeric.a_v?.[i], Number.isNaN(a) ? Number.NaN : a)).toBe(true);
            expect(Object.is(parsed.numeric.b_hz?.[i], b)).toBe(true);
          });
        },
      ),
    );
  });

  it('never reads a truncated file as more or different rows than were whole', () => {
    const rows = ['0,1000.5,ok', '0.25,1000.75,ok', '0.5,,no-signal', '0.75,999.125,ok'];
    const full = `time_s,frequency_hz,status\n${rows.join('\n')}\n`;
    for (let cut = 0; cut <= full.length; cut++) {
      const parsed = parseSamplesCsv(full.slice(0, cut));
      const whole = full.slice(0, cut).split('\n').length - 2; // complete data lines
      expect(parsed.rowCount).toBe(Math.max(0, whole));
    }
  });
});
