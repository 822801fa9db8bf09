import { describe, expect, it } from 'vitest';
import type { RunDetail } from '../contract/bench-api.ts';
import { pixelPreviewSchema } from '../contract/run-preview.ts';
import { PREVIEW_MIN_ROWS, pixelPreview, runPreviewOf } from './pixel-preview.ts';

const xs = (n: number): Float64Array => Float64Array.from({ length: n }, (_, i) => i);

describe('pixel preview reducer (first/min/max/last/mean/count per pixel column)', () => {
  it('reduces known data to the right slices', () => {
    // x 0…9 over 5 slices of width 1.8: rows {0,1} {2,3} {4,5} {6,7} {8,9} (the last x closes the last slice).
    const y = Float64Array.from([5, 3, 8, 1, 9, 2, 7, 4, 6, 0]);
    const p = pixelPreview({
      x: { name: 'time_s', values: xs(10) },
      series: [{ name: 'f', values: y }],
      n: 10,
      columns: 5,
    });
    expect(p.columns).toBe(5);
    expect([p.xFrom, p.xTo]).toEqual([0, 9]);
    expect(p.rows).toEqual([2, 2, 2, 2, 2]);
    expect(p.xFirst).toEqual([0, 2, 4, 6, 8]);
    expect(p.xLast).toEqual([1, 3, 5, 7, 9]);
    const f = p.series.f!;
    expect(f.first).toEqual([5, 8, 9, 7, 6]);
    expect(f.min).toEqual([3, 1, 2, 4, 0]);
    expect(f.max).toEqual([5, 8, 9, 7, 6]);
    expect(f.last).toEqual([3, 1, 2, 4, 0]);
    expect(f.mean).toEqual([4, 4.5, 5.5, 5.5, 3]);
    expect(f.count).toEqual([2, 2, 2, 2, 2]);
    expect(pixelPreviewSchema.safeParse(p).success).toBe(true);
  });

  it('keeps every reading inside its slice band, and the whole range is the band of all slices', () => {
    const n = 100_003;
    const y = Float64Array.from({ length: n }, (_, i) => Math.sin(i / 977) * 1e3 + ((i * 7919) % 13));
    const p = pixelPreview({ x: { name: 't', values: xs(n) }, series: [{ name: 'y', values: y }], n, columns: 1920 });
    expect(p.columns).toBe(1920);
    expect(p.rows.reduce((a, b) => a + b, 0)).toBe(n);
    const s = p.series.y!;
    expect(Math.min(...(s.min as number[]))).toBe(Math.min(...y));
    expect(Math.max(...(s.max as number[]))).toBe(Math.max(...y));
    // Row i's slice: the rows are counted in order, so the slice holding row i is found by the running count.
    let row = 0;
    for (let c = 0; c < p.columns; c += 1) {
      const rows = p.rows[c]!;
      const slice = y.subarray(row, row + rows);
      expect(s.first[c]).toBe(slice[0]);
      expect(s.last[c]).toBe(slice[rows - 1]);
      expect(s.min[c]).toBe(Math.min(...slice));
      expect(s.max[c]).toBe(Math.max(...slice));
      row += rows;
    }
  });

  it('gives one slice per reading when there are fewer readings than columns', () => {
    const p = pixelPreview({
      x: { name: 't', values: Float64Array.from([0, 1, 2]) },
      series: [{ name: 'y', values: Float64Array.from([1, 2, 3]) }],
      n: 3,
      columns: 2000,
    });
    expect(p.columns).toBe(3);
    expect(p.rows).toEqual([1, 1, 1]);
    expect(p.series.y!.mean).toEqual([1, 2, 3]);
  });

  it('makes one slice of a single reading', () => {
    const p = pixelPreview({
      x: { name: 't', values: Float64Array.from([42]) },
      series: [{ name: 'y', values: Float64Array.from([7.5]) }],
      n: 1,
      columns: 2000,
    });
    expect(p.columns).toBe(1);
    expect([p.xFrom, p.xTo]).toEqual([42, 42]);
    const s = p.series.y!;
    expect([s.first[0], s.min[0], s.max[0], s.last[0], s.mean[0], s.count[0]]).toEqual([7.5, 7.5, 7.5, 7.5, 7.5, 1]);
  });

  it('makes no slice of no reading', () => {
    const p = pixelPreview({ x: { name: 't', values: new Float64Array(0) }, series: [], n: 0, columns: 100 });
    expect(p).toMatchObject({ columns: 0, xFrom: null, xTo: null, rows: [] });
    expect(pixelPreviewSchema.safeParse(p).success).toBe(true);
  });

  it('counts NaN values and no-signal rows as no value: a slice of only those is null, its rows still counted', () => {
    const y = Float64Array.from([1, Number.NaN, 3, 4, 100, 200, 5, 6]);
    const noSignal = new Set([4, 5]); // a loss of signal: the counter's last value must not widen the band
    const p = pixelPreview({
      x: { name: 't', values: xs(8) },
      series: [{ name: 'y', values: y }],
      n: 8,
      columns: 4,
      rowOk: (row) => !noSignal.has(row),
    });
    const s = p.series.y!;
    expect(p.rows).toEqual([2, 2, 2, 2]);
    expect(s.count).toEqual([1, 2, 0, 2]);
    expect([s.min[0], s.max[0], s.first[0], s.last[0]]).toEqual([1, 1, 1, 1]);
    expect([s.first[2], s.min[2], s.max[2], s.last[2], s.mean[2]]).toEqual([null, null, null, null, null]);
    expect(Math.max(...s.max.filter((v): v is number => v !== null))).toBe(6);
    expect(pixelPreviewSchema.safeParse(p).success).toBe(true);
  });

  it('puts readings into slices by time, so a pause leaves empty slices rather than squeezing time', () => {
    const x = Float64Array.from([0, 1, 2, 3, 4, 95, 96, 97, 98, 99]);
    const y = xs(10);
    const p = pixelPreview({ x: { name: 't', values: x }, series: [{ name: 'y', values: y }], n: 10, columns: 10 });
    expect(p.rows).toEqual([5, 0, 0, 0, 0, 0, 0, 0, 0, 5]);
    expect(p.series.y!.mean[5]).toBeNull();
  });
});

describe('runPreviewOf (what previewRun answers)', () => {
  const detail = (rows: number, kind: 'drift' | 'sweep'): RunDetail => {
    const status = new Uint8Array(rows);
    status[1] = 1; // "no-signal"
    return {
      meta: { kind, id: 'r1' } as RunDetail['meta'],
      events: [],
      samples: {
        names: ['time_s', 'frequency_hz', 'temperature_c', 'status'],
        numeric: {
          time_s: xs(rows),
          frequency_hz: Float64Array.from({ length: rows }, (_, i) => (i === 1 ? 9e9 : 400e6 + (i % 5))),
          temperature_c: new Float64Array(rows).fill(23.5),
        },
        text: { status: { levels: ['ok', 'no-signal'], codes: status } },
        rowCount: rows,
      },
    };
  };

  it('previews a big drift run, leaving out rows whose status is not ok', () => {
    const shown = runPreviewOf(detail(PREVIEW_MIN_ROWS * 2, 'drift'), 500);
    expect(shown.rowCount).toBe(PREVIEW_MIN_ROWS * 2);
    const p = shown.preview!;
    expect(Object.keys(p.series)).toEqual(['frequency_hz', 'temperature_c']);
    expect(p.series.frequency_hz!.max[0]).toBe(400e6 + 4); // not the 9 GHz of the no-signal row
    expect(p.series.temperature_c!.count[0]).toBe(p.rows[0]! - 1);
  });

  it('sends no preview for a small run or a run that is not a drift log', () => {
    expect(runPreviewOf(detail(PREVIEW_MIN_ROWS - 1, 'drift'), 500).preview).toBeNull();
    expect(runPreviewOf(detail(PREVIEW_MIN_ROWS * 2, 'sweep'), 500).preview).toBeNull();
  });
});
