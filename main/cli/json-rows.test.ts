import { describe, expect, it } from 'vitest';
import { LocalKvcoColumns, SweepPointColumns } from '../../app/analysis/sweep-columns.ts';
import { writeJsonNumbers, writeJsonRows } from './json-rows.ts';

/** What a writer hands on, joined, and in how many pieces. */
function written(write: (put: (text: string) => void) => void): { text: string; pieces: number } {
  const pieces: string[] = [];
  write((text) => pieces.push(text));
  return { text: pieces.join(''), pieces: pieces.length };
}

/** JSON.stringify's text of a value nested `depth` objects deep, cut back to the value itself. */
function nestedText(value: unknown, depth: number): string {
  let wrapped = value;
  for (let d = 0; d < depth; d++) wrapped = { k: wrapped };
  const text = JSON.stringify(wrapped, null, 2);
  const head = Array.from({ length: depth }, (_, d) => `{\n${'  '.repeat(d + 1)}"k": `).join('');
  const tail = Array.from({ length: depth }, (_, d) => `\n${'  '.repeat(depth - 1 - d)}}`).join('');
  expect(text.startsWith(head) && text.endsWith(tail)).toBe(true);
  return text.slice(head.length, text.length - tail.length);
}

// Values JSON writes in every way it can: NaN and infinities as null, -0 as 0, exponents, subnormals.
const ODD = [Number.NaN, -0, 1e21, 1e-7, 5e-324, -Infinity, 123456789.12345679, 0.1, 1e300, -2.5e-5];

function pointColumns(count: number): SweepPointColumns {
  const points = new SweepPointColumns(count);
  for (let i = 0; i < count; i++) {
    points.v[i] = 0.5 + i * 4e-6;
    points.meanHz[i] = i % 17 === 0 ? (ODD[i % ODD.length] as number) : 9000 + Math.sin(i) * 4000;
    points.sdHz[i] = i % 3 === 0 ? Number.NaN : Math.abs(Math.cos(i));
    points.readings[i] = (i % 5) + 1;
    points.noOscillation[i] = i % 7 === 0 ? 1 : 0;
    points.unstable[i] = i % 11 === 0 ? 1 : 0;
    points.unsettled[i] = i % 13 === 0 ? 1 : 0;
    points.edgeZone[i] = i % 19 === 0 ? 1 : 0;
    points.fitted[i] = i % 23 === 0 ? 0 : 1;
    points.fitHz[i] = 9000.000000000002 + i;
  }
  return points;
}

function localColumns(count: number): LocalKvcoColumns {
  const local = new LocalKvcoColumns(count + 10);
  local.count = count;
  for (let i = 0; i < count; i++) {
    local.v[i] = 0.5 + i * 4e-6;
    local.hzPerV[i] = 40000 + Math.sin(i) * 10000;
    local.fdHzPerV[i] = i % 2 === 0 ? (local.hzPerV[i] as number) : -0; // equal to the one before: copied
    local.uncertaintyHzPerV[i] = i % 29 === 0 ? (ODD[i % ODD.length] as number) : 0;
    local.fromFit[i] = i % 3 === 0 ? 1 : 0;
    local.unstable[i] = i % 5 === 0 ? 1 : 0;
    local.fitDisagrees[i] = i % 7 === 0 ? 1 : 0;
    local.flatWithinUncertainty[i] = i % 31 === 0 ? 1 : 0; // left out where 0
  }
  return local;
}

describe('writeJsonRows: columns as the rows JSON.stringify(rows, null, 2) writes', () => {
  it('points and local Kvco with NaN, -0, null, left-out keys and exponents, at depths 0–3, across 64 KiB pieces', () => {
    for (const columns of [pointColumns(3000), localColumns(3000), pointColumns(1), localColumns(1)]) {
      const rows = columns.rows();
      for (const depth of [0, 1, 2, 3]) {
        const indent = '  '.repeat(depth);
        const { text, pieces } = written((put) => writeJsonRows(columns, indent, put));
        expect(text).toBe(nestedText(rows, depth));
        if (columns.count > 1000) expect(pieces).toBeGreaterThan(3);
      }
    }
  });

  it('no rows: []', () => {
    expect(written((put) => writeJsonRows(new SweepPointColumns(0), '    ', put)).text).toBe('[]');
    expect(written((put) => writeJsonRows(new LocalKvcoColumns(4), '', put)).text).toBe('[]');
  });
});

describe('writeJsonNumbers: an array of numbers as JSON.stringify writes it', () => {
  it('odd values and 20,000 ordinary ones, nested', () => {
    const values = [...ODD, ...Array.from({ length: 20_000 }, (_, i) => 0.5 + i * 4e-6 + (i % 2) * 1e-17)];
    for (const depth of [0, 2]) {
      const text = written((put) => writeJsonNumbers(values, '  '.repeat(depth), put)).text;
      expect(text).toBe(nestedText(values, depth));
    }
    expect(written((put) => writeJsonNumbers([], '', put)).text).toBe('[]');
  });
});
