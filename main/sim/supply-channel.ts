/**
 * One output of the simulated supply: setpoint (quantised to the setpoint
 * resolution), current limit, over-voltage protection, output switch, and an
 * output that slews toward its target at a fixed rate. The load is a
 * resistor (the DUT's tuning port or the DUT itself); when setpoint/R exceeds
 * the current limit the output goes constant-current at I·R.
 */
import type { LinearPiece } from './dut-runtime.ts';

export interface SupplyChannelState {
  channel: number;
  setpointV: number;
  currentLimitA: number;
  ovpV: number;
  ovpTripped: boolean;
  outputOn: boolean;
  /** Output voltage now (noise-free), including slew. */
  outputV: number;
  mode: 'off' | 'CV' | 'CC';
}

export interface ChannelSettings {
  setpointV: number;
  currentLimitA: number;
  ovpV: number;
  outputOn: boolean;
}

export class SupplyChannel {
  readonly channel: number;
  readonly loadOhm: number;
  readonly slewVPerS: number;
  settings: ChannelSettings;
  ovpTripped = false;
  #onSinceS: number | null;
  #rampStartS: number;
  #rampStartV: number;
  #targetV: number;

  constructor(channel: number, loadOhm: number, slewVPerS: number, settings: ChannelSettings, nowS: number) {
    this.channel = channel;
    this.loadOhm = loadOhm;
    this.slewVPerS = slewVPerS;
    this.settings = { ...settings };
    this.#targetV = this.#computeTarget();
    // Power-on state: already settled at its target.
    this.#rampStartS = nowS;
    this.#rampStartV = this.#targetV;
    this.#onSinceS = settings.outputOn ? nowS : null;
  }

  #computeTarget(): number {
    if (!this.settings.outputOn) return 0;
    return Math.min(this.settings.setpointV, this.settings.currentLimitA * this.loadOhm);
  }

  /** Applies new settings at nowS; the output starts slewing from where it is. */
  apply(settings: Partial<ChannelSettings>, nowS: number): void {
    const current = this.outputVAt(nowS);
    const wasOn = this.settings.outputOn;
    this.settings = { ...this.settings, ...settings };
    if (this.settings.outputOn && !wasOn) this.#onSinceS = nowS;
    if (!this.settings.outputOn) this.#onSinceS = null;
    this.#rampStartS = nowS;
    this.#rampStartV = current;
    this.#targetV = this.#computeTarget();
  }

  #rampEndS(): number {
    return this.#rampStartS + Math.abs(this.#targetV - this.#rampStartV) / this.slewVPerS;
  }

  outputVAt(tS: number): number {
    if (tS <= this.#rampStartS) return this.#rampStartV;
    const endS = this.#rampEndS();
    if (tS >= endS) return this.#targetV;
    return this.#rampStartV + Math.sign(this.#targetV - this.#rampStartV) * this.slewVPerS * (tS - this.#rampStartS);
  }

  /** The output as a linear piece from tS on (for the DUT's exact lag integration). */
  pieceAt(tS: number): LinearPiece {
    if (tS < this.#rampStartS) return { v: this.#rampStartV, slopeVPerS: 0, untilS: this.#rampStartS };
    const endS = this.#rampEndS();
    if (tS >= endS) return { v: this.#targetV, slopeVPerS: 0, untilS: Number.POSITIVE_INFINITY };
    const slope = Math.sign(this.#targetV - this.#rampStartV) * this.slewVPerS;
    return { v: this.outputVAt(tS), slopeVPerS: slope, untilS: endS };
  }

  poweredSinceS(tS: number): number | null {
    return this.#onSinceS !== null && tS >= this.#onSinceS ? this.#onSinceS : null;
  }

  state(nowS: number): SupplyChannelState {
    const outputV = this.outputVAt(nowS);
    const ccLimitedV = this.settings.currentLimitA * this.loadOhm;
    return {
      channel: this.channel,
      ...this.settings,
      ovpTripped: this.ovpTripped,
      outputV,
      mode: !this.settings.outputOn ? 'off' : this.settings.setpointV > ccLimitedV ? 'CC' : 'CV',
    };
  }
}
