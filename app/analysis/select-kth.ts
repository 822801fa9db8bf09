/**
 * The k-th smallest value (0-based) of an array, found in place in O(n) on
 * average: the median sample interval of a million-sample log without sorting
 * it. Three-way partitioning, so a log of equal intervals (the usual case) is
 * a single pass. Same value as `values.slice().sort()[k]` for arrays without
 * NaN or −0 (the caller's intervals have neither).
 */
export function kthSmallestInPlace(values: Float64Array, k: number): number {
  let lo = 0;
  let hi = values.length - 1;
  if (k < 0 || k > hi) throw new RangeError(`k = ${k} is outside 0…${hi}`);
  // Median-of-three pivots make bad splits rare; past this many rounds, sort what is left.
  let rounds = 2 * Math.ceil(Math.log2(values.length + 1)) + 8;
  while (lo < hi) {
    if (rounds-- === 0) return values.subarray(lo, hi + 1).sort()[k - lo] as number;
    const pivot = medianOfThree(values[lo] as number, values[(lo + hi) >> 1] as number, values[hi] as number);
    // Dutch-flag partition of [lo, hi]: < pivot | = pivot | > pivot.
    let lt = lo;
    let gt = hi;
    let i = lo;
    while (i <= gt) {
      const v = values[i] as number;
      if (v < pivot) {
        values[i] = values[lt] as number;
        values[lt] = v;
        lt++;
        i++;
      } else if (v > pivot) {
        values[i] = values[gt] as number;
        values[gt] = v;
        gt--;
      } else i++;
    }
    if (k < lt) hi = lt - 1;
    else if (k > gt) lo = gt + 1;
    else return pivot;
  }
  return values[k] as number;
}

function medianOfThree(a: number, b: number, c: number): number {
  if (a < b) return b < c ? b : a < c ? c : a;
  return a < c ? a : b < c ? c : b;
}

/**
 * `values.sort()[k]` (a typed array's numeric order, NaN last) without the
 * sort: in place by kthSmallestInPlace when no value is NaN, else by sorting.
 * Reorders `values`. (A −0 may come back as 0 or the other way round; they
 * compare equal.)
 */
export function sortedAtInPlace(values: Float64Array, k: number): number {
  for (let i = 0; i < values.length; i++) {
    if (Number.isNaN(values[i])) return values.sort()[k] as number;
  }
  return kthSmallestInPlace(values, k);
}
