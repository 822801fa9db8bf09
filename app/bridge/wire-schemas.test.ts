import { describe, expect, it } from 'vitest';
import { firstIssue, runDetailSchema } from './wire-schemas.ts';

const meta = {
  schema: 'tunebench.run/1',
  id: 'r1',
  kind: 'drift',
  status: 'complete',
  startedAt: '2026-12-01T22:00:00Z',
  endedAt: '2026-12-02T06:00:00Z',
  dut: { id: 'sensor-osc-3', notes: '' },
  instruments: [],
  plan: {},
  software: { version: '0.1.0' },
};

describe('run detail from the wire', () => {
  it('turns null cells (NaN does not survive JSON) back into NaN', () => {
    const detail = runDetailSchema.parse({ meta, samples: { names: ['time_s', 'frequency_hz', 'status'], numeric: { time_s: [0, 1], frequency_hz: [1e6, null] }, text: { status: ['ok', 'no-signal'] } }, events: [] });
    expect(detail.samples.numeric.frequency_hz?.[0]).toBe(1e6);
    expect(detail.samples.numeric.frequency_hz?.[1]).toBeNaN();
  });

  it('names the column and the row of a bad cell', () => {
    const result = runDetailSchema.safeParse({ meta, samples: { names: [], numeric: { frequency_hz: [1, 'x'] }, text: {} }, events: [] });
    expect(result.success).toBe(false);
    if (result.success) return;
    const issue = firstIssue(result.error);
    expect(issue.field).toBe('samples.numeric.frequency_hz');
    expect(issue.message).toMatch(/row 1/);
  });

  it('names a missing metadata field', () => {
    const { id: _id, ...noId } = meta;
    const result = runDetailSchema.safeParse({ meta: noId, samples: { names: [], numeric: {}, text: {} }, events: [] });
    expect(result.success || firstIssue(result.error).field).toBe('meta.id');
  });
});
