/**
 * Formatting at the edge: SI prefixes for the screen. Thin wrappers so the
 * views read `hz(x)`, `volts(x)`; the prefix logic itself lives with analysis.
 */
import { formatClockDuration } from '../analysis/format-clock.ts';
import { formatFigure } from '../analysis/format-figure.ts';
import { formatPlain, formatSiOrDash } from '../analysis/format-si.ts';
import { SUPPLY_SETTING_RESOLUTION_V, THERMOMETER_RESOLUTION_C } from '../plots/readout.ts';
import { readingText } from './figure-text.ts';

export const si = formatSiOrDash;

export const hz = (value: number | null | undefined, digits?: number) => si(value, 'Hz', digits);
export const volts = (value: number | null | undefined, digits?: number) => si(value, 'V', digits);

/** A supply's setpoint or readback on the bench: to its 1 mV setting resolution, through the one formatter. */
export function supplyVolts(value: number | null | undefined): string {
  return formatFigure(value, 'V', { resolution: SUPPLY_SETTING_RESOLUTION_V });
}
export const hzPerV = (value: number | null | undefined, digits?: number) => si(value, 'Hz/V', digits);

/** A temperature to the thermometer's 0.01 °C, through the one formatter. */
export function celsius(value: number | null | undefined): string {
  return formatFigure(value, '°C', { resolution: THERMOMETER_RESOLUTION_C });
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
  return date.toLocaleString(undefined, {
    year: 'numeric',
    month: 'short',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
  });
}

/** Tick labels for uPlot axes with SI prefixes. */
export function siTicks(unit: string, digits = 3) {
  return (_u: unknown, values: number[]) => values.map((value) => (value === null ? '' : si(value, unit, digits)));
}

/**
 * A counter reading with the digits its resolution supports: a 0.1 s gate
 * counts in 10 Hz steps, so 13 780 Hz reads "13.78 kHz", not "13.78000 kHz".
 * Without a known resolution, 7 significant digits (figure-text's readingText).
 */
export function hzAtResolution(value: number | null | undefined, resolutionHz: number | null | undefined): string {
  return readingText(value, resolutionHz);
}
