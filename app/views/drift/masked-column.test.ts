import { describe, expect, it } from 'vitest';
import { envelope } from '../../plots/envelope.ts';
import { STATUS_CODE } from '../../state/columns.ts';
import { maskedColumn } from './masked-column.ts';

describe('maskedColumn (a stored drift run drawn with its gaps)', () => {
  it('hides readings that are not measurements, keeps the rest, and the envelope breaks there', () => {
    const values = Float64Array.from([1, 2, 99, 4, Number.NaN, 6]);
    const status = Float64Array.from([0, 0, STATUS_CODE['no-signal'], 0, 0, STATUS_CODE.timeout]);
    const masked = maskedColumn(values, status, 5);
    expect(Array.from(masked)).toEqual([1, 2, Number.NaN, 4, Number.NaN]);
    const drawn = envelope(Float64Array.from([0, 1, 2, 3, 4]), [masked], 5, 0, 4, 10, 10);
    expect(drawn.series[0]?.mid).toEqual([1, 2, null, 4, null]);
  });
});
