/**
 * Formatting at the edge: SI prefixes for the screen. Thin wrappers so the
 * views read `hz(x)`, `volts(x)`; the prefix logic itself lives with analysis.
 */
import { formatClockDuration } from '../analysis/format-clock.ts';
import { formatPlain, formatSiOrDash } from '../analysis/format-si.ts';

export const si = formatSiOrDash;

export const hz = (value: number | null | undefined, digits?: number) => si(value, 'Hz', digits);
export const volts = (value: number | null | undefined, digits?: number) => si(value, 'V', digits);
export const hzPerV = (value: number | null | undefined, digits?: number) => si(value, 'Hz/V', digits);

export function celsius(value: number | null | undefined): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : `${value.toFixed(2)} °C`;
}

export function percent(value: number | null | undefined, digits = 3): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : formatPlain(value, '%', digits);
}

export function plain(value: number | null | undefined, unit: string, digits = 3): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : formatPlain(value, unit, digits);
}

/** "1 h 02 min", "3 min 05 s", "42 s" for an ETA. */
export const duration = formatClockDuration;

/** Short local date-time for run lists. */
export function when(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return date.toLocaleString(undefined, { year: 'numeric', month: 'short', day: '2-digit', hour: '2-digit', minute: '2-digit' });
}

/** Tick labels for uPlot axes with SI prefixes. */
export function siTicks(unit: string, digits = 3) {
  return (_u: unknown, values: number[]) => values.map((value) => (value === null ? '' : si(value, unit, digits)));
}
