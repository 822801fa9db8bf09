/** Shared option pieces so every chart reads the same: themed axes, point and line series. */
import type uPlot from 'uplot';
import { formatSiOrDash as si, siPrefixFor } from '../analysis/format-si.ts';
import type { PlotColors } from './plot-colors.ts';
import { readoutValue, type Readout } from './readout.ts';
import { resolutionSteps } from './resolution-steps.ts';
import { TIME_STEPS_S, timeTickLabel } from './time-ticks.ts';

export function siAxis(colors: PlotColors, label: string, unit: string, extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    label,
    labelSize: 18,
    labelGap: 0,
    stroke: colors.text,
    grid: { stroke: colors.grid, width: 1 },
    ticks: { stroke: colors.grid, width: 1 },
    size: 44,
    values: (_u, values, _axis, _space, incr) => tickLabels(values, incr, unit),
    ...extra,
  };
}

/** An axis' tick steps for the series it shows: never finer than what the series resolves (uPlot's own list without one). */
export function readoutTicks(readout: Readout): Pick<uPlot.Axis, 'incrs'> {
  const steps = resolutionSteps(readout.resolution);
  return steps ? { incrs: steps } : {};
}

/**
 * A value scale for the series a readout describes: the data's range padded by a tenth, widened to whole multiples of the
 * finest tick step the data resolve (readoutTicks) and to at least two of them. Without it, a zoom onto readings
 * that vary by less than one such step (a 32 Hz counter resolution, readings within 20 Hz) left the axis with no
 * tick and no label at all.
 */
export function readoutScale(readout: Readout): Pick<uPlot.Scale, 'range'> {
  const step = resolutionSteps(readout.resolution)?.[0];
  if (step === undefined) return {};
  return { range: (_u, min, max) => resolvedRange(min, max, step) };
}

/** [min, max] padded by a tenth of its span, then snapped outward to whole `step`s, at least two apart. */
export function resolvedRange(min: number | null, max: number | null, step: number): uPlot.Range.MinMax {
  if (min === null || max === null || !Number.isFinite(min) || !Number.isFinite(max)) return [min, max];
  const [paddedMin, paddedMax] = paddedRange(min, max);
  let lo = Math.floor(paddedMin / step) * step;
  let hi = Math.ceil(paddedMax / step) * step;
  if (hi - lo < 2 * step) {
    const mid = Math.round((lo + hi) / 2 / step) * step;
    lo = mid - step;
    hi = mid + step;
  }
  return [lo, hi];
}

/** A value range padded by 10 % of its span on each side (flat readings: the two steps around them do). */
function paddedRange(min: number, max: number): [number, number] {
  const span = max - min;
  return [min - 0.1 * span, max + 0.1 * span];
}

/**
 * An axis width that fits its tick labels (about 7 px a character at the plots' 12 px font, plus the tick and the
 * axis title's strip), never under `minPx`: a zoom that needs more digits ("399.99165 MHz") widens the axis
 * instead of writing its labels over the title.
 */
export function labelFitSize(minPx: number): uPlot.Axis.Size {
  return (_u, values) => {
    let longest = 0;
    for (const text of values ?? []) longest = Math.max(longest, text.length);
    return Math.max(minPx, Math.ceil(38 + 7 * longest));
  };
}

/** Fewest decimals that write a tick step exactly (0.25 → 2, 0.5 → 1, 5 → 0). */
export function decimalsFor(step: number): number {
  for (let d = 0; d < 9; d += 1) {
    const scaled = step * 10 ** d;
    if (Math.abs(scaled - Math.round(scaled)) <= 1e-6 * Math.max(1, scaled)) return d;
  }
  return 9;
}

/**
 * Tick labels with one prefix per axis and just enough decimals to tell
 * neighbouring ticks apart (2.89990 MHz, 2.89995 MHz rather than 2.90 MHz twice).
 */
export function tickLabels(values: readonly (number | null)[], incr: number, unit: string): string[] {
  let largest = 0;
  for (const value of values)
    if (value !== null && Number.isFinite(value)) largest = Math.max(largest, Math.abs(value));
  const { scale, symbol } = siPrefixFor(largest);
  const step = incr > 0 && Number.isFinite(incr) ? incr / scale : 1;
  const decimals = decimalsFor(step);
  return values.map((value) =>
    value === null || !Number.isFinite(value)
      ? ''
      : `${(value / scale).toFixed(decimals).replace(/^-/, '−')} ${symbol}${unit}`.trimEnd(),
  );
}

/** Axis for log scales: each tick takes its own prefix (100 Hz, 1 kHz, 10 kHz …). */
export function logSiAxis(colors: PlotColors, label: string, unit: string): uPlot.Axis {
  return {
    ...siAxis(colors, label, unit),
    values: (_u, values) => values.map((value) => (value === null ? '' : si(value, unit, 2))),
  };
}

/**
 * Time axis in round clock units (./time-ticks.ts): ticks on whole seconds,
 * minutes, hours or days, labelled as a clock would, spaced so labels never
 * touch. `startMs` (the log's start) lets multi-day logs read in dates.
 */
/** Half the width of a long time label ("1 min 30 s" at the axis font): closer to an edge, a tick shows no text. */
const EDGE_LABEL_CLEARANCE_PX = 28;

export function timeAxis(colors: PlotColors, label = 'Time', startMs: number | null = null): uPlot.Axis {
  return {
    ...siAxis(colors, label, 's'),
    incrs: [...TIME_STEPS_S],
    space: 78,
    // A label centred on a tick at the plot's very edge reaches under the y axes' lowest tick labels (seen in the
    // SVG export: "3 min" on "23.10 °C"): such edge ticks keep their grid line and lose only their text.
    values: (u, values, _axis, _space, incr) => {
      // bbox is in device pixels; uPlot's pixel ratio is the page's (this project never sets its own).
      const widthPx = u.bbox.width / (globalThis.devicePixelRatio || 1);
      return values.map((value) => {
        if (value === null) return '';
        const x = u.valToPos(value, 'x');
        return x < EDGE_LABEL_CLEARANCE_PX || x > widthPx - EDGE_LABEL_CLEARANCE_PX
          ? ''
          : timeTickLabel(value, incr, startMs);
      });
    },
  };
}

/**
 * Series take a Readout (./readout.ts): the unit and the resolution or per-point
 * uncertainty of what they plot, so the cursor's legend read-out shows only the
 * digits the reading supports.
 */
export function xSeries(label: string, readout: Readout): uPlot.Series {
  return { label, value: readoutValue(readout) };
}

export function pointSeries(
  label: string,
  color: string,
  readout: Readout,
  extra: Partial<uPlot.Series> = {},
): uPlot.Series {
  return {
    label,
    stroke: color,
    fill: undefined,
    paths: () => null,
    points: { show: true, size: 6, stroke: color, fill: color },
    value: readoutValue(readout),
    ...extra,
  };
}

export function lineSeries(
  label: string,
  color: string,
  readout: Readout,
  extra: Partial<uPlot.Series> = {},
): uPlot.Series {
  return {
    label,
    stroke: color,
    width: 1.5,
    points: { show: false },
    value: readoutValue(readout),
    ...extra,
  };
}

export function baseOptions(
  width: number,
  height: number,
  series: uPlot.Series[],
  axes: uPlot.Axis[],
  extra: Partial<uPlot.Options> = {},
): uPlot.Options {
  return {
    width,
    height,
    series,
    axes,
    scales: { x: { time: false } },
    legend: { show: true, live: true },
    cursor: { drag: { x: true, y: false } },
    ...extra,
  };
}

/** A theme colour (#rrggbb or #rgb) at the given opacity; other forms pass through. */
export function withAlpha(color: string, alpha: number): string {
  const hex = /^#([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(color.trim());
  if (!hex) return color;
  const digits =
    (hex[1] as string).length === 3 ? [...(hex[1] as string)].map((c) => c + c).join('') : (hex[1] as string);
  const [r, g, b] = [0, 2, 4].map((i) => parseInt(digits.slice(i, i + 2), 16));
  return `rgba(${r}, ${g}, ${b}, ${alpha})`;
}
