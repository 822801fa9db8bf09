/**
 * Where the tuning port was, from the control voltages written since
 * switch-on, once its time constant τ is known: a first-order lag (common
 * practice for an RC-filtered tuning line) answers each step ΔV written at
 * t_k with ΔV·(1 − e^(−(t − t_k)/τ)), and the steps add (superposition of a
 * linear system). The port starts at 0 V when the output comes on.
 *
 * A sweep uses it to judge a "no signal" read before τ was known: it says
 * the DUT stalls at the voltage the port had then, which is the point's own
 * only once the port had come within e^(−3) (5 %) of its step — the rule the
 * watching uses after a single step (settle.ts), here with every earlier
 * step that was still on its way counted too.
 */

/** The control voltages written, in order: the first at switch-on (the port then at 0 V). */
export class PortHistory {
  readonly #timesS: number[] = [];
  readonly #volts: number[] = [];

  /** A write of `volts` at clock time `atS` (no earlier than the previous one); the same voltage again is no step. */
  write(atS: number, volts: number): void {
    if (this.#volts.length > 0 && this.#volts[this.#volts.length - 1] === volts) return;
    this.#timesS.push(atS);
    this.#volts.push(volts);
  }

  get length(): number {
    return this.#timesS.length;
  }

  /** The port's voltage at clock time `atS`, for a lag of `tauS`. */
  portV(atS: number, tauS: number): number {
    let v = 0;
    let before = 0;
    for (let k = 0; k < this.#timesS.length; k++) {
      const t = this.#timesS[k] as number;
      if (t > atS) break;
      const target = this.#volts[k] as number;
      v += (target - before) * -Math.expm1(-(atS - t) / tauS);
      before = target;
    }
    return v;
  }

  /** The setpoint written last at or before `atS`, and the one before it (0 V before switch-on). */
  setpointsAt(atS: number): { now: number; before: number } {
    let now = 0;
    let before = 0;
    for (let k = 0; k < this.#timesS.length && (this.#timesS[k] as number) <= atS; k++) {
      before = now;
      now = this.#volts[k] as number;
    }
    return { now, before };
  }
}

/** Part of its own step a point's port still had to go at `atS` (0 when there, 1 when not yet moved). */
export function stepLeftFraction(history: PortHistory, atS: number, tauS: number): number {
  const { now, before } = history.setpointsAt(atS);
  const stepV = Math.abs(now - before);
  if (stepV === 0) return 0;
  return Math.abs(now - history.portV(atS, tauS)) / stepV;
}

/** What is left of a step after 3τ (e^(−3) ≈ 5 %): below it a "no signal" is believed. */
export const NO_SIGNAL_LEFT_FRACTION = Math.exp(-3);
