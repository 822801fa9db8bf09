import { describe, expect, it } from 'vitest';
import { appendRows, columnSetFromStored, createColumnSet, GrowableColumn, rowCount, STATUS_CODE } from './columns.ts';

describe('GrowableColumn', () => {
  it('doubles capacity as it grows and keeps every value', () => {
    const column = new GrowableColumn(4);
    const capacities: number[] = [];
    for (let i = 0; i < 1000; i += 1) {
      column.push(i * 0.5);
      if (capacities[capacities.length - 1] !== column.capacity) capacities.push(column.capacity);
    }
    expect(capacities).toEqual([4, 8, 16, 32, 64, 128, 256, 512, 1024]);
    expect(column.length).toBe(1000);
    expect(column.at(999)).toBe(499.5);
    expect(column.at(1000)).toBeNaN();
    expect(Array.from(column.view().subarray(0, 3))).toEqual([0, 0.5, 1]);
  });

  it('hands out views on its buffer, not copies', () => {
    const column = new GrowableColumn(8);
    column.append([1, 2, 3]);
    const view = column.view();
    expect(view.length).toBe(3);
    column.push(4); // fits in capacity: same buffer
    const view2 = column.view();
    expect(view2.buffer).toBe(view.buffer);
    expect(view2.byteOffset).toBe(0);
    expect(view2[3]).toBe(4);
    // Writing through the underlying buffer shows in an earlier view: it is shared memory.
    view2[0] = 42;
    expect(view[0]).toBe(42);
  });

  it('grows once for a large append and leaves the old view unchanged', () => {
    const column = new GrowableColumn(2);
    column.append([1, 2]);
    const before = column.view();
    column.append(new Float64Array(100).fill(7));
    expect(column.capacity).toBe(128);
    expect(column.length).toBe(102);
    expect(before.length).toBe(2);
    expect(column.view().buffer).not.toBe(before.buffer);
  });

  it('rejects a bad initial capacity, naming it', () => {
    expect(() => new GrowableColumn(0)).toThrow(/initialCapacity/);
  });
});

describe('column sets', () => {
  it('appends sample rows with status and direction as codes and blanks as NaN', () => {
    const set = createColumnSet(2);
    appendRows(set, [
      { time_s: 0, control_v: 0.5, frequency_hz: '', status: 'no-signal', direction: 'up' },
      { time_s: 1, control_v: 1, frequency_hz: 1.2e6, status: 'ok', direction: 'down' },
      { time_s: 2, control_v: 1.5, frequency_hz: '1.3e6', status: 'weird' },
    ]);
    expect(rowCount(set)).toBe(3);
    expect(Array.from(set.status.view())).toEqual([STATUS_CODE['no-signal'], STATUS_CODE.ok, STATUS_CODE.error]);
    expect(Array.from(set.direction.view())).toEqual([0, 1, 0]);
    expect(set.frequency_hz.at(0)).toBeNaN();
    expect(set.frequency_hz.at(2)).toBe(1.3e6);
    expect(set.temperature_c.at(1)).toBeNaN();
  });

  it('builds columns from a stored run', () => {
    const set = columnSetFromStored({ time_s: [0, 1], frequency_hz: [5, 6] }, { status: ['ok', 'timeout'] });
    expect(rowCount(set)).toBe(2);
    expect(set.status.at(1)).toBe(STATUS_CODE.timeout);
    expect(set.control_v.at(0)).toBeNaN();
  });

  it('adopts a stored run’s Float64Array columns without copying, and appends after them without writing into them', () => {
    const time = new Float64Array([0, 1, 2]);
    const frequency = new Float64Array([5, 6, 7]);
    const status = { levels: ['timeout', 'ok'], codes: new Uint8Array([1, 0, 1]) };
    const set = columnSetFromStored({ time_s: time, frequency_hz: frequency }, { status });
    expect(set.time_s.view().buffer).toBe(time.buffer); // the reply's own buffer
    expect(Array.from(set.status.view())).toEqual([STATUS_CODE.ok, STATUS_CODE.timeout, STATUS_CODE.ok]);
    expect(set.control_v.at(2)).toBeNaN();
    appendRows(set, [{ time_s: 3, frequency_hz: 8, status: 'ok' }]);
    expect(rowCount(set)).toBe(4);
    expect(Array.from(set.frequency_hz.view())).toEqual([5, 6, 7, 8]);
    expect(set.frequency_hz.view().buffer).not.toBe(frequency.buffer);
    set.control_v.clear();
    set.control_v.push(1);
    set.frequency_hz.clear();
    set.frequency_hz.push(9);
    // The adopted arrays (part of the cached reply) and the shared NaN column are untouched.
    expect(Array.from(frequency)).toEqual([5, 6, 7]);
    expect(set.supply_v.at(0)).toBeNaN();
  });
});
