/**
 * Result of analyzeSweep. The keys named in CONTRACTS.md (`analyze --json`)
 * are stable; the others are additions. The per-point parts (`points`,
 * `kvco.local`) come in two shapes: rows of objects (SweepAnalysis: the app,
 * tests) or columns (SweepColumnAnalysis, sweep-columns.ts: the CLI, which
 * writes a million-point sweep without making a million objects).
 */
import type { Direction } from './sweep-points.ts';
import type { LinearSummary, LocalKvco, WidestRange } from './sweep-gain.ts';
import type { Hysteresis } from './sweep-hysteresis.ts';
import type { LocalKvcoColumns, SweepPointColumns, SweepPointRow } from './sweep-columns.ts';

export type SweepAnalysis = SweepAnalysisOf<SweepPointRow[], LocalKvco[]>;
export type SweepColumnAnalysis = SweepAnalysisOf<SweepPointColumns, LocalKvcoColumns>;

/** The result with its per-point parts of type Points (`points`) and Local (`kvco.local`). */
export interface SweepAnalysisOf<Points, Local> {
  kind: 'sweep';
  /** Direction the headline figures come from ('up' when the run has it). */
  primaryDirection: Direction;
  tuningRange: {
    fMinHz: number;
    fMaxHz: number;
    vAtFMin: number;
    vAtFMax: number;
    fMinUncertaintyHz: number;
    fMaxUncertaintyHz: number;
  };
  stall: {
    stalled: boolean;
    thresholdV: number | null;
    unstableBelowV: number | null;
    thresholdUncertaintyV: number | null;
    unstableBelowUncertaintyV: number | null;
    upperStallV: number | null;
    medianRelativeScatter: number | null;
  };
  kvco: {
    linear: LinearSummary;
    local: Local;
    minHzPerV: number;
    maxHzPerV: number;
    minUncertaintyHzPerV: number;
    maxUncertaintyHzPerV: number;
    vAtMin: number;
    vAtMax: number;
    /** Kvco at the window's middle (or `--nominal`): the typical figure. */
    typHzPerV: number;
    typUncertaintyHzPerV: number;
    maxToMinRatio: number;
    /** Control voltage where the tuning curve turns back (usable range ends there); null if monotonic. */
    turnsBackAboveV: number | null;
    /** Control voltage above which the tuning curve is flat (Kvco below 10 % of its median); null if it is not. */
    flatAboveV: number | null;
    /** Where the curve flattens (between the last usable point and the next), ± half the step; null if it does not. */
    saturation: { edgeV: number; uncertaintyV: number } | null;
    /** Points inside the window where the measured curve falls back beyond 2σ (Kvco changes sign): a finding. */
    signChangeAtV: number[];
    nominal: { v: number; hzPerV: number; uncertaintyHzPerV: number };
    widestLinearRange: WidestRange | null;
  };
  fit: {
    model: 'spline' | 'poly';
    /** 3 for the (cubic) spline. */
    degree: number;
    /** f(V) = Σ cᵢ·Vⁱ (poly only; empty for the spline — use `curve`). */
    coefficients: number[];
    coefficientStdDev: number[];
    selection: string;
    residualStdDevHz: number;
    /** RMS uncertainty of the fitted points' means (reading scatter and ±1 count): what the residual SD is judged against. */
    pointScatterHz: number;
    effectiveDegreesOfFreedom: number;
    /** Smoothing λ chosen by GCV (spline); null for a polynomial. */
    smoothing: number | null;
    monotone: 'rising' | 'falling' | null;
    r2: number;
    /** The range the model was fitted over (see `--fit-range`). */
    fromV: number;
    toV: number;
    points: number;
    /** Points that never settled and were left out (see `--keep-unsettled`). */
    unsettledLeftOutV: number[];
    /** The fitted curve and its 1σ band on an even grid over fromV…toV. */
    curve: { v: number[]; hz: number[]; sdHz: number[] };
  };
  /** The tuning window Kvco min/max/typ and linearity are taken over. */
  window: { fromV: number; toV: number; source: 'plan' | 'flag' | 'auto' };
  /** The automatic usable range (stable, above the stall edge's zone, before a turn or flat top). */
  usableRange: {
    fromV: number;
    toV: number;
    /** Points just above the stall edge left out because the slope changes faster than the step resolves (sweep-edge-zone.ts); null when none. */
    edgeZone: {
      fromV: number;
      toV: number;
      /** Largest change of chord slope per regular step inside the zone, % (null if only unsteady points were there). */
      slopeChangePct: number | null;
      /** The limit, % per step. */
      limitPct: number;
      stepV: number;
      reason: string;
    } | null;
  };
  points: Points;
  hysteresis: Hysteresis | null;
  counter: { gateS: number | null; resolutionHz: number | null };
  warnings: string[];
}
