/**
 * Result of analyzeSweep. The keys named in CONTRACTS.md (`analyze --json`)
 * are stable; the others are additions.
 */
import type { Direction } from './sweep-points.ts';
import type { LinearSummary, LocalKvco, WidestRange } from './sweep-gain.ts';
import type { Hysteresis } from './sweep-hysteresis.ts';

export interface SweepAnalysis {
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
    local: LocalKvco[];
    minHzPerV: number;
    maxHzPerV: number;
    minUncertaintyHzPerV: number;
    maxUncertaintyHzPerV: number;
    vAtMin: number;
    vAtMax: number;
    maxToMinRatio: number;
    /** Control voltage where the tuning curve turns back (usable range ends there); null if monotonic. */
    turnsBackAboveV: number | null;
    /** Control voltage above which the tuning curve is flat (Kvco below 10 % of its median); null if it is not. */
    flatAboveV: number | null;
    nominal: { v: number; hzPerV: number; uncertaintyHzPerV: number };
    widestLinearRange: WidestRange | null;
  };
  fit: {
    model: 'poly';
    degree: number;
    coefficients: number[];
    coefficientStdDev: number[];
    selection: string;
    residualStdDevHz: number;
    r2: number;
    fromV: number;
    toV: number;
    points: number;
  };
  points: { v: number; meanHz: number; sdHz: number; readings: number; noOscillation: number; unstable: boolean }[];
  hysteresis: Hysteresis | null;
  counter: { gateS: number | null; resolutionHz: number | null };
  warnings: string[];
}
