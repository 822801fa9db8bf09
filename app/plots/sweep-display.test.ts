import { describe, expect, it } from 'vitest';
import { appendRows, createColumnSet } from '../state/columns.ts';
import { buildSweepDisplay, liveStallEstimateV } from './sweep-display.ts';

describe('sweep display', () => {
  it('orders rows by setpoint and splits up and down passes, hiding dead readings', () => {
    const set = createColumnSet();
    appendRows(set, [
      { control_v: 0.5, frequency_hz: '', status: 'no-signal', direction: 'up' },
      { control_v: 1.0, frequency_hz: 1e6, status: 'ok', direction: 'up' },
      { control_v: 1.5, frequency_hz: 2e6, status: 'ok', direction: 'up' },
      { control_v: 1.0, frequency_hz: 1.01e6, status: 'ok', direction: 'down' },
      { control_v: 0.75, frequency_hz: 0.5e6, status: 'ok', direction: 'up' }, // refinement point, arrives last
    ]);
    const shown = buildSweepDisplay(set, 5);
    expect(shown.x).toEqual([0.5, 0.75, 1.0, 1.0, 1.5]);
    expect(shown.up).toEqual([null, 0.5e6, 1e6, null, 2e6]);
    expect(shown.down).toEqual([null, null, null, 1.01e6, null]);
    expect(shown.deadX).toEqual([0.5]);
    expect(liveStallEstimateV(set, 5)).toBeCloseTo(0.625, 12);
  });

  it('gives no stall estimate when everything oscillates', () => {
    const set = createColumnSet();
    appendRows(set, [{ control_v: 1, frequency_hz: 5, status: 'ok' }]);
    expect(liveStallEstimateV(set, 1)).toBeNull();
  });
});
