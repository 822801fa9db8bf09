/**
 * A stored supply-pushing run → its analysis and the columns of its plot:
 * mean frequency at each DUT supply voltage and the fitted Hz/V line on the
 * same x. Pure; the run is small (a handful of supply steps), so it is
 * analysed on the page.
 */
import { analyzePushing, type PushingAnalysis } from '../../analysis/pushing-analysis.ts';
import { outcomeOf, type AnalysisOutcome } from '../../state/analysis-outcome.ts';
import { pushingInputFromColumns } from '../../state/column-inputs.ts';
import type { ColumnSet } from '../../state/columns.ts';
import { formatFigure } from '../../analysis/format-figure.ts';
import { figure, setpointText, type FigureText } from '../figure-text.ts';
import { meanReadingUncertainty } from '../../analysis/point-uncertainty.ts';
import { counterReadout, voltsReadout, type Readout } from '../../plots/readout.ts';

export type PushingOutcome = AnalysisOutcome<PushingAnalysis>;

export function analyzePushingColumns(columns: ColumnSet, n: number): PushingOutcome {
  return outcomeOf(() => analyzePushing(pushingInputFromColumns(columns, n)));
}

export interface PushingPlotColumns {
  supplyV: number[];
  /** Mean of the oscillating readings; null where none oscillated. */
  meanHz: (number | null)[];
  /** The least-squares line f(V) = f(nominal) + Hz/V·(V − nominal). */
  lineHz: number[];
  /** 1σ of each mean: its readings' standard error and ±1 count of the gate. */
  meanU: number[];
}

export function pushingPlotColumns(analysis: PushingAnalysis, gateS?: number): PushingPlotColumns {
  const points = [...analysis.points].sort((a, b) => a.supplyV - b.supplyV);
  const line = (v: number) => analysis.frequencyAtNominalHz + analysis.pushingHzPerV * (v - analysis.nominalSupplyV);
  return {
    supplyV: points.map((p) => p.supplyV),
    meanHz: points.map((p) => (Number.isFinite(p.meanHz) ? p.meanHz : null)),
    lineHz: points.map((p) => line(p.supplyV)),
    meanU: points.map((p) => meanReadingUncertainty(p.sdHz, p.readings - p.noOscillation, gateS)),
  };
}

/** The pushing plot's read-outs: supply setpoints to the supply's resolution, means with their 1σ, the line to 1/gate. */
export function pushingReadouts(
  plot: PushingPlotColumns,
  gateS?: number,
): { supply: Readout; mean: Readout; line: Readout } {
  return {
    supply: voltsReadout,
    mean: counterReadout(gateS, (i) => plot.meanU[i] ?? null),
    line: counterReadout(gateS),
  };
}

/**
 * The pushing figures as text, through the one formatter: Hz/V ± u, ppm/V with
 * the same relative uncertainty, "not significant (±σ)" within 2σ (never bold).
 */
export function pushingKeyFigures(a: PushingAnalysis | null): FigureText[] {
  if (!a) {
    return [
      figure('Pushing', '—', 'pushing-hz-per-v'),
      figure('Pushing, relative', '—', 'pushing-ppm-per-v'),
      figure('Nominal supply', '—', 'pushing-nominal'),
      figure('Supply steps', '—', 'pushing-steps'),
    ];
  }
  const ppmU =
    a.pushingHzPerV !== 0 ? Math.abs((a.pushingUncertaintyHzPerV / a.pushingHzPerV) * a.pushingPpmPerV) : NaN;
  const significant = a.pushingSignificant;
  // The line's value mid-range is known to about the points' mean scatter over √(number of steps).
  const scatter = a.points.filter((p) => p.readings > 1 && Number.isFinite(p.sdHz));
  const fU =
    scatter.length > 0
      ? Math.sqrt(scatter.reduce((sum, p) => sum + (p.sdHz * p.sdHz) / p.readings, 0) / scatter.length) /
        Math.sqrt(a.points.length)
      : null;
  return [
    figure(
      'Pushing',
      significant
        ? formatFigure(a.pushingHzPerV, 'Hz/V', { uncertainty: a.pushingUncertaintyHzPerV })
        : `not significant (±${formatFigure(a.pushingUncertaintyHzPerV, 'Hz/V', { digits: 2 })})`,
      'pushing-hz-per-v',
      undefined,
      significant,
    ),
    figure(
      'Pushing, relative',
      significant
        ? formatFigure(a.pushingPpmPerV, 'ppm/V', { uncertainty: ppmU })
        : `not significant (±${formatFigure(ppmU, 'ppm/V', { digits: 2 })})`,
      'pushing-ppm-per-v',
      undefined,
      significant,
    ),
    figure(
      'Nominal supply',
      setpointText(a.nominalSupplyV),
      'pushing-nominal',
      `f there ${formatFigure(a.frequencyAtNominalHz, 'Hz', fU ? { uncertainty: fU } : { digits: 7 })}`,
    ),
    figure('Supply steps', String(a.points.length), 'pushing-steps'),
  ];
}
