import { describe, expect, it } from 'vitest';
import type { BenchApi, RunDetail } from '../contract/bench-api.ts';
import type { RunPreview } from '../contract/run-preview.ts';
import { createRunsStore } from './runs-store.ts';
import { driftRunMeta } from '../contract/testing/run-meta-fixture.ts';

const meta = driftRunMeta('big');

const shown: RunPreview = {
  meta,
  events: [],
  rowCount: 3,
  preview: {
    x: 'time_s',
    columns: 1,
    xFrom: 0,
    xTo: 2,
    rows: [3],
    xFirst: [0],
    xLast: [2],
    series: { frequency_hz: { first: [1], min: [1], max: [3], last: [3], mean: [2], count: [3] } },
  },
};

const detail: RunDetail = {
  meta,
  events: [],
  samples: {
    names: ['time_s', 'frequency_hz'],
    numeric: { time_s: Float64Array.from([0, 1, 2]), frequency_hz: Float64Array.from([1, 2, 3]) },
    text: {},
    rowCount: 3,
  },
};

function deferred<T>(): { promise: Promise<T>; resolve: (value: T) => void; reject: (error: unknown) => void } {
  let resolve!: (value: T) => void;
  let reject!: (error: unknown) => void;
  const promise = new Promise<T>((ok, fail) => {
    resolve = ok;
    reject = fail;
  });
  return { promise, resolve, reject };
}

function bench(parts: Partial<BenchApi>): BenchApi {
  return parts as BenchApi;
}

describe('opening a big run: preview first, then the full columns', () => {
  it('shows the preview, waits for it to be painted, then asks for and swaps in the full columns', async () => {
    const calls: string[] = [];
    const full = deferred<RunDetail>();
    const painted = deferred<void>();
    const runs = createRunsStore(
      bench({
        previewRun: async (id, columns) => {
          calls.push(`previewRun ${id} ${columns}`);
          return shown;
        },
        openRun: (id) => {
          calls.push(`openRun ${id}`);
          return full.promise;
        },
      }),
      { previewColumns: () => 1234, afterPaint: () => painted.promise },
    );
    const opening = runs.getState().open('big');
    await new Promise((r) => setTimeout(r, 0));
    expect(runs.getState().previews.big).toBe(shown);
    expect(runs.getState().opened.big).toBeUndefined();
    // Not before the preview has been painted: the full reply's work must not delay the first frame.
    expect(calls).toEqual(['previewRun big 1234']);
    painted.resolve();
    await new Promise((r) => setTimeout(r, 0));
    expect(calls).toEqual(['previewRun big 1234', 'openRun big']);
    full.resolve(detail);
    const opened = await opening;
    expect(opened?.rows).toBe(3);
    expect(runs.getState().opened.big?.columns.frequency_hz.at(2)).toBe(3);
    expect(runs.getState().previews.big).toBeUndefined();
  });

  it('opens the full run when there is no preview (a small run) or the preview call fails', async () => {
    for (const previewRun of [async () => ({ ...shown, preview: null }), async () => Promise.reject(new Error('x'))]) {
      const runs = createRunsStore(bench({ previewRun, openRun: async () => detail }), {
        afterPaint: () => new Promise(() => undefined), // would hang if waited for
      });
      expect((await runs.getState().open('big'))?.rows).toBe(3);
      expect(runs.getState().previews).toEqual({});
    }
  });

  it('drops the preview and says why when the full columns cannot be read', async () => {
    const runs = createRunsStore(
      bench({ previewRun: async () => shown, openRun: async () => Promise.reject(new Error('samples.csv: EIO')) }),
      { afterPaint: async () => undefined },
    );
    expect(await runs.getState().open('big')).toBeNull();
    expect(runs.getState().previews).toEqual({});
    expect(runs.getState().error).toMatch(/EIO/);
  });

  it('keeps a finished drift log in main when the carrier can show it from there: no openRun, no columns', async () => {
    const calls: string[] = [];
    const runs = createRunsStore(
      bench({
        previewRun: async (id) => {
          calls.push(`previewRun ${id}`);
          return { ...shown, rowCount: 1_000_000 };
        },
        openRun: async (id) => {
          calls.push(`openRun ${id}`);
          return detail;
        },
        windowRun: async () => Promise.reject(new Error('not asked by the store')),
        analyzeRun: async () => Promise.reject(new Error('not asked by the store')),
        runCsvPart: async () => Promise.reject(new Error('not asked by the store')),
      }),
      { afterPaint: async () => undefined },
    );
    const opened = await runs.getState().open('big');
    expect(calls).toEqual(['previewRun big']);
    expect(opened?.held).toEqual({ rowCount: 1_000_000, preview: shown.preview });
    expect(opened?.rows).toBe(0);
    expect(opened?.columns.time_s.length).toBe(0);
    expect(runs.getState().previews).toEqual({});
  });
});
