/**
 * Thermal truth of the simulated chamber and the DUT inside it.
 *
 * - While the chamber runs, its internal target moves toward the setpoint at
 *   the ramp-rate limit; the air follows that target with a first-order lag
 *   (time constant `airTauS`), or, when `overshootFraction` > 0, as a damped
 *   second-order system with that fractional overshoot on a step. The
 *   damping ratio from the overshoot is ζ = −ln(OS)/√(π² + ln²(OS)) (the
 *   standard second-order step-response relation, common practice).
 * - While it is stopped the air relaxes toward the lab's ambient.
 * - The DUT follows the air through its own first-order lag (`dutTauS`).
 * - Until the chamber has first been run, the DUT simply sits in lab air and
 *   its temperature is the ambient itself (so benches without a campaign
 *   behave as before).
 * State is advanced in steps of at most `maxStepS` (≤ τ/10 for stability).
 */

export interface ChamberThermalParams {
  /** Lab air around the chamber, °C, at clock time tS. */
  ambientCAt: (tS: number) => number;
  airTauS: number;
  dutTauS: number;
  overshootFraction: number;
  /** The chamber's own fastest ramp, °C/min (its ramp-rate setting is capped here). */
  hardwareRampCPerMin: number;
}

export interface ChamberThermalState {
  running: boolean;
  setpointC: number;
  rampCPerMin: number;
  /** Where the ramp has got to. */
  rampTargetC: number;
  airC: number;
  dutC: number;
}

export function dampingFromOvershoot(overshoot: number): number {
  if (!(overshoot > 0)) return 1;
  const l = Math.log(overshoot);
  return -l / Math.sqrt(Math.PI * Math.PI + l * l);
}

export class ChamberThermal {
  readonly #p: ChamberThermalParams;
  readonly #zeta: number;
  #atS: number;
  #everRun = false;
  #running = false;
  #setpointC: number;
  #rampCPerMin: number;
  #target: number;
  #air: number;
  #airRate = 0;
  #dut: number;

  constructor(params: ChamberThermalParams, startS: number) {
    this.#p = params;
    this.#zeta = dampingFromOvershoot(params.overshootFraction);
    this.#atS = startS;
    const ambient = params.ambientCAt(startS);
    this.#setpointC = Math.round(ambient * 10) / 10;
    this.#rampCPerMin = params.hardwareRampCPerMin;
    this.#target = ambient;
    this.#air = ambient;
    this.#dut = ambient;
  }

  advanceTo(tS: number): void {
    if (tS <= this.#atS) return;
    if (!this.#everRun) {
      this.#atS = tS;
      this.#air = this.#dut = this.#target = this.#p.ambientCAt(tS);
      return;
    }
    const maxStep = Math.min(1, this.#p.airTauS / 10, this.#p.dutTauS / 10);
    while (this.#atS < tS) {
      const h = Math.min(maxStep, tS - this.#atS);
      const t = this.#atS + h;
      let u: number;
      if (this.#running) {
        const rate = (Math.min(this.#rampCPerMin, this.#p.hardwareRampCPerMin) / 60) * h;
        const gap = this.#setpointC - this.#target;
        this.#target += Math.abs(gap) <= rate ? gap : Math.sign(gap) * rate;
        u = this.#target;
      } else {
        u = this.#p.ambientCAt(t);
        this.#target = this.#air;
      }
      if (this.#zeta >= 1) {
        this.#air += (u - this.#air) * (1 - Math.exp(-h / this.#p.airTauS));
        this.#airRate = 0;
      } else {
        // Semi-implicit Euler on x'' = ωn²(u − x) − 2ζωn·x'; stable for h·ωn ≤ 0.1.
        const wn = 1 / this.#p.airTauS;
        this.#airRate += h * (wn * wn * (u - this.#air) - 2 * this.#zeta * wn * this.#airRate);
        this.#air += h * this.#airRate;
      }
      this.#dut += (this.#air - this.#dut) * (1 - Math.exp(-h / this.#p.dutTauS));
      this.#atS = t;
    }
  }

  setSetpoint(tS: number, celsius: number): void {
    this.advanceTo(tS);
    this.#setpointC = celsius;
  }

  setRamp(tS: number, cPerMin: number): void {
    this.advanceTo(tS);
    this.#rampCPerMin = cPerMin;
  }

  setRunning(tS: number, on: boolean): void {
    this.advanceTo(tS);
    if (on && !this.#running) {
      this.#everRun = true;
      this.#target = this.#air;
    }
    this.#running = on;
  }

  airCAt(tS: number): number {
    this.advanceTo(tS);
    return this.#air;
  }

  dutCAt(tS: number): number {
    this.advanceTo(tS);
    return this.#dut;
  }

  state(tS: number): ChamberThermalState {
    this.advanceTo(tS);
    return {
      running: this.#running,
      setpointC: this.#setpointC,
      rampCPerMin: this.#rampCPerMin,
      rampTargetC: this.#target,
      airC: this.#air,
      dutC: this.#dut,
    };
  }
}
