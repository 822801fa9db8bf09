/**
 * What the sweep plots' cursor read-outs may say, series by series: control
 * setpoints to the supply's setting resolution, single counter readings to
 * 1/gate, the fitted curve with its 1σ band, local Kvco and residuals with
 * their own uncertainties (app/plots/readout.ts). Pure, so a test scans the
 * texts a screen would show on a real analysis.
 */
import { meanReadingUncertainty } from '../../analysis/point-uncertainty.ts';
import type { SweepAnalysis } from '../../analysis/sweep-types.ts';
import { counterReadout, voltsReadout, type Readout } from '../../plots/readout.ts';
import { alongCurve, type GainColumns } from './sweep-figures.ts';

export interface SweepReadouts {
  control: Readout;
  /** One counter reading (the rising and falling points). */
  reading: Readout;
  /** The fitted curve on the plot's x column (`x(i)`), ± its 1σ band there. */
  fit: Readout;
  kvco: Readout;
  residual: Readout;
}

/** Linear interpolation of the fit's 1σ band at `v`; null outside the fitted range. */
export function fitSdAt(analysis: SweepAnalysis, v: number): number | null {
  const { v: grid, sdHz } = analysis.fit.curve;
  if (grid.length === 0 || v < (grid[0] as number) - 1e-12 || v > (grid[grid.length - 1] as number) + 1e-12)
    return null;
  return alongCurve(grid, sdHz, v);
}

/** Each point's 1σ in the order `residualColumns` lists them: mean of its readings and ±1 count (no fit term). */
export function residualUncertainty(analysis: SweepAnalysis, gateS: number | null | undefined): number[] {
  return analysis.points
    .filter((p) => Number.isFinite(p.meanHz))
    .sort((a, b) => a.v - b.v)
    .map((p) => meanReadingUncertainty(p.sdHz, p.readings - p.noOscillation, gateS));
}

export function sweepReadouts(
  analysis: SweepAnalysis | null,
  gateS: number | null | undefined,
  x: (index: number) => number | undefined,
  gain: GainColumns | null,
  residualU: readonly number[] | null,
): SweepReadouts {
  const reading = counterReadout(gateS);
  return {
    control: voltsReadout,
    reading,
    fit: analysis
      ? counterReadout(gateS, (i) => {
          const v = x(i);
          return v === undefined ? null : fitSdAt(analysis, v);
        })
      : reading,
    // Local Kvco without a gate still carries its own uncertainty; 3 digits only where it has none.
    kvco: { unit: 'Hz/V', uncertaintyAt: (i) => gain?.u[i] ?? null, digits: 3 },
    residual: counterReadout(gateS, (i) => residualU?.[i] ?? null),
  };
}
