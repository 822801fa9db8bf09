/**
 * What a plot's cursor read-out may say of one series: each series carries
 * the resolution of what it plots (a counter's 1/gate, a supply's setting
 * step) or each point's 1σ uncertainty (a mean's standard error, a fit's
 * band, an Allan point's confidence), and its values are written by the one
 * formatter (app/analysis/format-figure.ts), so the digits follow what the
 * reading supports rather than a fixed count. Pure; the screens build their
 * series' read-outs in view models and app/views/readout-text.test.ts scans
 * them on real analyses.
 */
import { formatFigure } from '../analysis/format-figure.ts';
import { timeTickLabel } from './time-ticks.ts';

export interface Readout {
  unit: string;
  /** Smallest step the series resolves, in its unit (used where no uncertainty is known). */
  resolution?: number | null;
  /** 1σ uncertainty of the value at a data index, in the series' unit; wins over `resolution` where finite. */
  uncertaintyAt?: (index: number) => number | null | undefined;
  /** Significant digits when the series has neither (say at the call site why that many). */
  digits?: number;
  /** Write tiny or huge dimensionless values as "(m ± u)e−N" (Allan deviations). */
  exponent?: boolean;
  /** A time in seconds, written as a clock would ("2 min 05 s") to its resolution. */
  clock?: boolean;
}

/**
 * A supply's control-voltage setpoints resolve 1 mV: the setting resolution of
 * bench supplies programmed over SCPI (common practice) and of the simulated
 * supply (main/sim/sim-supply.ts). Plans step in whole millivolts or coarser.
 */
export const SUPPLY_SETTING_RESOLUTION_V = 1e-3;

/**
 * Temperatures to 0.01 °C: what bench RTD and thermistor loggers resolve
 * (common practice); the simulated thermometer reads to 1 m°C, the simulated
 * chamber's air sensor to 0.01 °C, so no reading here supports more.
 */
export const THERMOMETER_RESOLUTION_C = 0.01;

/** The readout of a control or supply voltage series (setpoints). */
export const voltsReadout: Readout = { unit: 'V', resolution: SUPPLY_SETTING_RESOLUTION_V };

/** The readout of a temperature series. */
export const celsiusReadout: Readout = { unit: '°C', resolution: THERMOMETER_RESOLUTION_C };

/** Frequencies read by a counter with gate `gateS`: whole counts, so the resolution is 1/gate (common practice). */
export function counterReadout(gateS: number | null | undefined, uncertaintyAt?: Readout['uncertaintyAt']): Readout {
  const resolution = gateS && gateS > 0 ? 1 / gateS : null;
  // Without a known gate a reading is shown to 7 significant digits, as figure-text's readingText does.
  return { unit: 'Hz', resolution, ...(uncertaintyAt ? { uncertaintyAt } : {}), ...(resolution ? {} : { digits: 7 }) };
}

/** Of several counters' read-outs, the one with the coarsest resolution (what a value shared by all supports). */
export function coarsestReadout(readouts: readonly Readout[]): Readout {
  let out: Readout = counterReadout(null);
  for (const r of readouts) if (r.resolution && r.resolution > (out.resolution ?? 0)) out = r;
  return out;
}

export function readoutText(r: Readout, value: number | null | undefined, index: number | null = null): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (r.clock) {
    // Past a minute the clock form ("12 min 34 s") reads better than sub-second digits; it only drops some.
    const step = r.resolution && r.resolution > 0 ? r.resolution : 1;
    return timeTickLabel(value, Math.abs(value) >= 60 ? Math.max(step, 1) : step);
  }
  const u = index !== null && r.uncertaintyAt ? r.uncertaintyAt(index) : null;
  if (u !== null && u !== undefined && Number.isFinite(u) && u > 0) {
    // Never finer than the series' own resolution: a mean of equal counts is still only known to ±1 count.
    const floor = r.resolution && r.resolution > 0 ? r.resolution / Math.sqrt(12) : 0;
    return formatFigure(value, r.unit, { uncertainty: Math.max(u, floor), exponent: r.exponent ?? false });
  }
  if (r.resolution && r.resolution > 0) return formatFigure(value, r.unit, { resolution: r.resolution });
  return formatFigure(value, r.unit, { digits: r.digits ?? 4 });
}

/** The uPlot `value` callback of a series with this read-out. */
export function readoutValue(r: Readout) {
  return (_u: unknown, value: number | null, _series: number, index: number | null): string =>
    readoutText(r, value, index);
}
