/**
 * Time the page spends updating plots, per update, kept in a fixed ring of
 * the latest 1,024 figures (no growth over a day-long session). The
 * benchmark reads it to report frame work: requestAnimationFrame deltas
 * only show the display's refresh interval (16.7 ms at 60 Hz), not how much
 * of each frame the plots used.
 */
const CAPACITY = 1024;
const durationsMs = new Float64Array(CAPACITY);
const endedAtMs = new Float64Array(CAPACITY);
let written = 0;

export function recordPlotWork(startMs: number, endMs: number): void {
  const slot = written % CAPACITY;
  durationsMs[slot] = endMs - startMs;
  endedAtMs[slot] = endMs;
  written++;
}

/** Durations (ms) of the plot updates that ended at or after `sinceMs`, oldest first. */
export function plotWorkSince(sinceMs: number): number[] {
  const out: number[] = [];
  const first = Math.max(0, written - CAPACITY);
  for (let i = first; i < written; i++) {
    const slot = i % CAPACITY;
    if ((endedAtMs[slot] as number) >= sinceMs) out.push(durationsMs[slot] as number);
  }
  return out;
}

/** Exposed for benchmarks driving the page from outside (read-only figures, no controls). */
export function exposePlotWork(target: { tunebenchPlotWorkSince?: (sinceMs: number) => number[] }): void {
  target.tunebenchPlotWorkSince = plotWorkSince;
}
