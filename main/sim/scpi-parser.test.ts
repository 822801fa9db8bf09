import { describe, expect, it } from 'vitest';
import { compilePattern, matchPattern, splitProgramMessage } from './scpi-parser.ts';
import { formatNr3, parseBoolean, parseNumber } from './scpi-params.ts';

const volt = compilePattern('[SOURce#]:VOLTage[:LEVel][:IMMediate][:AMPLitude]');

describe('SCPI header matching (SCPI-99 vol. 1 ch. 6 conventions, from memory)', () => {
  it('takes long or short forms, any case, optional nodes', () => {
    expect(matchPattern(volt, ['VOLT'])).toEqual({});
    expect(matchPattern(volt, ['voltage'])).toEqual({});
    expect(matchPattern(volt, ['SOUR', 'VOLT', 'LEV', 'IMM', 'AMPL'])).toEqual({});
    expect(matchPattern(volt, ['Source', 'Volt', 'Level'])).toEqual({});
    expect(matchPattern(volt, ['VOLT', 'AMPL'])).toEqual({});
  });

  it('rejects partial forms and unknown nodes', () => {
    expect(matchPattern(volt, ['VOLTA'])).toBeNull();
    expect(matchPattern(volt, ['SOU', 'VOLT'])).toBeNull();
    expect(matchPattern(volt, ['SOUR', 'CURR'])).toBeNull();
    expect(matchPattern(volt, ['VOLT', 'LEV', 'LEV'])).toBeNull();
  });

  it('captures numeric suffixes only where the pattern allows one', () => {
    expect(matchPattern(volt, ['SOUR2', 'VOLT'])).toEqual({ SOUR: 2 });
    expect(matchPattern(volt, ['VOLT2'])).toBeNull();
    expect(matchPattern(compilePattern('OUTPut#[:STATe]'), ['outp1', 'stat'])).toEqual({ OUTP: 1 });
  });
});

describe('program message splitting', () => {
  it('splits units at ; outside quotes and reads parameters', () => {
    const split = splitProgramMessage(':SOUR1:VOLT 1.5;CURR 0.1;*OPC?;SYST:ERR?;DISP:TEXT "a;b",2');
    expect(split.ok).toBe(true);
    if (!split.ok) return;
    expect(split.units.map((u) => [u.header, u.query, u.common, u.rooted, u.params])).toEqual([
      ['SOUR1:VOLT', false, false, true, ['1.5']],
      ['CURR', false, false, false, ['0.1']],
      ['*OPC', true, true, false, []],
      ['SYST:ERR', true, false, false, []],
      ['DISP:TEXT', false, false, false, ['"a;b"', '2']],
    ]);
  });

  it('reports syntax errors', () => {
    expect(splitProgramMessage('VOLT$ 1').ok).toBe(false);
    expect(splitProgramMessage('DISP:TEXT "open').ok).toBe(false);
    expect(splitProgramMessage('::VOLT').ok).toBe(false);
  });
});

describe('parameters', () => {
  const spec = { unit: 'V', min: 0, max: 20, def: 1 };
  it('reads NR1/NR2/NR3, units, multipliers, MIN/MAX/DEF', () => {
    expect(parseNumber('2', spec, 'v')).toBe(2);
    expect(parseNumber('+1.25E+00', spec, 'v')).toBe(1.25);
    expect(parseNumber('1500mV', spec, 'v')).toBeCloseTo(1.5, 12);
    expect(parseNumber('2 V', spec, 'v')).toBe(2);
    expect(parseNumber('MAX', spec, 'v')).toBe(20);
    expect(parseNumber('min', spec, 'v')).toBe(0);
    expect(parseNumber('DEF', spec, 'v')).toBe(1);
    expect(parseNumber('10KHZ', { unit: 'HZ', min: 0, max: 1e9 }, 'f')).toBe(1e4);
    expect(parseNumber('2MHZ', { unit: 'HZ', min: 0, max: 1e9 }, 'f')).toBe(2e6);
    expect(parseNumber('100ms', { unit: 'S', min: 0, max: 10 }, 'gate')).toBeCloseTo(0.1, 12);
  });

  it('codes bad values: -104 type, -222 range, -109 missing', () => {
    expect(() => parseNumber('abc', spec, 'v')).toThrow(expect.objectContaining({ code: -104 }));
    expect(() => parseNumber('3A', spec, 'v')).toThrow(expect.objectContaining({ code: -104 }));
    expect(() => parseNumber('25', spec, 'v')).toThrow(expect.objectContaining({ code: -222 }));
    expect(() => parseNumber(undefined, spec, 'v')).toThrow(expect.objectContaining({ code: -109 }));
    expect(parseBoolean('on', 'o')).toBe(true);
    expect(parseBoolean('0', 'o')).toBe(false);
    expect(() => parseBoolean('maybe', 'o')).toThrow(expect.objectContaining({ code: -224 }));
  });

  it('formats NR3 with sign and two-digit exponent', () => {
    expect(formatNr3(12345, 6)).toBe('+1.23450E+04');
    expect(formatNr3(-0.0015, 3)).toBe('-1.50E-03');
    expect(formatNr3(9.91e37, 3)).toBe('+9.91E+37');
  });
});
