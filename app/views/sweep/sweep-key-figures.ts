/**
 * The sweep screen's key figures and plot-region titles as text, every figure
 * through the one formatter (value ± u to the digits u supports).
 */
import { formatFigure } from '../../analysis/format-figure.ts';
import type { SweepAnalysis } from '../../analysis/sweep-types.ts';
import { figure, setpointText, type FigureText } from '../figure-text.ts';

const withU = (value: number | null | undefined, unit: string, u: number | null | undefined): string =>
  formatFigure(value, unit, { uncertainty: u });

/** The stall edge with its ±, or what stands instead. */
export function stallText(a: SweepAnalysis): string {
  if (a.stall.thresholdV === null) return 'none in range';
  return withU(a.stall.thresholdV, 'V', a.stall.thresholdUncertaintyV);
}

function stallNote(a: SweepAnalysis): string | undefined {
  const parts: string[] = [];
  if (a.stall.unstableBelowV !== null)
    parts.push(`unsteady below ${withU(a.stall.unstableBelowV, 'V', a.stall.unstableBelowUncertaintyV)}`);
  const zone = a.usableRange.edgeZone;
  if (zone)
    parts.push(
      `${setpointText(zone.fromV)} – ${setpointText(zone.toV)} left out: the slope changes faster than the step resolves`,
    );
  return parts.length > 0 ? parts.join('; ') : undefined;
}

/** Before the analysis: the same panel with dashes. */
const WAITING: FigureText[] = [
  figure('Tuning range', '—', 'tuning-range'),
  figure('Kvco typ (best line)', '—', 'kvco-typ'),
  figure('Kvco min', '—', 'kvco-min'),
  figure('Kvco max', '—', 'kvco-max'),
  figure('Linearity (worst deviation from line)', '—', 'linearity'),
  figure('Stall threshold', '—', 'stall-threshold'),
  figure('Fit', '—', 'fit-model'),
];

export function sweepKeyFigures(a: SweepAnalysis | null): FigureText[] {
  if (!a) return WAITING;
  const t = a.tuningRange;
  const k = a.kvco;
  const out: FigureText[] = [
    figure(
      'Tuning range',
      `${withU(t.fMinHz, 'Hz', t.fMinUncertaintyHz)} – ${withU(t.fMaxHz, 'Hz', t.fMaxUncertaintyHz)}`,
      'tuning-range',
      `${setpointText(t.vAtFMin)} to ${setpointText(t.vAtFMax)}`,
    ),
    figure('Kvco typ (best line)', withU(k.linear.slopeHzPerV, 'Hz/V', k.linear.slopeUncertaintyHzPerV), 'kvco-typ'),
    figure('Kvco min', withU(k.minHzPerV, 'Hz/V', k.minUncertaintyHzPerV), 'kvco-min', `at ${setpointText(k.vAtMin)}`),
    figure('Kvco max', withU(k.maxHzPerV, 'Hz/V', k.maxUncertaintyHzPerV), 'kvco-max', `at ${setpointText(k.vAtMax)}`),
    figure(
      'Linearity (worst deviation from line)',
      formatFigure(k.linear.maxLinearityErrorPct, '%', { digits: 3 }),
      'linearity',
      `over ${setpointText(k.linear.fromV)} – ${setpointText(k.linear.toV)}`,
    ),
    figure('Stall threshold', stallText(a), 'stall-threshold', stallNote(a)),
  ];
  const h = a.hysteresis;
  if (h) {
    const note = [
      h.curveMaxDeltaAtV !== null
        ? `at ${setpointText(h.curveMaxDeltaAtV)}, ${h.commonPoints} setpoints read both ways`
        : null,
      h.thresholdDeltaV !== null
        ? `stall edge moves ${withU(h.thresholdDeltaV, 'V', h.thresholdDeltaUncertaintyV)}`
        : null,
    ]
      .filter(Boolean)
      .join('; ');
    const resolution = a.counter.resolutionHz;
    out.push(
      figure(
        'Hysteresis (largest rising − falling)',
        formatFigure(h.curveMaxDeltaHz, 'Hz', resolution ? { resolution } : { digits: 3 }),
        'hysteresis',
        note,
      ),
    );
  }
  out.push(
    figure(
      'Fit',
      a.fit.model === 'spline' ? 'cubic spline (GCV)' : `polynomial, degree ${a.fit.degree}`,
      'fit-model',
      `residual σ ${formatFigure(a.fit.residualStdDevHz, 'Hz', { digits: 2 })} against ${formatFigure(a.fit.pointScatterHz, 'Hz', { digits: 2 })} point scatter`,
    ),
  );
  return out;
}
