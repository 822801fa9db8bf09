import { describe, expect, it } from 'vitest';
import { appendRows, createColumnSet } from '../../state/columns.ts';
import { differenceColumns, interpolate, pointMeans } from './difference.ts';

describe('difference against a reference sweep', () => {
  it('averages each setpoint, leaves out no-oscillation readings', () => {
    const set = createColumnSet();
    appendRows(set, [
      { control_v: 1, frequency_hz: 1_000, status: 'ok' },
      { control_v: 1, frequency_hz: 1_010, status: 'ok' },
      { control_v: 0.5, frequency_hz: '', status: 'no-signal' },
      { control_v: 2, frequency_hz: 2_000, status: 'ok' },
    ]);
    expect(pointMeans(set, 4)).toEqual({ v: [1, 2], hz: [1_005, 2_000] });
  });

  it('reads the reference between its setpoints by straight lines and never beyond them', () => {
    const ref = { v: [1, 2, 3], hz: [10_000, 20_000, 28_000] };
    expect(interpolate(ref, 2.5)).toBe(24_000);
    expect(interpolate(ref, 1)).toBe(10_000);
    expect(interpolate(ref, 3.1)).toBeNull();
  });

  it('a second unit 150 Hz above the reference at 1.5 V and 2 V, with its extra point at 3.5 V left out', () => {
    const ref = { v: [1, 2, 3], hz: [10_000, 20_000, 28_000] };
    const unit = { v: [1.5, 2, 3.5], hz: [15_150, 20_150, 31_000] };
    expect(differenceColumns(ref, [unit])).toEqual({ x: [1.5, 2, 3.5], ys: [[150, 150, null]] });
  });
});
