/**
 * Short human-readable summaries of analyses (CLI text output, tooltips).
 */
import type { AnyAnalysis, AnyColumnAnalysis } from './analyze-table.ts';
import type { DriftAnalysis } from './drift-analysis.ts';
import { formatFigure, formatSignificance } from './format-figure.ts';
import { formatDuration, formatNumber, formatPlain, formatSi, formatSiWithUncertainty } from './format-si.ts';
import type { PushingAnalysis } from './pushing-analysis.ts';
import type { RunQuality } from './run-quality.ts';
import type { SweepAnalysisOf } from './sweep-types.ts';

function sweepLines(a: SweepAnalysisOf<unknown, unknown>): string[] {
  const t = a.tuningRange;
  const s = a.stall;
  const k = a.kvco;
  const lines = [
    `tuning range      ${formatSi(t.fMinHz, 'Hz')} at ${formatSi(t.vAtFMin, 'V')} … ${formatSi(t.fMaxHz, 'Hz')} at ${formatSi(t.vAtFMax, 'V')}`,
    `stall threshold   ${s.thresholdV === null ? (s.stalled ? 'whole range or above only' : 'none in range') : formatSiWithUncertainty(s.thresholdV, s.thresholdUncertaintyV, 'V')}`,
    `unstable below    ${s.unstableBelowV === null ? 'none found' : formatSiWithUncertainty(s.unstableBelowV, s.unstableBelowUncertaintyV, 'V')}`,
    `Kvco (line)       ${formatFigure(k.linear.slopeHzPerV, 'Hz/V', { uncertainty: k.linear.slopeUncertaintyHzPerV })}, R² ${formatNumber(k.linear.r2, 6)}, worst linearity error ${formatFigure(k.linear.maxLinearityErrorPct, '%', { digits: 3 })} over ${formatSi(k.linear.fromV, 'V')} … ${formatSi(k.linear.toV, 'V')}`,
    `Kvco min / max    ${formatFigure(k.minHzPerV, 'Hz/V', { uncertainty: k.minUncertaintyHzPerV })} at ${formatSi(k.vAtMin, 'V')} / ${formatFigure(k.maxHzPerV, 'Hz/V', { uncertainty: k.maxUncertaintyHzPerV })} at ${formatSi(k.vAtMax, 'V')} (over the window)`,
    `Kvco at ${formatSi(k.nominal.v, 'V')}   ${formatFigure(k.nominal.hzPerV, 'Hz/V', { uncertainty: k.nominal.uncertaintyHzPerV })}`,
  ];
  const z = a.usableRange.edgeZone;
  if (z) lines.push(`edge zone         ${formatSi(z.fromV, 'V')} … ${formatSi(z.toV, 'V')} left out: ${z.reason}`);
  const w = k.widestLinearRange;
  if (w)
    lines.push(`linear within ±${formatNumber(w.limitPct, 3)} %  ${formatSi(w.fromV, 'V')} … ${formatSi(w.toV, 'V')}`);
  const model =
    a.fit.model === 'spline'
      ? `cubic spline, ${formatNumber(a.fit.effectiveDegreesOfFreedom, 3)} effective parameters`
      : `polynomial degree ${a.fit.degree}`;
  lines.push(
    `fit               ${model} over ${formatSi(a.fit.fromV, 'V')} … ${formatSi(a.fit.toV, 'V')}, residual SD ${formatFigure(a.fit.residualStdDevHz, 'Hz', { digits: 2 })} against ${formatSi(a.fit.pointScatterHz, 'Hz', 2)} point scatter`,
  );
  lines.push(
    `window            ${formatSi(a.window.fromV, 'V')} … ${formatSi(a.window.toV, 'V')} (${a.window.source === 'auto' ? 'automatic usable range' : a.window.source === 'plan' ? "the plan's" : '--window'})`,
  );
  if (k.saturation)
    lines.push(`flattens above    ${formatSiWithUncertainty(k.saturation.edgeV, k.saturation.uncertaintyV, 'V')}`);
  if (a.hysteresis) {
    const h = a.hysteresis;
    lines.push(
      `hysteresis        edge ${h.thresholdDeltaV === null ? '—' : formatSiWithUncertainty(h.thresholdDeltaV, h.thresholdDeltaUncertaintyV, 'V')}, curve ${formatSi(h.curveMaxDeltaHz, 'Hz')} (${formatPlain(h.curveMaxDeltaPctOfSpan, '% of span')})`,
    );
  }
  return lines;
}

function driftLines(a: DriftAnalysis): string[] {
  const span = formatDuration(a.durationS);
  const gateHz = a.resolutionFloor !== null ? a.resolutionFloor * a.meanHz : null;
  const tempco =
    a.tempcoPpmPerC === null
      ? '— (temperature did not move enough)'
      : `${formatSignificance(a.tempcoPpmPerC, a.tempcoUncertaintyPpmPerC, 'ppm/°C', span)}${a.tempcoSignificant ? ` (${formatFigure(a.tempcoHzPerC, 'Hz/°C', { uncertainty: a.tempcoUncertaintyHzPerC })})` : ''}`;
  const warmUp = a.warmUp.settled
    ? formatDuration(a.warmUp.warmUpS)
    : a.warmUp.determined
      ? `not settled within ${a.warmUp.limitPpmPerHour} ppm/h`
      : `undetermined (log too short for ${a.warmUp.limitPpmPerHour} ppm/h)`;
  const lines = [
    `mean frequency    ${formatFigure(a.meanHz, 'Hz', { resolution: gateHz, digits: 9 })} over ${span}, ${a.samples} samples`,
    `tempco            ${tempco}`,
    `warm-up           ${warmUp}`,
    `drift after it    ${a.driftPpmPerHour === null ? '—' : formatSignificance(a.driftPpmPerHour, a.driftUncertaintyPpmPerHour, 'ppm/h', span)}`,
  ];
  if (a.loop)
    lines.push(
      `f–T loop          ${formatSi(a.loop.widthHz, 'Hz')} (${formatPlain(a.loop.widthPpm, 'ppm')}) at ${formatPlain(a.loop.atTemperatureC, '°C')}`,
    );
  lines.push('ADEV (overlapping, fractional frequency):');
  for (const p of a.adev) {
    lines.push(
      `  tau ${formatSi(p.tauS, 's', 3).padStart(9)}  ${formatNumber(p.adev, 3).padStart(9)}  (${p.terms} terms)${p.resolutionLimited ? '  resolution-limited (±1 count)' : ''}`,
    );
  }
  return lines;
}

function pushingLines(a: PushingAnalysis): string[] {
  const pushing = a.pushingSignificant
    ? `${formatFigure(a.pushingHzPerV, 'Hz/V', { uncertainty: a.pushingUncertaintyHzPerV })} (${formatPlain(a.pushingPpmPerV, 'ppm/V')})`
    : `not significant (${formatFigure(a.pushingHzPerV, 'Hz/V', { uncertainty: a.pushingUncertaintyHzPerV })})`;
  return [
    `pushing           ${pushing} at ${formatSi(a.nominalSupplyV, 'V')} supply`,
    `frequency there   ${formatSi(a.frequencyAtNominalHz, 'Hz', 7)}, R² ${formatNumber(a.r2, 6)}`,
  ];
}

function qualityLine(q: RunQuality): string {
  const parts = [
    `${q.settleTimeouts.count} settle timeout(s)`,
    `${q.failedReadings.count} failed reading(s)`,
    `${q.gaps} gap(s)`,
    `${q.linkRetries} link retr${q.linkRetries === 1 ? 'y' : 'ies'}`,
    `${q.faults} fault(s)`,
  ];
  if (q.unsettledPointsLeftOut > 0) parts.push(`${q.unsettledPointsLeftOut} unsettled point(s) left out of the fit`);
  return `data quality      ${parts.join(', ')}`;
}

export function summarizeAnalysis(a: AnyAnalysis | AnyColumnAnalysis): string {
  const lines = a.kind === 'sweep' ? sweepLines(a) : a.kind === 'drift' ? driftLines(a) : pushingLines(a);
  if (a.quality) lines.push(qualityLine(a.quality));
  const warnings = 'warnings' in a ? a.warnings : [];
  return [`${a.kind} analysis`, ...lines, ...warnings.map((w) => `note: ${w}`)].join('\n') + '\n';
}
