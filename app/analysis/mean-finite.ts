/**
 * Mean of the finite values of a column (NaN is an empty cell); null when
 * there are none or there is no column. A module of its own because
 * datasheet-run.ts needs zod and the analysis worker should not load it.
 */
export function meanOfFinite(values: ArrayLike<number> | null | undefined): number | null {
  if (!values) return null;
  let sum = 0;
  let count = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i] as number;
    if (!Number.isFinite(v)) continue;
    sum += v;
    count++;
  }
  return count > 0 ? sum / count : null;
}
