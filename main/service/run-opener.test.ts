import { describe, expect, it } from 'vitest';
import type { RunDetail } from '../../app/contract/bench-api.ts';
import { PREVIEW_MIN_ROWS } from '../../app/analysis/pixel-preview.ts';
import { createRunOpener } from './run-opener.ts';

function driftDetail(id: string, status: 'complete' | 'running', rows = PREVIEW_MIN_ROWS): RunDetail {
  return {
    meta: { id, kind: 'drift', status } as RunDetail['meta'],
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
      return driftDetail(id, 'complete');
    });
    const shown = await opener.preview('a', 400);
    expect(shown.preview?.columns).toBe(400);
    expect(shown.rowCount).toBe(PREVIEW_MIN_ROWS);
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
