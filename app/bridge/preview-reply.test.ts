import { describe, expect, it } from 'vitest';
import { checkResult } from './ws-inbound.ts';
import { driftRunMeta } from '../contract/testing/run-meta-fixture.ts';

describe('a previewRun reply over the WebSocket', () => {
  it('is refused when malformed, naming the field under result', () => {
    const checked = checkResult('previewRun', {
      ok: true,
      result: {
        meta: driftRunMeta(),
        events: [],
        rowCount: 2,
        preview: { x: 'time_s', columns: 2, xFrom: 0, xTo: 1, rows: [1], xFirst: [0, 1], xLast: [0, 1], series: {} },
      },
    });
    expect(checked.ok).toBe(false);
    if (checked.ok) return;
    expect(checked.error.field).toBe('result.preview.rows');
    expect(checked.error.message).toMatch(/expected 2 slices \(columns\), got 1/);
  });
});
