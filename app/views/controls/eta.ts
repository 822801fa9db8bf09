/**
 * A steady time-left estimate. Before the run has a measured pace, the plan
 * says it: each sweep point is its readings (gate plus a little command
 * overhead) plus its settling — a fixed wait, or with automatic settling
 * about four time constants of the tuning port once the probe has learned τ
 * (a first-order step settles to 2 % in ln 50 ≈ 3.9 τ), half the longest wait
 * before that. A drift log is its remaining readings × interval. Main's
 * measured ETA takes over after a few points. The shown value counts down
 * with the run's clock and moves a quarter of the way toward each new
 * estimate, so it neither jumps nor freezes.
 */

/** Time per command round trip beyond the gate, s (common practice for SCPI over USB/LAN: tens of ms; from memory). */
const OVERHEAD_S = 0.05;

export function planPointS(plan: unknown, tauS: number | null): number | null {
  if (!plan || typeof plan !== 'object') return null;
  const p = plan as {
    readingsPerPoint?: unknown;
    gateS?: unknown;
    intervalS?: unknown;
    settle?: { mode?: unknown; maxS?: unknown; seconds?: unknown };
  };
  if (typeof p.intervalS === 'number') return p.intervalS;
  const readings = typeof p.readingsPerPoint === 'number' ? p.readingsPerPoint : 3;
  const gateS = typeof p.gateS === 'number' ? p.gateS : 0.1;
  const settle = p.settle;
  let settleS = 0;
  if (settle?.mode === 'fixed' && typeof settle.seconds === 'number') settleS = settle.seconds;
  else if (settle?.mode === 'auto') {
    const maxS = typeof settle.maxS === 'number' ? settle.maxS : 2;
    settleS = tauS !== null && tauS > 0 ? Math.min(maxS, Math.log(50) * tauS) : maxS / 2;
  }
  return readings * (gateS + OVERHEAD_S) + settleS;
}

export interface ShownEta {
  etaS: number;
  /** Run clock when it was shown, s. */
  atS: number;
}

/** Main's measured ETA once this many points are done; before that the plan's. */
export const MEASURED_AFTER_POINTS = 3;

export function estimateS(
  remaining: number,
  done: number,
  measuredEtaS: number | null,
  perPointS: number | null,
): number | null {
  if (remaining <= 0) return 0;
  if (measuredEtaS !== null && done >= MEASURED_AFTER_POINTS) return measuredEtaS;
  return perPointS === null ? measuredEtaS : remaining * perPointS;
}

export function nextEta(previous: ShownEta | null, estimate: number | null, nowS: number): ShownEta | null {
  if (previous === null) return estimate === null ? null : { etaS: estimate, atS: nowS };
  const counted = Math.max(0, previous.etaS - Math.max(0, nowS - previous.atS));
  if (estimate === null) return { etaS: counted, atS: nowS };
  if (estimate === 0) return { etaS: 0, atS: nowS };
  return { etaS: counted + 0.25 * (estimate - counted), atS: nowS };
}

export interface EtaInputs {
  /** Points (or readings) planned; 0 while the run has not said yet. */
  total: number;
  done: number;
  measuredEtaS: number | null;
  plan: unknown;
  /** The tuning port's time constant once the settle probe learned it, s. */
  tauS: number | null;
  /** The run's clock at its latest reading, s. */
  runClockS: number;
}

/**
 * The time left to show now, given what was shown before (null at a run's start). Before the run has said
 * how many points it plans there is nothing to estimate: the answer is "unknown", never 0 s (a 0 shown
 * first would then only creep toward the real figure).
 */
export function shownEta(previous: ShownEta | null, inputs: EtaInputs): ShownEta | null {
  const estimate =
    inputs.total > 0
      ? estimateS(
          Math.max(0, inputs.total - inputs.done),
          inputs.done,
          inputs.measuredEtaS,
          planPointS(inputs.plan, inputs.tauS),
        )
      : null;
  if (previous !== null && inputs.runClockS === previous.atS && estimate !== null && estimate !== 0) return previous;
  return nextEta(previous, estimate, inputs.runClockS);
}
