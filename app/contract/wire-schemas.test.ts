import { describe, expect, it } from 'vitest';
import { runMetaFixture } from '../bridge/testing/run-meta-fixture.ts';
import { firstIssue, runDetailSchema } from './wire-schemas.ts';

const meta = runMetaFixture('sensor-osc-3');

describe('run detail from the wire', () => {
  it('turns null cells (NaN does not survive JSON) back into NaN', () => {
    const detail = runDetailSchema.parse({
      meta,
      samples: {
        names: ['time_s', 'frequency_hz', 'status'],
        numeric: { time_s: [0, 1], frequency_hz: [1e6, null] },
        text: { status: ['ok', 'no-signal'] },
      },
      events: [],
    });
    expect(detail.samples.numeric.frequency_hz?.[0]).toBe(1e6);
    expect(detail.samples.numeric.frequency_hz?.[1]).toBeNaN();
  });

  it('names the column and the row of a bad cell', () => {
    const result = runDetailSchema.safeParse({
      meta,
      samples: { names: [], numeric: { frequency_hz: [1, 'x'] }, text: {} },
      events: [],
    });
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

  it('takes Float64Array columns and coded text as they are, and checks every column against rowCount', () => {
    const frequencyHz = new Float64Array([1e6, Number.NaN]);
    const status = { levels: ['ok', 'no-signal'], codes: new Uint8Array([0, 1]) };
    const detail = runDetailSchema.parse({
      meta,
      samples: {
        names: ['frequency_hz', 'status'],
        numeric: { frequency_hz: frequencyHz },
        text: { status },
        rowCount: 2,
      },
      events: [],
    });
    expect(detail.samples.numeric.frequency_hz).toBe(frequencyHz); // the same array: no per-cell copy
    expect(detail.samples.text.status).toEqual(status);
    const short = runDetailSchema.safeParse({
      meta,
      samples: { names: [], numeric: { frequency_hz: frequencyHz }, text: {}, rowCount: 3 },
      events: [],
    });
    expect(short.success || firstIssue(short.error)).toMatchObject({
      field: 'samples.numeric.frequency_hz',
      message: 'expected 3 rows (rowCount), got 2',
    });
  });

  it('refuses a coded text column whose code has no level', () => {
    const status = { levels: ['ok'], codes: new Uint8Array([0, 1]) };
    const result = runDetailSchema.safeParse({
      meta,
      samples: { names: [], numeric: {}, text: { status }, rowCount: 2 },
      events: [],
    });
    expect(result.success || firstIssue(result.error)).toMatchObject({
      field: 'samples.text.status',
      message: 'codes: code 1 has no level (1 levels)',
    });
  });
});
