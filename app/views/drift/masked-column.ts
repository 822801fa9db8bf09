/**
 * A stored run's column for drawing, with every reading that is not a
 * measurement (status other than ok) as NaN: the envelope (app/plots/envelope.ts)
 * reads a non-finite value as no value, so the line breaks there. One tight
 * pass into a Float64Array: the live path's null-gap array (GapDisplay)
 * boxes each of millions of values and took seconds on a big run.
 */
import { STATUS_CODE } from '../../state/columns.ts';

export function maskedColumn(values: Float64Array, status: Float64Array, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 1) out[i] = status[i] === STATUS_CODE.ok ? (values[i] as number) : Number.NaN;
  return out;
}
