/**
 * Reading indices in ascending voltage, reading order among equal voltages:
 * the order groupPoints walks. Equal to sorting the indices with the
 * comparator (v[a] − v[b]) || (a − b), without calling a comparator a
 * million times (20 s of a 1e6-row analyze once, issue 15 item 9).
 *
 * A sweep's readings usually arrive in order already (one point after the
 * next, rising): that is checked in one pass and costs nothing more. Else
 * the distinct voltages are sorted natively (Float64Array sort), each
 * reading gets its voltage's rank, and a counting sort by rank — stable, so
 * reading order survives within a voltage — places the indices.
 */

/** `idx` (indices of finite voltages, ascending) reordered in place; returns it. */
export function orderByVoltage(v: Float64Array, idx: Uint32Array): Uint32Array {
  const m = idx.length;
  let sorted = true;
  for (let k = 1; k < m; k++) {
    if ((v[idx[k] as number] as number) < (v[idx[k - 1] as number] as number)) {
      sorted = false;
      break;
    }
  }
  if (sorted) return idx;

  const values = new Float64Array(m);
  for (let k = 0; k < m; k++) values[k] = v[idx[k] as number] as number;
  values.sort();
  // Distinct values, in place at the front (−0 and 0 compare equal, as in the comparator).
  let distinct = 0;
  for (let k = 0; k < m; k++) {
    if (distinct === 0 || (values[k] as number) !== (values[distinct - 1] as number))
      values[distinct++] = values[k] as number;
  }
  const levels = values.subarray(0, distinct);
  const rank = new Uint32Array(m);
  const counts = new Uint32Array(distinct + 1);
  for (let k = 0; k < m; k++) {
    const r = rankOf(levels, v[idx[k] as number] as number);
    rank[k] = r;
    counts[r + 1] = (counts[r + 1] as number) + 1;
  }
  for (let r = 1; r <= distinct; r++) counts[r] = (counts[r] as number) + (counts[r - 1] as number);
  const out = new Uint32Array(m);
  for (let k = 0; k < m; k++) {
    const r = rank[k] as number;
    out[counts[r] as number] = idx[k] as number;
    counts[r] = (counts[r] as number) + 1;
  }
  idx.set(out);
  return idx;
}

/** Index of `x` in the ascending, distinct `levels` (x is one of them). */
function rankOf(levels: Float64Array, x: number): number {
  let lo = 0;
  let hi = levels.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if ((levels[mid] as number) < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
