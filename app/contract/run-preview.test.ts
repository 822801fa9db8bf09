import { describe, expect, it } from 'vitest';
import { parseCallParams } from './bench-api-schemas.ts';
import { MAX_PREVIEW_COLUMNS, pixelPreviewSchema, runPreviewSchema } from './run-preview.ts';
import { firstIssue } from './wire-schemas.ts';
import { driftRunMeta } from './testing/run-meta-fixture.ts';

const series = () => ({
  first: [1, null, 3],
  min: [1, null, 2],
  max: [1, null, 3],
  last: [1, null, 2],
  mean: [1, null, 2.5],
  count: [1, 0, 2],
});
const preview = () => ({
  x: 'time_s',
  columns: 3,
  xFrom: 0,
  xTo: 3,
  rows: [1, 1, 2],
  xFirst: [0, 1, 2],
  xLast: [0, 1, 3],
  series: { frequency_hz: series() },
});

function refusal(value: unknown): { field: string; message: string } {
  const result = pixelPreviewSchema.safeParse(value);
  if (result.success) throw new Error('expected the preview to be refused');
  return firstIssue(result.error);
}

describe('the pixel preview schema (previewRun replies, both carriers)', () => {
  it('passes a well-formed preview', () => {
    expect(pixelPreviewSchema.safeParse(preview()).success).toBe(true);
  });

  it('refuses a series array of the wrong length, naming the series and the field', () => {
    const bad = preview();
    bad.series.frequency_hz.min = [1, null];
    expect(refusal(bad)).toEqual({ field: 'series.frequency_hz.min', message: 'expected 3 slices (columns), got 2' });
  });

  it('refuses a slice whose lowest value is above its highest, or a value where the count says none', () => {
    const crossed = preview();
    crossed.series.frequency_hz.min = [1, null, 4];
    expect(refusal(crossed).field).toBe('series.frequency_hz.min.2');
    const phantom = preview();
    phantom.series.frequency_hz.count = [1, 0, 0];
    expect(refusal(phantom).field).toBe('series.frequency_hz.min.2');
  });

  it('refuses a missing or mistyped field by name', () => {
    const { rows: _rows, ...noRows } = preview();
    expect(refusal(noRows).field).toBe('rows');
    expect(refusal({ ...preview(), columns: 1.5 }).field).toBe('columns');
    expect(refusal({ ...preview(), columns: MAX_PREVIEW_COLUMNS + 1 }).field).toBe('columns');
    expect(refusal({ ...preview(), xFirst: [0, 'one', 2] }).field).toBe('xFirst.1');
  });

  it('takes a run without a preview (a small run) and refuses a reply without rowCount', () => {
    const meta = driftRunMeta();
    expect(runPreviewSchema.safeParse({ meta, events: [], rowCount: 10, preview: null }).success).toBe(true);
    const missing = runPreviewSchema.safeParse({ meta, events: [], preview: preview() });
    expect(missing.success ? null : firstIssue(missing.error).field).toBe('rowCount');
  });
});

describe('previewRun parameters (checked by the IPC gate and the WebSocket alike, call-guard.ts)', () => {
  it('accept a run id and a whole number of pixel columns', () => {
    expect(parseCallParams('previewRun', ['20261120-180000-vco', 1920])).toEqual({
      ok: true,
      args: ['20261120-180000-vco', 1920],
    });
  });

  it('refuse columns that are not a sensible pixel count, naming the field', () => {
    for (const columns of [0, 2.5, MAX_PREVIEW_COLUMNS + 1, '1920']) {
      expect(parseCallParams('previewRun', ['r1', columns])).toMatchObject({ ok: false, field: 'columns' });
    }
    expect(parseCallParams('previewRun', ['../r1', 100])).toMatchObject({ ok: false, field: 'id' });
  });
});
