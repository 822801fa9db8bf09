import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyzeTable, analyzeTableColumns } from '../../app/analysis/analyze-table.ts';
import { sweepAnalysisRows } from '../../app/analysis/sweep-analysis.ts';
import { detectCsvKind } from '../../app/analysis/csv-columns.ts';
import { readPlainCsv } from '../store/plain-csv.ts';
import { writeJsonChunks } from './json-chunks.ts';

function chunked(value: unknown): { text: string; pieces: number } {
  const pieces: string[] = [];
  writeJsonChunks(value, (text) => pieces.push(text));
  return { text: pieces.join(''), pieces: pieces.length };
}

describe('writeJsonChunks', () => {
  it('writes exactly what JSON.stringify(value, null, 2) gives, edge values included', () => {
    const long = Array.from({ length: 200 }, (_, i) => ({
      v: i * 0.01,
      nan: Number.NaN,
      gone: undefined,
      nested: { list: [1, 2, { deep: 'a\nb "q"' }], empty: [], none: {} },
      when: new Date(Date.UTC(2026, 0, 2, 3, 4, 5)),
    }));
    const values: unknown[] = [
      { a: 1, b: [1, 2, 3], c: { d: null, e: undefined, f: () => 1, g: Infinity }, h: [] },
      long,
      { points: long, numbers: Array.from({ length: 100 }, (_, i) => (i % 7 === 0 ? undefined : i / 3)), s: 'x' },
      { custom: { toJSON: () => ({ replaced: [1, 2] }) }, hidden: { toJSON: () => undefined } },
      [],
      {},
      'text',
      42,
      null,
      Array.from({ length: 70 }, (_, i) => (i % 2 ? [i, [i]] : () => i)),
      Object.assign(Object.create(null) as object, { k: 1 }),
    ];
    for (const value of values) expect(chunked(value).text).toBe(JSON.stringify(value, null, 2));
    expect(chunked(undefined).text).toBe('');
  });

  it('gives the same text as before for a real sweep analysis, in several pieces', () => {
    const lines = ['control_v,frequency_hz'];
    for (let i = 0; i < 3000; i++) {
      const v = 0.5 + Math.floor(i / 10) * 0.01;
      lines.push(`${v.toFixed(2)},${(8000 + 2000 * v + Math.sin(i * 12.9898) * 0.5).toFixed(1)}`);
    }
    const table = readPlainCsv(`${lines.join('\n')}\n`, 'sweep.csv');
    const result = analyzeTable(detectCsvKind(table), table, {});
    const { text, pieces } = chunked(result);
    expect(text).toBe(JSON.stringify(result, null, 2));
    expect(pieces).toBeGreaterThan(1);
  });

  it('a drift analysis and the shipped sweep CSV: same text', () => {
    const lines = ['time_s,frequency_hz,temperature_c'];
    for (let i = 0; i < 5000; i++)
      lines.push(
        `${i},${(10e6 + 3 * Math.sin(i * 1e-3) + Math.sin(i * 12.9898) * 0.005).toFixed(3)},${(25 + Math.sin(i * 1e-3)).toFixed(2)}`,
      );
    const shipped = readFileSync(new URL('../../test/fixtures/sweep-sensor-osc.csv', import.meta.url), 'utf8');
    for (const text of [`${lines.join('\n')}\n`, shipped]) {
      const table = readPlainCsv(text, 'input.csv');
      const result = analyzeTable(detectCsvKind(table), table, {});
      expect(chunked(result).text).toBe(JSON.stringify(result, null, 2));
    }
  });

  it('columns (a sweep’s points and local Kvco) come out as their rows would, at any depth and across blocks', () => {
    const lines = ['control_v,frequency_hz'];
    // 1500 distinct voltages (more rows than one block), stalled below 0.6 V.
    for (let i = 0; i < 1500; i++) {
      const v = 0.5 + i * 0.002;
      lines.push(`${v.toFixed(3)},${v < 0.6 ? '' : (8000 + 2000 * v + Math.sin(i * 12.9898) * 0.5).toFixed(1)}`);
    }
    const table = readPlainCsv(`${lines.join('\n')}\n`, 'distinct.csv');
    const columns = analyzeTableColumns('sweep', table, {});
    if (columns.kind !== 'sweep') throw new Error('expected a sweep');
    const rows = sweepAnalysisRows(columns);
    expect(columns.points.count).toBe(1500);
    expect(columns.kvco.local.count).toBe(1450);
    const { text, pieces } = chunked({ ...columns, run: { id: 'x' } });
    expect(text).toBe(JSON.stringify({ ...rows, run: { id: 'x' } }, null, 2));
    expect(pieces).toBeGreaterThan(1);
    for (const value of [
      columns.points,
      { a: { b: { c: columns.kvco.local } } },
      [columns.points.count, columns.points],
    ])
      expect(chunked(value).text).toBe(JSON.stringify(value, null, 2)); // JSON.stringify goes through toJSON: the rows
  });
});
