/**
 * The DUT in time: its tuning node follows supply channel 1 through a
 * first-order lag, it warms up after its supply comes on, it wanders slowly,
 * and a counter gate sees its frequency averaged over the gate with noise and
 * ±1-count quantisation. All randomness comes from the injected seeded Rng.
 */
import type { DutParams } from './dut-params.ts';
import { coreOf, dutFrequencyHz, type DutConditions } from './dut-model.ts';
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
   * the gate divided by the gate. Noise: white FM (σ ∝ 1/√gate) plus the
   * per-cycle jitter averaged over N cycles (σ/√N). Quantisation: the count
   * is an integer with a random starting phase, so readings are multiples of
   * 1/gate (±1 count, common practice).
   */
  gate(startS: number, gateS: number): GateResult {
    const dt = gateS / GATE_SAMPLES;
    let cycles = 0;
    let jitterSq = 0;
    for (let i = 0; i < GATE_SAMPLES; i++) {
      const c = this.conditionsAt(startS + (i + 0.5) * dt);
      const f = dutFrequencyHz(this.params, c);
      cycles += f * dt;
      if (f > 0) {
        const j = coreOf(this.params, c.tuneNodeV, c.supplyV).cycleJitter;
        jitterSq += j * j;
      }
    }
    this.advanceTo(startS + gateS);
    if (cycles <= 0) return { status: 'no-signal' };
    const jitter = Math.sqrt(jitterSq / GATE_SAMPLES);
    const white = this.params.noise.whiteFmAt1s / Math.sqrt(gateS);
    const sigma = Math.sqrt(white * white + (jitter * jitter) / cycles);
    const noisyCycles = cycles * (1 + sigma * this.#rng.gaussian());
    const counts = Math.floor(noisyCycles + this.#rng.uniform());
    if (counts <= 0) return { status: 'no-signal' };
    return { status: 'ok', frequencyHz: counts / gateS, counts };
  }
}
