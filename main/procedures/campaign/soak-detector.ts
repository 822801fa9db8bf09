/**
 * Soak judgement, pure: fed (time, DUT temperature[, frequency]) readings,
 * it says when the DUT has soaked. Soaked means, over the last `dwellS`:
 * every DUT reading within ±toleranceC of the setpoint, the least-squares
 * slope of the DUT temperature under maxSlopeCPerMin, and — when asked — the
 * least-squares slope of the frequency under maxDriftPpmPerMin of its mean.
 * The window must span the whole dwell; an out-of-tolerance reading restarts it.
 */

export interface SoakCriteria {
  setpointC: number;
  toleranceC: number;
  maxSlopeCPerMin: number;
  dwellS: number;
  maxDriftPpmPerMin?: number | undefined;
}

export interface SoakReading {
  timeS: number;
  dutC: number;
  frequencyHz?: number | undefined;
}

export interface SoakVerdict {
  soaked: boolean;
  /** Seconds the readings have been inside the tolerance band without a break. */
  inBandS: number;
  slopeCPerMin: number | null;
  driftPpmPerMin: number | null;
}

/** Least-squares slope of y over t (per second); null with fewer than 2 distinct times. */
export function slopePerS(t: readonly number[], y: readonly number[]): number | null {
  const n = t.length;
  if (n < 2) return null;
  let mt = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mt += t[i] as number;
    my += y[i] as number;
  }
  mt /= n;
  my /= n;
  let stt = 0;
  let sty = 0;
  for (let i = 0; i < n; i++) {
    const dt = (t[i] as number) - mt;
    stt += dt * dt;
    sty += dt * ((y[i] as number) - my);
  }
  return stt > 0 ? sty / stt : null;
}

export class SoakDetector {
  readonly criteria: SoakCriteria;
  #window: SoakReading[] = [];

  constructor(criteria: SoakCriteria) {
    this.criteria = criteria;
  }

  add(reading: SoakReading): SoakVerdict {
    const c = this.criteria;
    if (Math.abs(reading.dutC - c.setpointC) > c.toleranceC) this.#window = [];
    else this.#window.push(reading);
    // Keep the dwell plus the reading just before it, so the window spans the dwell.
    const last = this.#window[this.#window.length - 1];
    if (last !== undefined) {
      while (this.#window.length > 2 && last.timeS - (this.#window[1] as SoakReading).timeS >= c.dwellS)
        this.#window.shift();
    }
    const w = this.#window;
    const inBandS = w.length === 0 ? 0 : (w[w.length - 1] as SoakReading).timeS - (w[0] as SoakReading).timeS;
    const times = w.map((r) => r.timeS);
    const slope = slopePerS(
      times,
      w.map((r) => r.dutC),
    );
    const slopeCPerMin = slope === null ? null : slope * 60;
    let driftPpmPerMin: number | null = null;
    if (c.maxDriftPpmPerMin !== undefined) {
      const withF = w.filter((r) => r.frequencyHz !== undefined && Number.isFinite(r.frequencyHz) && r.frequencyHz > 0);
      const fSlope = slopePerS(
        withF.map((r) => r.timeS),
        withF.map((r) => r.frequencyHz as number),
      );
      const mean = withF.reduce((s, r) => s + (r.frequencyHz as number), 0) / Math.max(1, withF.length);
      driftPpmPerMin = fSlope === null || !(mean > 0) ? null : (fSlope / mean) * 1e6 * 60;
    }
    const soaked =
      inBandS >= c.dwellS &&
      slopeCPerMin !== null &&
      Math.abs(slopeCPerMin) <= c.maxSlopeCPerMin &&
      (c.maxDriftPpmPerMin === undefined ||
        (driftPpmPerMin !== null && Math.abs(driftPpmPerMin) <= c.maxDriftPpmPerMin));
    return { soaked, inBandS, slopeCPerMin, driftPpmPerMin };
  }
}
