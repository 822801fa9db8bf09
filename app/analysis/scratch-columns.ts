/**
 * Working columns for steps of an analysis that need a temporary array the
 * length of the sweep (a copy to take a median of, the gaps between points),
 * reused from step to step instead of made new each time. A new array of a
 * million doubles is 8 MB of memory the process touches for the first time,
 * about 2,000 page faults, and a 1e6-point analysis made ten of them: a tenth
 * of its time went to the faults (issue 15 item 9).
 *
 * A slot's contents are left from its last use: write before reading. A
 * caller uses a slot only until it returns, and never while something it
 * calls uses the same slot (the slot each caller takes is named beside it).
 */
const slots: Float64Array[] = [];

/** `n` doubles of slot `slot` (0 or 1), contents undefined. */
export function scratchColumn(slot: 0 | 1, n: number): Float64Array {
  let buffer = slots[slot];
  if (buffer === undefined || buffer.length < n) {
    buffer = new Float64Array(n + 64); // room for the next step's n + 1 (gaps, then points)
    slots[slot] = buffer;
  }
  return buffer.subarray(0, n);
}

/** Lets go of the working columns (after an analysis: a big one's would otherwise stay). */
export function releaseScratchColumns(): void {
  slots.length = 0;
}
