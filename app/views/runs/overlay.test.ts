import { describe, expect, it } from 'vitest';
import { appendRows, createColumnSet } from '../../state/columns.ts';
import { overlayColumns } from './overlay.ts';

describe('overlay of sweeps', () => {
  it('merges runs on one ascending setpoint column with a series each', () => {
    const a = createColumnSet();
    appendRows(a, [
      { control_v: 1, frequency_hz: 10, status: 'ok' },
      { control_v: 2, frequency_hz: 20, status: 'ok' },
    ]);
    const b = createColumnSet();
    appendRows(b, [
      { control_v: 0.5, frequency_hz: '', status: 'no-signal' },
      { control_v: 1.5, frequency_hz: 16, status: 'ok' },
    ]);
    const merged = overlayColumns([
      { columns: a, rows: 2 },
      { columns: b, rows: 2 },
    ]);
    expect(merged.x).toEqual([1, 1.5, 2]);
    expect(merged.ys).toEqual([
      [10, null, 20],
      [null, 16, null],
    ]);
  });
});
