import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { importedSamples } from './csv-import.ts';
import { CsvImportError, MAX_PROBLEMS, readPlainCsv } from './plain-csv.ts';

function problemsOf(text: string): string[] {
  try {
    importedSamples(text, 'bench.csv');
  } catch (error) {
    if (error instanceof CsvImportError)
      return error.problems.map((p) => `${p.line}${p.column ? `:${p.column}` : ''} ${p.message}`);
    throw error;
  }
  return [];
}

const fixture = new URL('../../test/fixtures/sweep-sensor-osc.csv', import.meta.url);

describe('readPlainCsv (CONTRACTS.md plain CSV input), the one reader for users’ files', () => {
  it('reads columns by name in any order, skipping comments and blank lines, keeping each row’s line', () => {
    const t = readPlainCsv('# bench notes\nFrequency_Hz, control_v ,extra\n1000,0.5,x\n\n2000,1.0,"a,b"\r\n', 'a.csv');
    expect(t.names).toEqual(['frequency_hz', 'control_v', 'extra']);
    expect(Array.from(t.numeric.control_v ?? [])).toEqual([0.5, 1]);
    expect(t.numeric.extra).toBeUndefined(); // extra columns are ignored
    expect(Array.from(t.lineOf)).toEqual([3, 5]);
    expect(t.headerLine).toBe(2);
  });

  it('takes semicolons and tabs when the header has no comma, and NaN/inf in any case', () => {
    for (const sep of [';', '\t']) {
      const t = readPlainCsv(`control_v${sep}frequency_hz\n0.5${sep}nan\n0.6${sep}1.5e3\n0.7${sep}-INF\n`, 'b.csv');
      expect(Array.from(t.numeric.frequency_hz ?? [])).toEqual([Number.NaN, 1500, Number.NEGATIVE_INFINITY]);
    }
  });

  it('imports the project’s own fixture, comment line and all (it was refused before)', () => {
    const data = importedSamples(readFileSync(fixture, 'utf8'), 'sweep-sensor-osc.csv');
    expect(data.kind).toBe('sweep');
    expect(data.columns).toEqual(['control_v', 'frequency_hz', 'direction', 'status']);
    expect(data.rows[1]).toEqual([0, Number.NaN, 'up', 'no-signal']); // 9.91E37: no oscillation
  });

  it('imports a pushing CSV as pushing, keeping supply_v', () => {
    const data = importedSamples('control_v,supply_v,frequency_hz\n2,4.5,10e6\n2,5,10.01e6\n2,5.5,10.02e6\n', 'p.csv');
    expect(data.kind).toBe('pushing');
    expect(data.columns).toEqual(['control_v', 'supply_v', 'frequency_hz', 'status']);
    expect(data.rows[2]).toEqual([2, 5.5, 10.02e6, 'ok']);
  });

  it('keeps the status words the file gives; empty, NaN, 0 and 9.91E37 frequencies are no-signal', () => {
    const data = importedSamples(
      'frequency_hz,comment,control_v,status\r\n,stalled,0.2,\nNaN,,0.3,ok\n0,,0.4,OK\n9.91E37,,0.5,\n1.5e6,,0.6,timeout\n1.52e6,x,0.6,ok',
      'a.csv',
    );
    expect(data.columns).toEqual(['control_v', 'frequency_hz', 'status']);
    expect(data.rows.map((r) => r[2])).toEqual(['no-signal', 'no-signal', 'no-signal', 'no-signal', 'timeout', 'ok']);
  });

  it('names the line and column of every problem, all at once', () => {
    expect(problemsOf('')).toEqual(['1 no header row (expected column names such as control_v,frequency_hz)']);
    expect(problemsOf('control_v,frequency_hz\n')).toEqual(['2 no data rows after the header']);
    expect(problemsOf('control_v,frequency_hz\n0.5,1e6\n0.6\n0.7,1.2 MHz\n0.8,1e6,\n0.9,"1e6\n')).toEqual([
      '3 1 fields, but the header has 2',
      '4:frequency_hz "1.2 MHz" is not a number',
      '5 3 fields, but the header has 2',
      '6 a quoted field is not closed',
    ]);
    expect(problemsOf('control_v,frequency_hz,status\n0.5,1e6,fine\n0.6,1e6,ok\n0.7,1e6,sideways\n')).toEqual([
      '2:status "fine" is not one of ok, no-signal, timeout or error',
      '4:status "sideways" is not one of ok, no-signal, timeout or error',
    ]);
    expect(problemsOf('v,f\n1,2\n')[0]).toMatch(/^1 missing column "frequency_hz"; header has: v, f/);
    expect(problemsOf('control_v,frequency_hz\n,1e6\n')).toEqual([
      '2 column control_v: a sweep reading needs a control voltage',
    ]);
    expect(problemsOf('a,a\n1,2\n')).toEqual(['1 the header names column "a" twice']);
    const many = `control_v,frequency_hz\n${'x,1\n'.repeat(50)}`;
    expect(problemsOf(many)).toHaveLength(MAX_PROBLEMS + 1);
    expect(() => importedSamples('a,b\n1,2\n', 'lab/old.csv')).toThrow(/^lab\/old\.csv: line 1: missing column/);
  });
});

/** Any double but NaN, written as String() writes it (so no -0, which String() prints as "0"). */
const number = (fc: typeof import('fast-check')) => fc.double({ noNaN: true }).map((x) => (x === 0 ? 0 : x));

describe('readPlainCsv fast and full paths', () => {
  it('give the same table for the same numbers whatever the delimiter (commas take the fast path)', async () => {
    const fc = await import('fast-check');
    fc.assert(
      fc.property(
        fc.array(fc.tuple(number(fc), number(fc), fc.constantFrom('ok', 'no-signal', 'Timeout', '')), {
          minLength: 1,
          maxLength: 40,
        }),
        (rows) => {
          const text = (sep: string) =>
            `control_v${sep}frequency_hz${sep}status\n${rows.map((r) => r.map(String).join(sep)).join('\n')}\n`;
          const comma = readPlainCsv(text(','), 'a.csv');
          const tab = readPlainCsv(text('\t'), 'b.csv');
          expect(Array.from(comma.numeric.control_v ?? [])).toEqual(rows.map((r) => r[0]));
          expect(Array.from(comma.numeric.frequency_hz ?? [])).toEqual(Array.from(tab.numeric.frequency_hz ?? []));
          expect(comma.text.status).toEqual(tab.text.status);
          expect(Array.from(comma.lineOf)).toEqual(Array.from(tab.lineOf));
        },
      ),
      { numRuns: 100 },
    );
  });
});
