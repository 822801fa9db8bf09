/**
 * Time axes in round clock units: ticks fall on 1, 2, 5, 10, 15 and 30 s,
 * whole minutes (1, 2, 5, 10, 15, 30), hours (1, 2, 3, 6, 12) or days, and the
 * label says the time the way a clock would ("2 min 30 s", "1 h 15 min"),
 * never "0.333333 min". A multi-day log with a known start reads in dates.
 */

/** Allowed tick steps, s (sub-second for short zooms). */
export const TIME_STEPS_S: readonly number[] = [
  0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200,
  10_800, 21_600, 43_200, 86_400, 172_800, 604_800,
];

/** Smallest allowed step that keeps ticks at least `minPx` apart over `spanS` drawn on `widthPx`. */
export function timeStepFor(spanS: number, widthPx: number, minPx: number): number {
  const fits = Math.max(1, Math.floor(widthPx / minPx));
  for (const step of TIME_STEPS_S) if (spanS / step <= fits) return step;
  return TIME_STEPS_S[TIME_STEPS_S.length - 1] as number;
}

/** Tick positions: multiples of `stepS` within [minS, maxS]. */
export function timeTicks(minS: number, maxS: number, stepS: number): number[] {
  const out: number[] = [];
  const first = Math.ceil(minS / stepS - 1e-9);
  for (let k = first; k * stepS <= maxS + stepS * 1e-9; k += 1) out.push(Number((k * stepS).toPrecision(12)));
  return out;
}

const pad2 = (n: number): string => String(n).padStart(2, '0');

function decimalsOf(step: number): number {
  for (let d = 0; d < 4; d += 1) if (Math.abs(step * 10 ** d - Math.round(step * 10 ** d)) < 1e-9) return d;
  return 3;
}

/**
 * One tick's label. `startMs` (the log's wall-clock start) switches a
 * multi-hour step to local dates and times ("04 Mar 06:00").
 */
export function timeTickLabel(valueS: number, stepS: number, startMs: number | null = null): string {
  const sign = valueS < 0 ? '−' : '';
  const v = Math.abs(valueS);
  if (stepS < 1) return `${sign}${v.toFixed(decimalsOf(stepS))} s`;
  const total = Math.round(v);
  const d = Math.floor(total / 86_400);
  const h = Math.floor((total % 86_400) / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = total % 60;
  if (stepS >= 3600 && startMs !== null && Number.isFinite(startMs)) {
    const at = new Date(startMs + valueS * 1000);
    const day = at.toLocaleDateString(undefined, { day: '2-digit', month: 'short' });
    return stepS >= 86_400 ? day : `${day} ${pad2(at.getHours())}:${pad2(at.getMinutes())}`;
  }
  if (stepS < 60) {
    if (total < 60) return `${sign}${total} s`;
    const mins = Math.floor(total / 60);
    return s === 0 ? `${sign}${mins} min` : `${sign}${mins} min ${pad2(s)} s`;
  }
  if (stepS < 3600) {
    if (total < 3600) return `${sign}${Math.floor(total / 60)} min`;
    const hours = Math.floor(total / 3600);
    return m === 0 ? `${sign}${hours} h` : `${sign}${hours} h ${pad2(m)} min`;
  }
  if (total < 86_400) return `${sign}${Math.floor(total / 3600)} h`;
  return h === 0 ? `${sign}${d} d` : `${sign}${d} d ${pad2(h)} h`;
}
