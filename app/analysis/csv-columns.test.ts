import { describe, expect, it } from 'vitest';
import type { ColumnTable } from '../contract/column-table.ts';
import { analyzeTableColumns } from './analyze-table.ts';
import {
  CsvError,
  detectCsvKind,
  driftInputFromTable,
  pushingInputFromTable,
  sweepInputFromTable,
} from './csv-columns.ts';

function errorOf(fn: () => unknown): CsvError {
  try {
    fn();
  } catch (e) {
    if (e instanceof CsvError) return e;
    throw e;
  }
  throw new Error('expected a CsvError');
}

/** A table as a reader gives it: numbers as Float64Array, words dictionary-coded; `lines` as from a user's file. */
function table(columns: Record<string, (number | string)[]>, lines?: number[]): ColumnTable {
  const names = Object.keys(columns);
  const numeric: Record<string, Float64Array> = {};
  const text: ColumnTable['text'] = {};
  let rowCount = 0;
  for (const name of names) {
    const values = columns[name] ?? [];
    rowCount = values.length;
    if (values.every((v) => typeof v === 'number')) numeric[name] = Float64Array.from(values);
    else {
      const levels = [...new Set(values.map(String))];
      (text as Record<string, unknown>)[name] = {
        levels,
        codes: Uint8Array.from(values.map((v) => levels.indexOf(String(v)))),
      };
    }
  }
  return lines
    ? { names, numeric, text, rowCount, lineOf: Uint32Array.from(lines), headerLine: 1 }
    : { names, numeric, text, rowCount };
}

describe('table → analysis inputs', () => {
  it('detects the kind', () => {
    expect(detectCsvKind(table({ control_v: [1, 2], frequency_hz: [10, 20] }))).toBe('sweep');
    expect(detectCsvKind(table({ time_s: [0, 1], control_v: [1, 1], frequency_hz: [10, 11] }))).toBe('drift');
    expect(
      detectCsvKind(
        table({ time_s: [0, 1], control_v: [1, 1], supply_v: [4.5, 5], frequency_hz: [10, 11], status: ['ok', 'ok'] }),
      ),
    ).toBe('pushing');
    expect(errorOf(() => detectCsvKind(table({ v: [1], f: [2] }))).message).toMatch(/frequency_hz/);
  });

  it('applies the status and direction rules: no-signal is no oscillation, timeout/error rows are dropped', () => {
    const t = table({
      time_s: [0, 1, 2],
      control_v: [1, 2, 3],
      frequency_hz: [100, 200, 0],
      direction: ['up', 'down', 'up'],
      status: ['ok', 'timeout', 'no-signal'],
    });
    const s = sweepInputFromTable(t, 0.1);
    expect(Array.from(s.direction ?? [])).toEqual([1, -1, 1]);
    expect(Array.from(s.frequencyHz)).toEqual([100, Number.NaN, Number.NaN]);
    // A timeout says nothing about oscillation: the row is dropped (no voltage), not counted as stalled.
    expect(Array.from(s.controlV)).toEqual([1, Number.NaN, 3]);
    expect(s.gateS).toBe(0.1);
    // The table's own columns are left as they were (inputs are copies).
    expect(Array.from(t.numeric.frequency_hz ?? [])).toEqual([100, 200, 0]);
    expect(Array.from(t.numeric.control_v ?? [])).toEqual([1, 2, 3]);
  });

  it('without a status column the sweep input views the table’s columns (no copy), and analysing it changes none', () => {
    const controlV = Array.from({ length: 400 }, (_, i) => 0.5 + Math.floor(i / 2) * 0.01);
    const frequencyHz = controlV.map((v, i) => (v < 0.6 ? 0 : 8000 + 2000 * v + Math.sin(i) * 0.5));
    const t = table({ control_v: controlV, frequency_hz: frequencyHz });
    const s = sweepInputFromTable(t);
    expect(s.controlV.buffer).toBe(t.numeric.control_v?.buffer);
    expect(s.frequencyHz.buffer).toBe(t.numeric.frequency_hz?.buffer);
    const result = analyzeTableColumns('sweep', t, {});
    expect(result.kind === 'sweep' && result.points.count).toBe(200);
    expect(Array.from(t.numeric.control_v ?? [])).toEqual(controlV);
    expect(Array.from(t.numeric.frequency_hz ?? [])).toEqual(frequencyHz);
  });

  it('names the line of a bad word in a user file, and the row in a run folder', () => {
    expect(
      errorOf(() =>
        sweepInputFromTable(table({ control_v: [1, 2], frequency_hz: [2, 3], status: ['ok', 'fine'] }, [4, 7])),
      ).message,
    ).toBe('line 7: column status: "fine" is not one of ok, no-signal, timeout, error');
    expect(
      errorOf(() => sweepInputFromTable(table({ control_v: [1], frequency_hz: [2], direction: ['sideways'] }))).message,
    ).toBe('row 1: column direction: "sideways" is not up or down');
    // Our own file with a word we do not know: the reading says nothing, like an error.
    const own = sweepInputFromTable(table({ control_v: [1, 2], frequency_hz: [2, 3], status: ['ok', 'garbled'] }));
    expect(Array.from(own.controlV)).toEqual([1, Number.NaN]);
  });

  it('builds drift and pushing inputs; time going backwards is refused at its line', () => {
    const d = driftInputFromTable(table({ time_s: [0, 1], frequency_hz: [10, 11], temperature_c: [25, 25.5] }));
    expect(Array.from(d.temperatureC ?? [])).toEqual([25, 25.5]);
    expect(errorOf(() => driftInputFromTable(table({ time_s: [1, 0], frequency_hz: [10, 11] }, [2, 3]))).line).toBe(3);
    const p = pushingInputFromTable(table({ control_v: [2, 2], supply_v: [4.5, 5], frequency_hz: [10, 11] }));
    expect(p.controlV).toBe(2);
    expect(Array.from(p.supplyV)).toEqual([4.5, 5]);
  });
});
