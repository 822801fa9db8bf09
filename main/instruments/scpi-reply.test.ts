import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ReplyFormatError } from './errors.ts';
import {
  formatScpiNumber,
  parseBlock,
  parseBoolean,
  parseErrorEntry,
  parseFinite,
  parseIdentity,
  parseInteger,
  parseNumeric,
  parseNumericList,
  parseQuotedString,
  splitList,
  SCPI_INFINITY,
  SCPI_NAN,
} from './scpi-reply.ts';

/** Runs `fn` and returns the thrown error (or null); lets properties assert on the class. */
function thrown(fn: () => unknown): unknown {
  try {
    fn();
    return null;
  } catch (error) {
    return error;
  }
}

const notSpecial = (x: number): boolean => x !== SCPI_NAN && Math.abs(x) !== SCPI_INFINITY;

describe('parseNumeric', () => {
  it('reads NR1, NR2 and NR3 forms with and without sign (IEEE 488.2 8.7.2-8.7.4, section numbers from memory)', () => {
    expect(parseNumeric('42')).toEqual({ kind: 'finite', value: 42 });
    expect(parseNumeric('+42')).toEqual({ kind: 'finite', value: 42 });
    expect(parseNumeric('-7')).toEqual({ kind: 'finite', value: -7 });
    expect(parseNumeric('3.25')).toEqual({ kind: 'finite', value: 3.25 });
    expect(parseNumeric('-.5')).toEqual({ kind: 'finite', value: -0.5 });
    expect(parseNumeric('+1.000000E+06')).toEqual({ kind: 'finite', value: 1e6 });
    expect(parseNumeric('4.00012345E+08')).toEqual({ kind: 'finite', value: 400012345 });
    expect(parseNumeric('-2.5e-3')).toEqual({ kind: 'finite', value: -0.0025 });
    expect(parseNumeric(' 1.5 ')).toEqual({ kind: 'finite', value: 1.5 });
  });

  it('tags the SCPI special values instead of returning them as numbers (SCPI-99 7.2.1.5, from memory)', () => {
    expect(parseNumeric('9.91E37')).toEqual({ kind: 'not-a-number' });
    expect(parseNumeric('+9.910000E+37')).toEqual({ kind: 'not-a-number' });
    expect(parseNumeric('9.9E37')).toEqual({ kind: 'infinity', sign: 1 });
    expect(parseNumeric('-9.90E+37')).toEqual({ kind: 'infinity', sign: -1 });
    expect(thrown(() => parseFinite('9.91E37'))).toBeInstanceOf(ReplyFormatError);
    expect(thrown(() => parseFinite('-9.9E37'))).toBeInstanceOf(ReplyFormatError);
  });

  it.each([
    '',
    ' ',
    '+',
    '-',
    '.',
    '1.2.3',
    '1e',
    'e5',
    '1e+',
    'NaN',
    'Infinity',
    '-Infinity',
    '0x10',
    '0b1',
    '1,2',
    '1 2',
    '12V',
    '"1"',
    '#15hello',
    '1_000',
    '١٢',
    '1e999',
    '--1',
    '+-1',
    '1.5\n2',
    '\u00a01',
  ])('rejects %j with ReplyFormatError', (reply) => {
    expect(thrown(() => parseNumeric(reply))).toBeInstanceOf(ReplyFormatError);
  });

  it('round-trips any finite double written as NR3 (toExponential gives the shortest exact digits)', () => {
    fc.assert(
      fc.property(
        fc.double({ noNaN: true, noDefaultInfinity: true }).filter(notSpecial),
        fc.constantFrom('e', 'E'),
        fc.boolean(),
        (x, e, plus) => {
          let text = x.toExponential().replace('e', e);
          if (plus && x >= 0) text = `+${text}`;
          const parsed = parseNumeric(text);
          expect(parsed.kind).toBe('finite');
          expect(parsed.kind === 'finite' && parsed.value === x).toBe(true);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('round-trips NR2 (fixed point) and NR1 (integer) forms', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1e15, max: 1e15, noNaN: true }).filter((x) => Math.abs(x) >= 1e-6 || x === 0),
        (x) => {
          const text = String(x); // no exponent in this magnitude range
          expect(text).not.toMatch(/e/);
          const nr2 = text.includes('.') ? text : `${text}.0`;
          expect(parseFinite(nr2)).toBe(x === 0 ? 0 : x);
        },
      ),
      { numRuns: 2000 },
    );
    fc.assert(
      fc.property(fc.maxSafeInteger(), fc.integer({ min: 0, max: 3 }), (n, zeros) => {
        const text = n < 0 ? `-${'0'.repeat(zeros)}${-n}` : `+${'0'.repeat(zeros)}${n}`;
        expect(parseInteger(text)).toBe(n);
      }),
      { numRuns: 1000 },
    );
  });

  it('never returns a number for a hostile reply unless the reply is exactly that decimal number', () => {
    const hostile = fc.string({
      unit: fc.constantFrom(...'0123456789+-.eE ,#"\'\r\n\tINFANinfa\u00a0x'.split('')),
      maxLength: 14,
    });
    fc.assert(
      fc.property(fc.oneof(hostile, fc.string(), fc.string({ unit: 'binary' })), (reply) => {
        let parsed: ReturnType<typeof parseNumeric> | null = null;
        try {
          parsed = parseNumeric(reply);
        } catch (error) {
          expect(error).toBeInstanceOf(ReplyFormatError);
          return;
        }
        // Accepted: only decimal digits, sign, point, exponent and blanks; value equals JS's own reading.
        expect(reply).toMatch(/^[ \t]*[0-9+\-.eE]+[ \t]*$/);
        const value = Number(reply);
        if (parsed.kind === 'finite') expect(parsed.value).toBe(value);
        else if (parsed.kind === 'not-a-number') expect(value).toBe(SCPI_NAN);
        else expect(Math.abs(value)).toBe(SCPI_INFINITY);
      }),
      { numRuns: 5000 },
    );
  });
});

describe('other response types', () => {
  it('reads booleans 0/1/ON/OFF and rejects others', () => {
    expect(parseBoolean('1')).toBe(true);
    expect(parseBoolean('OFF')).toBe(false);
    expect(parseBoolean('on')).toBe(true);
    expect(parseBoolean('0')).toBe(false);
    for (const bad of ['', '2', 'TRUE', '1.0', 'O N'])
      expect(thrown(() => parseBoolean(bad))).toBeInstanceOf(ReplyFormatError);
  });

  it('unquotes strings with doubled inner quotes', () => {
    expect(parseQuotedString('"VOLT:RANG ""AUTO"""')).toBe('VOLT:RANG "AUTO"');
    expect(parseQuotedString("'abc'")).toBe('abc');
    for (const bad of ['abc', '"abc', '"a"b"', '"', '\'x"'])
      expect(thrown(() => parseQuotedString(bad))).toBeInstanceOf(ReplyFormatError);
  });

  it('splits lists, keeping commas inside quotes, and tags each numeric item', () => {
    expect(splitList('1,"a,b",3')).toEqual(['1', '"a,b"', '3']);
    expect(parseNumericList('1.5,9.91E37,-9.9E37')).toEqual([
      { kind: 'finite', value: 1.5 },
      { kind: 'not-a-number' },
      { kind: 'infinity', sign: -1 },
    ]);
    expect(thrown(() => parseNumericList('1,,2'))).toBeInstanceOf(ReplyFormatError);
    expect(thrown(() => splitList(''))).toBeInstanceOf(ReplyFormatError);
    expect(thrown(() => splitList('"open'))).toBeInstanceOf(ReplyFormatError);
  });

  it('passes definite and indefinite arbitrary blocks through untouched (IEEE 488.2 8.7.9/8.7.10, section numbers from memory)', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 300 }), (payload) => {
        const len = String(payload.length);
        const header = new TextEncoder().encode(`#${len.length}${len}`);
        const framed = new Uint8Array(header.length + payload.length);
        framed.set(header);
        framed.set(payload, header.length);
        expect(Array.from(parseBlock(framed))).toEqual(Array.from(payload));
        if (payload.length > 0)
          expect(thrown(() => parseBlock(framed.subarray(0, framed.length - 1)))).toBeInstanceOf(ReplyFormatError);
      }),
    );
    expect(new TextDecoder().decode(parseBlock('#0free\nform'))).toBe('free\nform');
    for (const bad of ['', '#', '#x12', '#3ab', '#15abc', '15abc', '#2101234567890X']) {
      expect(thrown(() => parseBlock(bad))).toBeInstanceOf(ReplyFormatError);
    }
  });

  it('reads SYST:ERR? entries (SCPI-99 error numbers, from memory: -113 Undefined header, -222 Data out of range)', () => {
    expect(parseErrorEntry('-113,"Undefined header"')).toEqual({ code: -113, message: 'Undefined header' });
    expect(parseErrorEntry('-222,"Data out of range;VOLT 99"')).toEqual({
      code: -222,
      message: 'Data out of range;VOLT 99',
    });
    expect(parseErrorEntry('+0,"No error"')).toEqual({ code: 0, message: 'No error' });
    for (const bad of ['', '0', 'No error', '-113,Undefined', '1.5,"x"'])
      expect(thrown(() => parseErrorEntry(bad))).toBeInstanceOf(ReplyFormatError);
  });

  it('parses *IDN? into its four fields (IEEE 488.2 10.14, section number from memory)', () => {
    expect(parseIdentity('Bench Works,PS-3,SN0042,1.2.3\r')).toEqual({
      idn: 'Bench Works,PS-3,SN0042,1.2.3',
      manufacturer: 'Bench Works',
      model: 'PS-3',
      serial: 'SN0042',
      firmware: '1.2.3',
    });
    expect(parseIdentity('A,B,C,fw 1,build 7').firmware).toBe('fw 1,build 7');
    expect(thrown(() => parseIdentity('A,B,C'))).toBeInstanceOf(ReplyFormatError);
    expect(thrown(() => parseIdentity(''))).toBeInstanceOf(ReplyFormatError);
  });

  it('formats finite numbers for commands and refuses non-finite ones', () => {
    expect(formatScpiNumber(2.5)).toBe('2.5');
    expect(formatScpiNumber(1e-7)).toBe('1E-7');
    expect(formatScpiNumber(4e21)).toBe('4E+21');
    expect(() => formatScpiNumber(Number.NaN)).toThrow(RangeError);
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }).filter(notSpecial), (x) => {
        expect(parseFinite(formatScpiNumber(x))).toBe(x === 0 ? 0 : x);
      }),
    );
  });
});
