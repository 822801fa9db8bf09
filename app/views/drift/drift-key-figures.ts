/**
 * The drift screen's figures as text, through the one formatter: the same
 * words and digits as `tunebench analyze` (app/analysis/analysis-summary.ts).
 * A rate within 2σ of zero reads "not significant over N s (±σ)" and is never
 * bold; the mean frequency stops at the counter's resolution.
 */
import type { DriftAnalysis } from '../../analysis/drift-analysis.ts';
import { formatFigure, formatSignificance } from '../../analysis/format-figure.ts';
import { formatDuration } from '../../analysis/format-si.ts';
import { figure, setpointText, type FigureText } from '../figure-text.ts';

const WAITING = (holdV: number | null): FigureText[] => [
  figure('Control held at', setpointText(holdV), 'drift-hold'),
  figure('Mean frequency', '—', 'drift-mean'),
  figure('Tempco', '—', 'drift-tempco'),
  figure('Drift rate after warm-up', '—', 'drift-rate'),
  figure('Warm-up', '—', 'drift-warmup'),
  figure('Logged', '—', 'drift-count'),
];

function warmUpText(a: DriftAnalysis): string {
  if (a.warmUp.settled) return formatDuration(a.warmUp.warmUpS ?? 0);
  return a.warmUp.determined
    ? `not settled within ${formatFigure(a.warmUp.limitPpmPerHour, 'ppm/h', { digits: 3 })}`
    : `undetermined (log too short for ${formatFigure(a.warmUp.limitPpmPerHour, 'ppm/h', { digits: 3 })})`;
}

/** A rate or coefficient: "v ± u" when significant, else "not significant over <span> (±σ)", shown plain. */
function rateFigure(
  label: string,
  testId: string,
  value: number | null,
  sd: number | null,
  significant: boolean,
  unit: string,
  span: string,
  missing: string,
): FigureText {
  if (value === null) return figure(label, missing, testId, undefined, false);
  return figure(label, formatSignificance(value, sd, unit, span), testId, undefined, significant);
}

export function driftKeyFigures(a: DriftAnalysis | null, holdV: number | null): FigureText[] {
  if (!a) return WAITING(holdV);
  const span = formatDuration(a.durationS);
  const gateHz = a.resolutionFloor !== null ? a.resolutionFloor * a.meanHz : null;
  const tempco = rateFigure(
    'Tempco',
    'drift-tempco',
    a.tempcoPpmPerC,
    a.tempcoUncertaintyPpmPerC,
    a.tempcoSignificant,
    'ppm/°C',
    span,
    '— (temperature did not move enough)',
  );
  if (a.tempcoSignificant)
    tempco.note = formatFigure(a.tempcoHzPerC, 'Hz/°C', { uncertainty: a.tempcoUncertaintyHzPerC });
  const drift = rateFigure(
    'Drift rate after warm-up',
    'drift-rate',
    a.driftPpmPerHour,
    a.driftUncertaintyPpmPerHour,
    a.driftSignificant,
    'ppm/h',
    span,
    '—',
  );
  return [
    figure('Control held at', setpointText(holdV), 'drift-hold'),
    figure(
      'Mean frequency',
      formatFigure(a.meanHz, 'Hz', { resolution: gateHz, digits: 9 }),
      'drift-mean',
      gateHz !== null ? `to the counter's ${formatFigure(gateHz, 'Hz', { digits: 2 })} resolution` : undefined,
    ),
    tempco,
    drift,
    figure('Warm-up', warmUpText(a), 'drift-warmup'),
    figure('Logged', `${a.samples} readings over ${span}`, 'drift-count'),
  ];
}

/** ADEV in two series on the same τ: above the counter's ±1-count floor, and at or below it (resolution-limited). */
export function adevColumns(a: DriftAnalysis): { tauS: number[]; adev: (number | null)[]; limited: (number | null)[] } {
  return {
    tauS: a.adev.map((p) => p.tauS),
    // The line runs through every point; the limited ones get their own marker on top.
    adev: a.adev.map((p) => p.adev),
    limited: a.adev.map((p) => (p.resolutionLimited ? p.adev : null)),
  };
}
