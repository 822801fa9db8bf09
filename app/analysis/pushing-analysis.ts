/**
 * analyzePushing: frequency against the DUT's supply voltage at a fixed
 * control voltage → supply pushing in Hz/V and ppm/V.
 */
import { AnalysisError } from './analysis-error.ts';
import { derivativeStdDev, evalPoly, fitPolynomial } from './poly-fit.ts';
import { groupPoints, pointSummaries } from './sweep-points.ts';

export interface PushingInput {
  supplyV: Float64Array;
  frequencyHz: Float64Array;
  /** Control voltage held during the run (V), if known. */
  controlV?: number;
}

export interface PushingAnalysis {
  kind: 'pushing';
  pushingHzPerV: number;
  pushingUncertaintyHzPerV: number;
  /** |pushing| ≥ 2σ. */
  pushingSignificant: boolean;
  /** Hz/V relative to the frequency at the nominal supply, ×1e6. */
  pushingPpmPerV: number;
  nominalSupplyV: number;
  frequencyAtNominalHz: number;
  r2: number;
  controlV: number | null;
  points: { supplyV: number; meanHz: number; sdHz: number; readings: number; noOscillation: number }[];
}

/** Straight line through the per-supply-voltage means; nominal defaults to the middle. */
export function analyzePushing(input: PushingInput, nominalSupplyV?: number): PushingAnalysis {
  const pts = groupPoints({ controlV: input.supplyV, frequencyHz: input.frequencyHz }, 'up');
  const v: number[] = [];
  const f: number[] = [];
  for (let i = 0; i < pts.count; i++) {
    if ((pts.nOsc[i] as number) === 0) continue;
    v.push(pts.v[i] as number);
    f.push(pts.meanHz[i] as number);
  }
  if (v.length < 2) throw new AnalysisError(`pushing needs oscillation at ≥ 2 supply voltages (got ${v.length})`);
  const vs = Float64Array.from(v);
  const line = fitPolynomial(vs, Float64Array.from(f), 0, v.length, 1);
  const nominal = nominalSupplyV ?? ((v[0] as number) + (v[v.length - 1] as number)) / 2;
  const fNom = evalPoly(line, nominal);
  const slope = line.coefficients[1] as number;
  const sd = v.length > 2 ? derivativeStdDev(line, nominal) : NaN;
  const points: PushingAnalysis['points'] = pointSummaries(pts).map(({ v: supplyV, ...rest }) => ({
    supplyV,
    ...rest,
  }));
  return {
    kind: 'pushing',
    pushingHzPerV: slope,
    pushingUncertaintyHzPerV: sd,
    pushingSignificant: Number.isFinite(sd) ? Math.abs(slope) >= 2 * sd : Number.isFinite(slope),
    pushingPpmPerV: (slope / fNom) * 1e6,
    nominalSupplyV: nominal,
    frequencyAtNominalHz: fNom,
    r2: line.rSquared,
    controlV: input.controlV ?? null,
    points,
  };
}
