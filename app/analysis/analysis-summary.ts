/**
 * Short human-readable summaries of analyses (CLI text output, tooltips).
 */
import type { AnyAnalysis } from './analyze-table.ts';
import type { DriftAnalysis } from './drift-analysis.ts';
import { formatDuration, formatNumber, formatPlain, formatSi, formatSiWithUncertainty } from './format-si.ts';
import type { PushingAnalysis } from './pushing-analysis.ts';
import type { RunQuality } from './run-quality.ts';
import type { SweepAnalysis } from './sweep-types.ts';

function sweepLines(a: SweepAnalysis): string[] {
  const t = a.tuningRange;
  const s = a.stall;
  const k = a.kvco;
  const lines = [
    `tuning range      ${formatSi(t.fMinHz, 'Hz')} at ${formatSi(t.vAtFMin, 'V')} … ${formatSi(t.fMaxHz, 'Hz')} at ${formatSi(t.vAtFMax, 'V')}`,
    `stall threshold   ${s.thresholdV === null ? (s.stalled ? 'whole range or above only' : 'none in range') : formatSiWithUncertainty(s.thresholdV, s.thresholdUncertaintyV, 'V')}`,
    `unstable below    ${s.unstableBelowV === null ? 'none found' : formatSiWithUncertainty(s.unstableBelowV, s.unstableBelowUncertaintyV, 'V')}`,
    `Kvco (line)       ${formatSiWithUncertainty(k.linear.slopeHzPerV, k.linear.slopeUncertaintyHzPerV, 'Hz/V')}, R² ${formatNumber(k.linear.r2, 6)}, worst linearity error ${formatPlain(k.linear.maxLinearityErrorPct, '%')} over ${formatSi(k.linear.fromV, 'V')} … ${formatSi(k.linear.toV, 'V')}`,
    `Kvco min / max    ${formatSi(k.minHzPerV, 'Hz/V')} / ${formatSi(k.maxHzPerV, 'Hz/V')} (ratio ${formatNumber(k.maxToMinRatio, 3)})`,
    `Kvco at ${formatSi(k.nominal.v, 'V')}   ${formatSiWithUncertainty(k.nominal.hzPerV, k.nominal.uncertaintyHzPerV, 'Hz/V')}`,
  ];
  const w = k.widestLinearRange;
  if (w) lines.push(`linear within ±${formatNumber(w.limitPct, 3)} %  ${formatSi(w.fromV, 'V')} … ${formatSi(w.toV, 'V')}`);
  const model = a.fit.model === 'spline' ? `cubic spline, ${formatNumber(a.fit.effectiveDegreesOfFreedom, 3)} effective parameters` : `polynomial degree ${a.fit.degree}`;
  lines.push(`fit               ${model} over ${formatSi(a.fit.fromV, 'V')} … ${formatSi(a.fit.toV, 'V')}, residual SD ${formatSi(a.fit.residualStdDevHz, 'Hz', 2)} against ${formatSi(a.fit.pointScatterHz, 'Hz', 2)} point scatter`);
  lines.push(`window            ${formatSi(a.window.fromV, 'V')} … ${formatSi(a.window.toV, 'V')} (${a.window.source === 'auto' ? 'automatic usable range' : a.window.source === 'plan' ? "the plan's" : '--window'})`);
  if (k.saturation) lines.push(`flattens above    ${formatSiWithUncertainty(k.saturation.edgeV, k.saturation.uncertaintyV, 'V')}`);
  if (a.hysteresis) {
    const h = a.hysteresis;
    lines.push(
      `hysteresis        edge ${h.thresholdDeltaV === null ? '—' : formatSiWithUncertainty(h.thresholdDeltaV, h.thresholdDeltaUncertaintyV, 'V')}, curve ${formatSi(h.curveMaxDeltaHz, 'Hz')} (${formatPlain(h.curveMaxDeltaPctOfSpan, '% of span')})`,
    );
  }
  return lines;
}

function driftLines(a: DriftAnalysis): string[] {
  const lines = [
    `mean frequency    ${formatSi(a.meanHz, 'Hz', 9)} over ${formatNumber(a.durationS / 3600, 3)} h, ${a.samples} samples`,
    `tempco            ${a.tempcoPpmPerC === null ? '— (temperature did not move enough)' : `${formatPlain(a.tempcoPpmPerC, 'ppm/°C')} ± ${formatPlain(a.tempcoUncertaintyPpmPerC, 'ppm/°C', 2)} (${formatSi(a.tempcoHzPerC, 'Hz/°C')})`}`,
    `warm-up           ${a.warmUp.settled ? formatDuration(a.warmUp.warmUpS) : `not settled within ${a.warmUp.limitPpmPerHour} ppm/h`}`,
    `drift after it    ${formatPlain(a.driftPpmPerHour, 'ppm/h')}${a.driftUncertaintyPpmPerHour !== null ? ` ± ${formatPlain(a.driftUncertaintyPpmPerHour, 'ppm/h', 2)}` : ''}`,
  ];
  if (a.loop) lines.push(`f–T loop          ${formatSi(a.loop.widthHz, 'Hz')} (${formatPlain(a.loop.widthPpm, 'ppm')}) at ${formatPlain(a.loop.atTemperatureC, '°C')}`);
  lines.push('ADEV (overlapping, fractional frequency):');
  for (const p of a.adev) lines.push(`  tau ${formatSi(p.tauS, 's', 3).padStart(9)}  ${formatNumber(p.adev, 3).padStart(9)}  (${p.terms} terms)`);
  return lines;
}

function pushingLines(a: PushingAnalysis): string[] {
  return [
    `pushing           ${formatSiWithUncertainty(a.pushingHzPerV, a.pushingUncertaintyHzPerV, 'Hz/V')} (${formatPlain(a.pushingPpmPerV, 'ppm/V')}) at ${formatSi(a.nominalSupplyV, 'V')} supply`,
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

export function summarizeAnalysis(a: AnyAnalysis): string {
  const lines = a.kind === 'sweep' ? sweepLines(a) : a.kind === 'drift' ? driftLines(a) : pushingLines(a);
  if (a.quality) lines.push(qualityLine(a.quality));
  const warnings = 'warnings' in a ? a.warnings : [];
  return [`${a.kind} analysis`, ...lines, ...warnings.map((w) => `note: ${w}`)].join('\n') + '\n';
}
