import { describe, expect, it } from 'vitest';
import type { RunDetail } from '../../app/contract/bench-api.ts';
import { PREVIEW_MIN_ROWS } from '../../app/analysis/pixel-preview.ts';
import { createRunOpener } from './run-opener.ts';

function driftDetail(
  id: string,
  status: 'complete' | 'running',
  rows = PREVIEW_MIN_ROWS,
  kind: 'drift' | 'sweep' = 'drift',
): RunDetail {
  return {
    meta: { id, kind, status, plan: { gateS: 0.1 } } as unknown as RunDetail['meta'],
    events: [],
    samples: {
      names: ['time_s', 'frequency_hz'],
      numeric: {
        time_s: Float64Array.from({ length: rows }, (_, i) => i),
        frequency_hz: Float64Array.from({ length: rows }, (_, i) => 1e6 + (i % 7)),
      },
      text: {},
      rowCount: rows,
    },
  };
}

describe('run opener (previewRun, then openRun)', () => {
  it('reads the store once for a preview and the openRun that follows it', async () => {
    const reads: string[] = [];
    const opener = createRunOpener(async (id) => {
      reads.push(id);
      return driftDetail(id, 'complete', 100, 'sweep');
    });
    const shown = await opener.preview('a', 400);
    expect(shown.preview).toBeNull();
    expect(shown.rowCount).toBe(100);
    await opener.open('a');
    expect(reads).toEqual(['a']);
    // Kept once only: a second open reads again.
    await opener.open('a');
    expect(reads).toEqual(['a', 'a']);
  });

  it('reads again after an edit of the run, for another run, and for a run still being written', async () => {
    const reads: string[] = [];
    const opener = createRunOpener(async (id) => {
      reads.push(id);
      return driftDetail(id, id === 'live' ? 'running' : 'complete');
    });
    await opener.preview('a', 100);
    opener.forget('a');
    await opener.open('a');
    await opener.preview('b', 100);
    await opener.open('c');
    await opener.preview('live', 100);
    await opener.open('live');
    expect(reads).toEqual(['a', 'a', 'b', 'c', 'live', 'live']);
  });
});

describe('a big drift log held in main (windowRun, analyzeRun, runCsvPart)', () => {
  it('answers every view of a 1,000,000-reading log from one read, each reply a bounded number of points', async () => {
    const rows = 1_000_000;
    const reads: string[] = [];
    const analysed: number[] = [];
    const opener = createRunOpener(
      async (id) => {
        reads.push(id);
        return driftDetail(id, 'complete', rows);
      },
      async (job) => {
        analysed.push(job.timeS.length);
        return { outcome: { ok: false, message: 'not run here' }, tempco: null, holdV: job.holdV };
      },
    );
    const shown = await opener.preview('big', 1280);
    expect(shown.preview?.columns).toBe(1280);
    const whole = await opener.window('big', { xMin: null, xMax: null, widthPx: 1280 });
    // Slices at least 4 px wide (the page's own rule for a log it held whole): 320 points, not a million.
    expect(whole.dense).toBe(true);
    expect(whole.x.length).toBe(320);
    expect(whole.rowCount).toBe(rows);
    expect(JSON.stringify(whole).length).toBeLessThan(40_000);
    const freq = whole.series.find((s) => s.name === 'frequency_hz');
    expect(freq?.lo[0]).toBe(1e6);
    expect(freq?.hi[0]).toBe(1e6 + 6);
    // Zoomed to 100 readings: the readings themselves (and one on each side, so the line reaches the edges).
    const zoomed = await opener.window('big', { xMin: 500_000, xMax: 500_099, widthPx: 1280 });
    expect(zoomed.dense).toBe(false);
    expect(zoomed.x).toEqual(Array.from({ length: 102 }, (_, i) => 499_999 + i));
    expect(zoomed.series[0]?.mid[1]).toBe(1e6 + (500_000 % 7));
    await Promise.all([opener.analysis('big'), opener.analysis('big')]);
    expect(analysed).toEqual([rows]);
    const part = await opener.csvPart('big', rows - 2, 250_000);
    expect(part).toEqual({
      text: `${rows - 2},${1e6 + ((rows - 2) % 7)},\r\n${rows - 1},${1e6 + ((rows - 1) % 7)},\r\n`,
      nextRow: rows,
      rowCount: rows,
    });
    expect(reads).toEqual(['big']);
    // Edited through the service: the next view reads the run again.
    opener.forget('big');
    await opener.window('big', { xMin: null, xMax: null, widthPx: 400 });
    expect(reads).toEqual(['big', 'big']);
  });

  it('refuses to hold a run that is not a drift log, naming the field', async () => {
    const opener = createRunOpener(async (id) => driftDetail(id, 'complete', 10, 'sweep'));
    await expect(opener.window('s', { xMin: null, xMax: null, widthPx: 100 })).rejects.toMatchObject({
      message: 'run s is a sweep run; only a drift log is held in main',
      field: 'id',
    });
  });
});
