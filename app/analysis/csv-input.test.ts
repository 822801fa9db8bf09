import { describe, expect, it } from 'vitest';
import { detectCsvKind, driftInputFromTable, pushingInputFromTable, sweepInputFromTable } from './csv-columns.ts';
import { CsvError, numericColumn, parseCsv } from './csv-input.ts';

function errorOf(fn: () => unknown): CsvError {
  try {
    fn();
  } catch (e) {
    if (e instanceof CsvError) return e;
    throw e;
  }
  throw new Error('expected a CsvError');
}

describe('parseCsv', () => {
  it('reads columns by name in any order, skipping comments and blank lines', () => {
    const t = parseCsv('# bench notes\nFrequency_Hz, control_v ,extra\n1000,0.5,x\n\n2000,1.0,"a,b"\r\n');
    expect(t.header).toEqual(['frequency_hz', 'control_v', 'extra']);
    expect(Array.from(numericColumn(t, 'control_v') ?? [])).toEqual([0.5, 1]);
    expect(t.rows[1]?.[2]).toBe('a,b');
    expect(t.lineOf).toEqual([3, 5]);
  });
  it('maps empty and NaN to NaN', () => {
    const t = parseCsv('control_v,frequency_hz\n0.5,\n0.6,NaN\n0.7,9.91E37\n');
    const f = numericColumn(t, 'frequency_hz');
    expect(Number.isNaN(f?.[0])).toBe(true);
    expect(Number.isNaN(f?.[1])).toBe(true);
    expect(f?.[2]).toBe(9.91e37);
  });
  it('names the line of a bad number, a short row and a missing header', () => {
    expect(errorOf(() => numericColumn(parseCsv('control_v,frequency_hz\n0.5,100\n0.6,12k\n'), 'frequency_hz')).message).toBe(
      'line 3: column frequency_hz: "12k" is not a number',
    );
    expect(errorOf(() => parseCsv('a,b\n1,2\n3\n')).line).toBe(3);
    expect(errorOf(() => parseCsv('\n# nothing\n')).message).toMatch(/no header row/);
    expect(errorOf(() => parseCsv('a,a\n1,2\n')).message).toMatch(/twice/);
  });
});

describe('CSV → analysis inputs', () => {
  it('detects the kind of a plain CSV', () => {
    expect(detectCsvKind(parseCsv('control_v,frequency_hz\n1,10\n2,20\n'))).toBe('sweep');
    expect(detectCsvKind(parseCsv('time_s,control_v,frequency_hz\n0,1,10\n1,1,11\n'))).toBe('drift');
    expect(detectCsvKind(parseCsv('time_s,control_v,supply_v,frequency_hz,status\n0,1,4.5,10,ok\n1,1,5,11,ok\n'))).toBe('pushing');
    expect(errorOf(() => detectCsvKind(parseCsv('v,f\n1,2\n'))).message).toMatch(/frequency_hz/);
  });
  it('applies status and direction columns of a run folder’s samples.csv', () => {
    const t = parseCsv('time_s,control_v,frequency_hz,direction,status\n0,1,100,up,ok\n1,2,200,down,timeout\n');
    const s = sweepInputFromTable(t, 0.1);
    expect(Array.from(s.direction ?? [])).toEqual([1, -1]);
    expect(Number.isNaN(s.frequencyHz[1])).toBe(true);
    // A timeout says nothing about oscillation: the row is dropped, not counted as stalled.
    expect(Number.isNaN(s.controlV[1])).toBe(true);
    const ns = sweepInputFromTable(parseCsv('control_v,frequency_hz,status\n1,0,no-signal\n'));
    expect(ns.controlV[0]).toBe(1);
    expect(Number.isNaN(ns.frequencyHz[0])).toBe(true);
    expect(s.gateS).toBe(0.1);
    expect(errorOf(() => sweepInputFromTable(parseCsv('control_v,frequency_hz,status\n1,2,fine\n'))).line).toBe(2);
    expect(errorOf(() => sweepInputFromTable(parseCsv('control_v,frequency_hz,direction\n1,2,sideways\n'))).line).toBe(2);
  });
  it('builds drift and pushing inputs', () => {
    const d = driftInputFromTable(parseCsv('time_s,frequency_hz,temperature_c\n0,10,25\n1,11,25.5\n'));
    expect(Array.from(d.temperatureC ?? [])).toEqual([25, 25.5]);
    expect(errorOf(() => driftInputFromTable(parseCsv('time_s,frequency_hz\n1,10\n0,11\n'))).line).toBe(3);
    const p = pushingInputFromTable(parseCsv('control_v,supply_v,frequency_hz\n2,4.5,10\n2,5,11\n'));
    expect(p.controlV).toBe(2);
  });
});
