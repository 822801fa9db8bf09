/**
 * uPlot options of the loop screen's two Bode plots (open-loop gain and
 * phase against offset frequency, one trace per Kvco corner), and the marks
 * drawn on them: at each corner's crossover (|G·H| = 1, 0 dB) a dashed line
 * in the corner's colour, and on the phase plot a bar from −180° up to the
 * phase there — the phase margin — labelled with its value.
 */
import type uPlot from 'uplot';
import { formatFigure } from '../../analysis/format-figure.ts';
import type { PlotColors } from '../../plots/plot-colors.ts';
import { baseOptions, lineSeries, logSiAxis, siAxis, xSeries } from '../../plots/plot-options.ts';
import { readoutText, type Readout } from '../../plots/readout.ts';

/** One Kvco corner's loop as checked: where the gain crosses 0 dB and the margin there. */
export interface BodeCorner {
  label: string;
  crossoverHz: number;
  phaseMarginDeg: number;
}

export type BodeKind = 'magnitude' | 'phase';

/** An angle as written in the trade: "52.3°" (no space before the degree sign), 3 significant digits. */
export function degreesText(value: number): string {
  return `${formatFigure(value, '', { digits: 3 })}°`;
}

/*
 * Read-outs of the Bode traces. The loop is computed exactly from component
 * values that hold only to their series' tolerance (E96 1 % … E6 20 %) and a
 * measured Kvco of a few per cent, i.e. some 0.1–2 dB and a degree or more:
 * 0.1 dB and 0.1° keep the read-out steady and claim no more than that. The
 * frequencies are the plot's log grid (300 points over four decades, 3 % apart):
 * 3 significant digits tell neighbours apart.
 */
const BODE_FREQUENCY: Readout = { unit: 'Hz', digits: 3 };
const BODE_MAGNITUDE: Readout = { unit: 'dB', resolution: 0.1 };
const PHASE_RESOLUTION_DEG = 0.1;

/** A phase read-out as the trade writes it, "−132.4°", to 0.1°. */
export function phaseReadout(value: number | null | undefined): string {
  return value === null || value === undefined || !Number.isFinite(value)
    ? '—'
    : `${formatFigure(value, '', { resolution: PHASE_RESOLUTION_DEG })}°`;
}

/** The colour of corner `i`: the theme's series colours, the text colour past them. */
export function cornerColor(colors: PlotColors, i: number): string {
  return colors.series[i] ?? colors.text;
}

/** The y range drawn: the data's, widened so 0 dB (gain) or −180° (phase) is always in view. */
export function bodeRange(kind: BodeKind, min: number | null, max: number | null): [number, number] {
  const reference = kind === 'magnitude' ? 0 : -180;
  const pad = kind === 'magnitude' ? 6 : 10;
  const lo = Math.min(min ?? reference, reference - pad);
  const hi = Math.max(max ?? reference, reference + pad);
  return [lo, hi];
}

/** Where a margin bar sits: x at the crossover, from −180° to the phase there (−180° + margin). */
export function marginBar(corner: BodeCorner): { x: number; fromDeg: number; toDeg: number } {
  return { x: corner.crossoverHz, fromDeg: -180, toDeg: -180 + corner.phaseMarginDeg };
}

function marksPlugin(kind: BodeKind, corners: readonly BodeCorner[], colors: PlotColors): uPlot.Plugin {
  return {
    hooks: {
      draw: (u) => {
        const { ctx, bbox } = u;
        const ratio = window.devicePixelRatio || 1;
        const inside = (x: number) => x >= bbox.left && x <= bbox.left + bbox.width;
        ctx.save();
        // The reference: 0 dB on the gain plot, −180° on the phase plot.
        const refY = u.valToPos(kind === 'magnitude' ? 0 : -180, 'y', true);
        ctx.strokeStyle = colors.text;
        ctx.lineWidth = ratio;
        ctx.setLineDash([2 * ratio, 3 * ratio]);
        ctx.beginPath();
        ctx.moveTo(bbox.left, refY);
        ctx.lineTo(bbox.left + bbox.width, refY);
        ctx.stroke();
        corners.forEach((corner, i) => {
          if (!(corner.crossoverHz > 0)) return;
          const x = u.valToPos(corner.crossoverHz, 'x', true);
          if (!inside(x)) return;
          const color = cornerColor(colors, i);
          ctx.strokeStyle = color;
          ctx.setLineDash([5 * ratio, 4 * ratio]);
          ctx.lineWidth = ratio;
          ctx.beginPath();
          ctx.moveTo(x, bbox.top);
          ctx.lineTo(x, bbox.top + bbox.height);
          ctx.stroke();
          if (kind !== 'phase') return;
          const bar = marginBar(corner);
          const top = u.valToPos(bar.toDeg, 'y', true);
          ctx.setLineDash([]);
          ctx.lineWidth = 4 * ratio;
          ctx.beginPath();
          ctx.moveTo(x, refY);
          ctx.lineTo(x, top);
          ctx.stroke();
          ctx.fillStyle = color;
          ctx.font = `${11 * ratio}px sans-serif`;
          // Corners often cross over close together: each label on its own line so none covers another.
          ctx.fillText(degreesText(corner.phaseMarginDeg), x + 5 * ratio, (refY + top) / 2 + (i - 1) * 13 * ratio);
        });
        ctx.restore();
      },
    },
  };
}

/** Options of the gain (`magnitude`) or phase plot for the corners' traces. */
export function bodeOptions(
  kind: BodeKind,
  corners: readonly BodeCorner[],
  colors: PlotColors,
  width: number,
  height: number,
): uPlot.Options {
  return baseOptions(
    width,
    height,
    [
      xSeries('Frequency', BODE_FREQUENCY),
      ...corners.map((c, i) =>
        lineSeries(c.label, cornerColor(colors, i), BODE_MAGNITUDE, {
          value: (_u, v) => (kind === 'phase' ? phaseReadout(v) : readoutText(BODE_MAGNITUDE, v)),
        }),
      ),
    ],
    [
      logSiAxis(colors, 'Offset frequency', 'Hz'),
      {
        ...siAxis(colors, kind === 'magnitude' ? 'Gain' : 'Phase', ''),
        values: (_u, vals) => vals.map((v) => `${v}${kind === 'magnitude' ? ' dB' : '°'}`),
      },
    ],
    {
      scales: { x: { time: false, distr: 3 }, y: { range: (_u, min, max) => bodeRange(kind, min, max) } },
      plugins: [marksPlugin(kind, corners, colors)],
    },
  );
}
