/**
 * The DUT in time: its tuning node follows supply channel 1 through a
 * first-order lag, it warms up after its supply comes on, it wanders slowly,
 * and a counter gate sees its frequency averaged over the gate with noise and
 * ±1-count quantisation. All randomness comes from the injected seeded Rng.
 */
import type { DutParams } from './dut-params.ts';
import { dutFrequencyHz, type DutConditions } from './dut-model.ts';
import { FirstOrderLag } from './first-order-lag.ts';
import type { Rng } from './prng.ts';

/** A stretch of a source voltage that is linear in time: v(t) = v + slope·(t − at), valid until untilS. */
export interface LinearPiece {
  v: number;
  slopeVPerS: number;
  untilS: number;
}

/** What the DUT is wired to: the supply's two outputs and the ambient temperature. */
export interface DutDrive {
  /** Tuning source (supply channel 1 output) from time tS on. */
  tuneSourceAt(tS: number): LinearPiece;
  /** DUT supply pin voltage (supply channel 2 output). */
  supplyVAt(tS: number): number;
  /** Since when the DUT supply has been up, or null if it is off at tS. */
  poweredSinceS(tS: number): number | null;
  temperatureCAt(tS: number): number;
}

export type GateResult = { status: 'ok'; frequencyHz: number; counts: number } | { status: 'no-signal' };

/** Sub-samples per gate for averaging the frequency while the tuning node moves. */
const GATE_SAMPLES = 16;

export class DutRuntime {
  readonly params: DutParams;
  readonly #drive: DutDrive;
  readonly #rng: Rng;
  readonly #lag: FirstOrderLag;
  #atS: number;
  #wanderPpm = 0;

  constructor(params: DutParams, drive: DutDrive, rng: Rng, startS: number) {
    this.params = params;
    this.#drive = drive;
    this.#rng = rng;
    this.#atS = startS;
    this.#lag = new FirstOrderLag(params.tuning.settleTauS, drive.tuneSourceAt(startS).v);
  }

  /** Moves the tuning node and the wander forward to tS (earlier times are ignored). */
  advanceTo(tS: number): void {
    if (tS <= this.#atS) return;
    const dtTotal = tS - this.#atS;
    let t = this.#atS;
    while (t < tS) {
      const piece = this.#drive.tuneSourceAt(t);
      // A piece whose end is already past counts as constant (guards against a stuck loop).
      const live = piece.untilS > t;
      const end = live ? Math.min(tS, piece.untilS) : tS;
      this.#lag.step(end - t, piece.v, live ? piece.slopeVPerS : 0);
      t = end;
    }
    const rw = this.params.noise.randomWalkPpmPerSqrtHour;
    if (rw > 0) this.#wanderPpm += rw * Math.sqrt(dtTotal / 3600) * this.#rng.gaussian();
    this.#atS = tS;
  }

  get tuneNodeV(): number {
    return this.#lag.value;
  }

  conditionsAt(tS: number): DutConditions {
    this.advanceTo(tS);
    const since = this.#drive.poweredSinceS(tS);
    return {
      tuneNodeV: this.#lag.value,
      supplyV: this.#drive.supplyVAt(tS),
      temperatureC: this.#drive.temperatureCAt(tS),
      poweredForS: since === null ? null : tS - since,
      wanderPpm: this.#wanderPpm,
    };
  }

  /** Noise-free instantaneous frequency at tS (advances the state to tS). */
  frequencyHzAt(tS: number): number {
    return dutFrequencyHz(this.params, this.conditionsAt(tS));
  }

  /**
   * What a counter gated from startS for gateS reads: the cycles counted in
   * the gate divided by the gate. Noise: white FM (σ ∝ 1/√gate, capped) and,
   * on a relaxation DUT, comparator threshold noise. The latter enters as a
   * voltage — one threshold shift per gate, σ = noiseV/√N over the N cycles
   * counted — and goes through the charging law, never as a multiplier on
   * the frequency: so where dv/dt vanishes at the stall edge the reading
   * scatters but falls toward zero, and can never exceed what the charging
   * law allows a few σ above. Quantisation: the count is an integer with a
   * random starting phase, so readings are multiples of 1/gate (±1 count,
   * common practice).
   */
  gate(startS: number, gateS: number): GateResult {
    const dt = gateS / GATE_SAMPLES;
    const samples: DutConditions[] = [];
    for (let i = 0; i < GATE_SAMPLES; i++) samples.push(this.conditionsAt(startS + (i + 0.5) * dt));
    this.advanceTo(startS + gateS);
    const nominal = this.#cyclesIn(samples, dt, 0);
    if (nominal <= 0) return { status: 'no-signal' };
    let cycles = nominal;
    if (this.params.kind === 'relaxation' && this.params.thresholds.noiseV > 0) {
      const shiftV = (this.params.thresholds.noiseV * this.#boundedGaussian()) / Math.sqrt(Math.max(1, nominal));
      cycles = this.#cyclesIn(samples, dt, shiftV);
    }
    // White FM beyond 10 % per gate is not an oscillator any more; the DUT schema bounds it well below.
    const white = Math.min(0.1, this.params.noise.whiteFmAt1s / Math.sqrt(gateS));
    const noisyCycles = cycles * (1 + white * this.#boundedGaussian());
    const counts = Math.floor(noisyCycles + this.#rng.uniform());
    if (!(counts > 0) || !Number.isFinite(counts)) return { status: 'no-signal' };
    return { status: 'ok', frequencyHz: counts / gateS, counts };
  }

  /** Cycles over the gate's midpoint samples (each `dt` long) with the upper threshold moved by shiftV. */
  #cyclesIn(samples: readonly DutConditions[], dt: number, shiftV: number): number {
    let cycles = 0;
    for (const c of samples) cycles += dutFrequencyHz(this.params, c, shiftV) * dt;
    return cycles;
  }

  /** A standard normal draw cut at ±4 σ (a physical noise source has no infinite tails). */
  #boundedGaussian(): number {
    return Math.max(-4, Math.min(4, this.#rng.gaussian()));
  }
}
