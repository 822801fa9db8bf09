import { describe, expect, it } from 'vitest';
import { appendRows, createColumnSet } from '../state/columns.ts';
import { analyzeInBackground } from './analysis-client.ts';
import { driftJob, runJob, sweepJob } from './analysis-jobs.ts';

describe('analysis jobs', () => {
  it('packs a sweep with dead readings as NaN and directions as ±1, in copied buffers', () => {
    const set = createColumnSet();
    appendRows(set, [
      { control_v: 0.5, frequency_hz: 123, status: 'no-signal', direction: 'up' },
      { control_v: 1, frequency_hz: 1e6, status: 'ok', direction: 'down' },
    ]);
    const job = sweepJob(set, 2, 0.1);
    if (job.kind !== 'sweep') throw new Error('kind');
    expect(Number.isNaN(job.frequencyHz[0])).toBe(true);
    expect(Array.from(job.direction)).toEqual([1, -1]);
    expect(job.controlV.buffer).not.toBe(set.control_v.view().buffer); // a copy: the store's columns never leave the page
  });

  it('answers a straight-line sweep with its slope (exact data), in the page when there is no Worker', async () => {
    // A made-up varactor VCO: 380 MHz + 12 MHz/V over 0.5–4.5 V, no stall.
    const set = createColumnSet();
    const rows = [];
    for (let k = 0; k <= 40; k += 1) {
      const v = 0.5 + k * 0.1;
      for (let r = 0; r < 3; r += 1)
        rows.push({ control_v: v, frequency_hz: 380e6 + 12e6 * v, status: 'ok', direction: 'up' });
    }
    appendRows(set, rows);
    const result = await analyzeInBackground(sweepJob(set, rows.length, 0.1));
    expect(result.ok).toBe(true);
    if (!result.ok || result.analysis.kind !== 'sweep') return;
    expect(result.analysis.kvco.linear.slopeHzPerV).toBeCloseTo(12e6, -1);
    expect(result.analysis.stall.thresholdV).toBeNull();
  });

  it('turns analysis failures into a message', () => {
    const set = createColumnSet();
    appendRows(set, [{ time_s: 0, frequency_hz: 1, status: 'ok' }]);
    expect(runJob(driftJob(set, 1))).toEqual({ ok: false, message: 'fewer than 3 readings' });
  });
});
