import { describe, expect, it } from 'vitest';
import { CsvImportError, parsePlainCsv } from './plain-csv.ts';

function problemsOf(text: string): string[] {
  try {
    parsePlainCsv(text, 'bench.csv');
  } catch (error) {
    if (error instanceof CsvImportError) return error.problems.map((p) => `${p.line}${p.column ? `:${p.column}` : ''} ${p.message}`);
    throw error;
  }
  return [];
}

describe('parsePlainCsv (CONTRACTS.md plain CSV input)', () => {
  it('reads a sweep with columns in any order; empty, NaN, 0 and 9.91E37 mean no oscillation', () => {
    const data = parsePlainCsv('frequency_hz,comment,control_v\r\n,stalled,0.2\nNaN,,0.3\n0,,0.4\n9.91E37,,0.5\n1.5e6,,0.6\n1.52e6,x,0.6', 'a.csv');
    expect(data.kind).toBe('sweep');
    expect(data.columns).toEqual(['control_v', 'frequency_hz', 'status']);
    expect(data.rows.map((r) => r[2])).toEqual(['no-signal', 'no-signal', 'no-signal', 'no-signal', 'ok', 'ok']);
    expect(data.rows[4]).toEqual([0.6, 1.5e6, 'ok']);
  });

  it('reads a drift log, also one that carries a fixed control_v', () => {
    expect(parsePlainCsv('time_s,frequency_hz,temperature_c\n0,1e7,25\n1,1.00001e7,25.1\n', 'd.csv').kind).toBe('drift');
    const fixed = parsePlainCsv('time_s,control_v,frequency_hz\n0,2.5,1e7\n1,2.5,1e7\n', 'd.csv');
    expect(fixed.kind).toBe('drift');
    expect(parsePlainCsv('time_s,control_v,frequency_hz\n0,2.5,1e7\n1,2.6,1e7\n', 'd.csv').kind).toBe('sweep');
  });

  it('names the line and column of every problem', () => {
    expect(problemsOf('')).toEqual(['1 empty file; expected a header row']);
    expect(problemsOf('volts;hertz\n1;2\n')[0]).toMatch(/^1 header: expected columns control_v and frequency_hz .*found volts;hertz \(fields must be separated by commas\)/);
    expect(problemsOf('control_v,frequency_hz\n')).toEqual(['2 no data rows after the header']);
    expect(problemsOf('control_v,frequency_hz\n0.5,1e6\n0.6\n0.7,1.2 MHz\n,1e6\n0.9,"1e6\n')).toEqual([
      '3 expected 2 fields like the header, found 1',
      '4:frequency_hz expected a number, got "1.2 MHz"',
      '5:control_v must not be empty',
      '6 unbalanced quote',
    ]);
    expect(() => parsePlainCsv('a,b\n1,2\n', 'lab/old.csv')).toThrow(/^lab\/old\.csv: line 1: header/);
  });
});
