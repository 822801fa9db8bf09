import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { textCell } from '../../app/contract/bench-api.ts';
import { formatCell } from './csv-cells.ts';
import { EXACT, NOT_PLAIN, PLAIN_INEXACT, scan, scanNumber } from './number-scan.ts';
import { readSampleTable, type SampleTable } from './sample-table.ts';
import { parseSamplesCsv, type ParsedSamples } from './samples-csv.ts';

/** The fast reader must give exactly what the reference reader gives. */
function expectSameAsReference(text: string): SampleTable {
  const reference: ParsedSamples = parseSamplesCsv(text);
  const fast = readSampleTable(text);
  expect(fast.names).toEqual(reference.names);
  expect(fast.rowCount).toBe(reference.rowCount);
  expect(fast.dropped).toEqual(reference.dropped);
  expect(Object.keys(fast.numeric)).toEqual(Object.keys(reference.numeric));
  expect(Object.keys(fast.text)).toEqual(Object.keys(reference.text));
  for (const [name, column] of Object.entries(reference.numeric)) {
    const got = fast.numeric[name] as Float64Array;
    expect(got).toBeInstanceOf(Float64Array);
    expect(got.length).toBe(column.length);
    // Object.is: NaN equals NaN, and -0 differs from 0.
    column.forEach((value, i) => expect(Object.is(got[i], value), `${name}[${i}]: ${got[i]} vs ${value}`).toBe(true));
  }
  for (const [name, column] of Object.entries(reference.text)) {
    const got = fast.text[name];
    if (!got) throw new Error(`no text column ${name}`);
    expect(got.codes.length).toBe(column.length);
    expect(column.map((_, i) => textCell(got, i))).toEqual(column);
  }
  return fast;
}

const NAMES = ['time_s', 'control_v', 'frequency_hz', 'temperature_c', 'status', 'direction', 'note', 'label', 'x'];
const WORDS = ['ok', 'no-signal', 'timeout', 'error', 'up', 'down', 'warm', ''];
/** Cells that a careless scanner would misread (each must be accepted or refused exactly as the reference does). */
const AWKWARD = [
  ' ',
  ' 1',
  '1 ',
  '+1',
  '1.',
  '.5',
  '-.5',
  '-',
  '.',
  '1e5',
  '1E-3',
  '1e',
  '1e+',
  '-1e-7',
  'Infinity',
  '-Infinity',
  '+Infinity',
  'NaN',
  '0x1f',
  '1.2.3',
  '-0',
  '0.0',
  '-0.0',
  '00012',
  '12345678901234567890',
  '9007199254740993',
  '1e400',
  '1e-400',
  '4.9e-324',
  '1.7976931348623157e308',
  '123456789012345.6',
  '0.1234567890123456789',
  '"quoted, x"',
  '"1"',
  '"bad',
  'a"b',
  '""',
  'x',
];

const cellArb = fc.oneof(
  { arbitrary: fc.double().map(formatCell), weight: 5 },
  { arbitrary: fc.integer({ min: -1e6, max: 1e6 }).map((n) => String(n / 1000)), weight: 2 },
  { arbitrary: fc.constantFrom(...WORDS), weight: 2 },
  { arbitrary: fc.constantFrom(...AWKWARD), weight: 2 },
);

const fileArb = fc
  .record({
    names: fc.array(fc.constantFrom(...NAMES), { minLength: 1, maxLength: 5 }),
    rows: fc.array(fc.array(cellArb, { minLength: 0, maxLength: 6 }), { maxLength: 30 }),
    crlf: fc.boolean(),
    bom: fc.boolean(),
    blankEvery: fc.integer({ min: 0, max: 7 }),
  })
  .map(({ names, rows, crlf, bom, blankEvery }) => {
    const nl = crlf ? '\r\n' : '\n';
    const lines = rows.map((cells, i) => {
      // Mostly the right width, so most rows are kept and the corruptions are the exception.
      const fitted = i % 4 === 3 ? cells : names.map((_, c) => cells[c] ?? '');
      return blankEvery > 0 && i % blankEvery === 0 ? `${fitted.join(',')}${nl}  ` : fitted.join(',');
    });
    return `${bom ? '\ufeff' : ''}${names.join(',')}${nl}${lines.map((line) => `${line}${nl}`).join('')}`;
  });

describe('readSampleTable (fast columnar reader)', () => {
  it('reads the writer’s plain rows into Float64Array and coded text columns', () => {
    const table = expectSameAsReference(
      'time_s,control_v,frequency_hz,status\n0,0.5,,no-signal\n0.1,0.55,1234567.25,ok\n0.2,0.6,1234568.5,ok\n',
    );
    expect(Array.from(table.numeric.control_v ?? [])).toEqual([0.5, 0.55, 0.6]);
    expect(table.numeric.frequency_hz?.[0]).toBeNaN();
    expect(table.text.status?.levels).toEqual(['no-signal', 'ok']);
    expect(Array.from(table.text.status?.codes ?? [])).toEqual([0, 1, 1]);
    expect(table.text.status?.codes).toBeInstanceOf(Uint8Array);
  });

  it('drops the same torn, short, badly quoted and unparsable lines as the reference, naming the line', () => {
    const table = expectSameAsReference('time_s,frequency_hz,status\n0,1,ok\n1,2\n2,3.3.3,ok\n3,"x,ok\n4,5,ok\n5,12');
    expect(table.dropped.map((d) => [d.lineNumber, d.reason])).toEqual([
      [3, 'field-count'],
      [4, 'bad-number'],
      [5, 'bad-quote'],
      [7, 'no-newline'],
    ]);
  });

  it('agrees with the reference on CRLF, a BOM, quoted text, blank lines and header-only files', () => {
    expectSameAsReference('\ufefftime_s,note\r\n1,"a, ""b"""\r\n\r\n  \r\n2,plain\r\n');
    expectSameAsReference('time_s,frequency_hz\n');
    expectSameAsReference('time_s,frequency_hz');
    expectSameAsReference('');
    expectSameAsReference('\n\n1,2\n');
  });

  it('agrees with the reference on random files, whole and cut anywhere', () => {
    fc.assert(
      fc.property(fileArb, fc.nat(), (text, cutAt) => {
        expectSameAsReference(text);
        expectSameAsReference(text.slice(0, cutAt % (text.length + 1)));
      }),
      { numRuns: 300 },
    );
  });

  it('agrees with the reference when random characters are written over a file', () => {
    fc.assert(
      fc.property(
        fileArb,
        fc.array(
          fc.tuple(fc.nat(), fc.constantFrom('"', ',', '\n', '\r', ' ', 'e', '.', '-', '+', '9', 'x', '\u00a0')),
          { maxLength: 4 },
        ),
        (text, hits) => {
          let damaged = text;
          for (const [at, ch] of hits) {
            const i = at % (damaged.length + 1);
            damaged = damaged.slice(0, i) + ch + damaged.slice(i + 1);
          }
          expectSameAsReference(damaged);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('round-trips every double written with formatCell (shortest round-trip form)', () => {
    // ECMA-262 Number::toString gives the shortest digits that parse back to the same double.
    fc.assert(
      // A second, never-empty column: a one-column row holding NaN would be a blank line, skipped by design.
      fc.property(fc.array(fc.double(), { minLength: 1, maxLength: 50 }), (values) => {
        const table = readSampleTable(`a_v,i\n${values.map((v, i) => `${formatCell(v)},${i}\n`).join('')}`);
        values.forEach((v, i) => expect(Object.is(table.numeric.a_v?.[i], v)).toBe(true));
      }),
    );
  });
});

describe('scanNumber', () => {
  it('answers only when exact, and then with the same double as Number()', () => {
    // Clinger's fast path (PLDI 1990): significand ≤ 2^53 and |power of ten| ≤ 22.
    expect(scanNumber('400000000.0819431', 0, 17)).toBe(EXACT);
    expect(scan.value).toBe(400000000.0819431);
    expect(scanNumber('23.000181805205827,ok', 0, 21)).toBe(PLAIN_INEXACT); // 17 digits: left to Number()
    expect(scan.end).toBe(18);
    expect(scanNumber('1e23', 0, 4)).toBe(PLAIN_INEXACT);
    expect(scanNumber('+1', 0, 2)).toBe(NOT_PLAIN);
    expect(scanNumber('1e', 0, 2)).toBe(NOT_PLAIN);
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (value) => {
        const text = formatCell(value);
        if (scanNumber(text, 0, text.length) === EXACT) expect(Object.is(scan.value, Number(text))).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });
});
