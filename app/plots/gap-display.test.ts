import { describe, expect, it } from 'vitest';
import { GrowableColumn, STATUS_CODE } from '../state/columns.ts';
import { createFrameGate } from './frame-gate.ts';
import { GapDisplay } from './gap-display.ts';

function columns(values: number[], statuses: number[]) {
  const v = new GrowableColumn(4);
  const s = new GrowableColumn(4);
  v.append(values);
  s.append(statuses);
  return { v, s };
}

describe('GapDisplay', () => {
  it('passes the typed view through while there are no gaps', () => {
    const { v, s } = columns([1, 2, 3], [0, 0, 0]);
    const gaps = new GapDisplay(v, s);
    const shown = gaps.data();
    expect(shown).toBeInstanceOf(Float64Array);
    expect((shown as Float64Array).buffer).toBe(v.view().buffer);
    expect(gaps.hasGaps).toBe(false);
  });

  it('switches to a null-gap array at the first bad reading and extends it incrementally', () => {
    const { v, s } = columns([1, 2, 3], [0, 0, 0]);
    const gaps = new GapDisplay(v, s);
    gaps.data();
    v.append([Number.NaN, 5]);
    s.append([STATUS_CODE['no-signal'], STATUS_CODE.ok]);
    expect(Array.from(gaps.data())).toEqual([1, 2, 3, null, 5]);
    v.append([6, 7]);
    s.append([STATUS_CODE.timeout, STATUS_CODE.ok]);
    const shown = gaps.data();
    expect(Array.from(shown)).toEqual([1, 2, 3, null, 5, null, 7]);
    // The store's column keeps the reading; only the display hides it.
    expect(v.at(5)).toBe(6);
  });

  it('treats a non-finite value with ok status as a gap', () => {
    const { v, s } = columns([1, Number.NaN], [0, 0]);
    expect(Array.from(new GapDisplay(v, s).data())).toEqual([1, null]);
  });
});

describe('frame gate', () => {
  it('draws at most once per frame however many requests arrive', () => {
    const frames: (() => void)[] = [];
    let draws = 0;
    const gate = createFrameGate(
      () => (draws += 1),
      (cb) => frames.push(cb),
    );
    for (let i = 0; i < 50; i += 1) gate.request();
    expect(frames).toHaveLength(1);
    frames.shift()?.();
    expect(draws).toBe(1);
    gate.request();
    gate.cancel();
    frames.shift()?.();
    expect(draws).toBe(1);
  });
});
