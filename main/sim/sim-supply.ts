/**
 * Simulated two-channel programmable supply speaking SCPI. Channel 1 drives
 * the DUT's tuning port; channel 2 powers the DUT and starts on at its
 * nominal voltage. `*RST` returns to that power-on state (the bench's wiring
 * is part of the simulated setup).
 */
import type { Clock } from '../time/clock.ts';
import type { Rng } from './prng.ts';
import { ScpiDevice, type CommandContext, type CommandDef } from './scpi-device.ts';
import { ScpiError } from './scpi-errors.ts';
import { formatNr3 } from './scpi-params.ts';
import { SupplyChannel, type ChannelSettings, type SupplyChannelState } from './supply-channel.ts';

export interface SimSupplyOptions {
  clock: Clock;
  rng: Rng;
  /** Load resistance per channel (index 0 = channel 1). */
  loadsOhm: readonly [number, number];
  /** Power-on settings per channel. */
  powerOn: readonly [ChannelSettings, ChannelSettings];
  maxV?: number;
  maxA?: number;
  /** Output slew, V/s. Default 1000 (1 V/ms). */
  slewVPerS?: number;
  /** Setpoint resolution, V. Default 0.001. */
  resolutionV?: number;
  /** Called before any output change, so the DUT can catch up to "now" first. */
  beforeChange?: () => void;
}

export const SUPPLY_IDENTITY = 'tunebench,SIM-SUPPLY,0,0.1';

export class SimSupply {
  readonly device: ScpiDevice;
  readonly channels: SupplyChannel[];
  readonly maxV: number;
  readonly maxA: number;
  readonly #options: SimSupplyOptions;
  #selected = 1;

  constructor(options: SimSupplyOptions) {
    this.#options = options;
    this.maxV = options.maxV ?? 20;
    this.maxA = options.maxA ?? 1;
    this.channels = this.#powerOnChannels();
    this.device = new ScpiDevice({
      role: 'supply',
      identity: SUPPLY_IDENTITY,
      clock: options.clock,
      commands: this.#commands(),
      onReset: () => this.#reset(),
    });
  }

  /** Typed snapshot for tests and safety checks. */
  state(channel: number): SupplyChannelState {
    return this.#channel(channel).state(this.#options.clock.now());
  }

  #powerOnChannels(): SupplyChannel[] {
    const now = this.#options.clock.now();
    const slew = this.#options.slewVPerS ?? 1000;
    return this.#options.powerOn.map(
      (s, i) => new SupplyChannel(i + 1, this.#options.loadsOhm[i] as number, slew, s, now),
    );
  }

  #reset(): void {
    this.#selected = 1;
    this.#options.powerOn.forEach((s, i) => this.#change(i + 1, { ...s }));
    for (const ch of this.channels) ch.ovpTripped = false;
  }

  #channel(n: number): SupplyChannel {
    const ch = this.channels[n - 1];
    if (!ch) throw new ScpiError('headerSuffixOutOfRange', `channel ${n}`);
    return ch;
  }

  #pick(ctx: CommandContext, node: string): SupplyChannel {
    return this.#channel(ctx.suffixes[node] ?? this.#selected);
  }

  #change(n: number, settings: Partial<ChannelSettings>): void {
    this.#options.beforeChange?.();
    const ch = this.#channel(n);
    const next = { ...ch.settings, ...settings };
    // OVP: a setpoint above the protection level trips the output off.
    if (next.setpointV > next.ovpV && (next.outputOn || ch.settings.outputOn)) {
      ch.ovpTripped = true;
      next.outputOn = false;
      ch.apply(next, this.#options.clock.now());
      throw new ScpiError('settingsConflict', `over-voltage protection tripped on channel ${n}`);
    }
    if (next.outputOn && ch.ovpTripped && !ch.settings.outputOn) {
      throw new ScpiError('settingsConflict', `channel ${n} over-voltage protection tripped; clear it first`);
    }
    ch.apply(next, this.#options.clock.now());
  }

  #measure(ch: SupplyChannel, what: 'V' | 'A'): string {
    const v = ch.outputVAt(this.#options.clock.now());
    const rng = this.#options.rng;
    if (what === 'V') return formatNr3(Math.round((v + 0.0003 * rng.gaussian()) * 1e4) / 1e4, 6);
    const amps = v / ch.loadOhm + 2e-6 * rng.gaussian();
    return formatNr3(Math.round(amps * 1e6) / 1e6, 6);
  }

  #commands(): CommandDef[] {
    const resolution = this.#options.resolutionV ?? 0.001;
    const volts = { unit: 'V', min: 0, max: this.maxV };
    return [
      {
        pattern: 'INSTrument[:SELect]',
        set: (ctx) => {
          const m = /^(?:OUT|OUTP|CH)?(\d+)$/i.exec(ctx.params[0] ?? '');
          if (!m) throw new ScpiError('illegalParameterValue', 'INST:SEL expects OUT1 or OUT2');
          this.#selected = this.#channel(Number(m[1])).channel;
        },
        query: () => `OUT${this.#selected}`,
      },
      {
        pattern: 'INSTrument:NSELect',
        set: (ctx) => {
          this.#selected = Math.round(ctx.number(0, { min: 1, max: this.channels.length }, 'INST:NSEL'));
        },
        query: () => String(this.#selected),
      },
      {
        pattern: '[SOURce#]:VOLTage[:LEVel][:IMMediate][:AMPLitude]',
        set: (ctx) => {
          const ch = this.#pick(ctx, 'SOUR');
          const v = Math.round(ctx.number(0, volts, 'VOLT') / resolution) * resolution;
          this.#change(ch.channel, { setpointV: v });
        },
        query: (ctx) => formatNr3(this.#pick(ctx, 'SOUR').settings.setpointV, 6),
      },
      {
        pattern: '[SOURce#]:CURRent[:LEVel][:IMMediate][:AMPLitude]',
        set: (ctx) => {
          const ch = this.#pick(ctx, 'SOUR');
          this.#change(ch.channel, { currentLimitA: ctx.number(0, { unit: 'A', min: 0, max: this.maxA }, 'CURR') });
        },
        query: (ctx) => formatNr3(this.#pick(ctx, 'SOUR').settings.currentLimitA, 6),
      },
      {
        pattern: '[SOURce#]:VOLTage:PROTection[:LEVel]',
        set: (ctx) => {
          const ch = this.#pick(ctx, 'SOUR');
          this.#change(ch.channel, { ovpV: ctx.number(0, { unit: 'V', min: 0, max: this.maxV * 1.1 }, 'VOLT:PROT') });
        },
        query: (ctx) => formatNr3(this.#pick(ctx, 'SOUR').settings.ovpV, 6),
      },
      {
        pattern: '[SOURce#]:VOLTage:PROTection:TRIPped',
        query: (ctx) => (this.#pick(ctx, 'SOUR').ovpTripped ? '1' : '0'),
      },
      {
        pattern: 'OUTPut#:PROTection:CLEar',
        set: (ctx) => {
          this.#pick(ctx, 'OUTP').ovpTripped = false;
        },
      },
      {
        pattern: 'OUTPut#[:STATe]',
        set: (ctx) => this.#change(this.#pick(ctx, 'OUTP').channel, { outputOn: ctx.bool(0, 'OUTP') }),
        query: (ctx) => (this.#pick(ctx, 'OUTP').settings.outputOn ? '1' : '0'),
      },
      {
        pattern: 'MEASure#[:SCALar]:VOLTage[:DC]',
        query: (ctx) => {
          ctx.countReading();
          return this.#measure(this.#pick(ctx, 'MEAS'), 'V');
        },
      },
      {
        pattern: 'MEASure#[:SCALar]:CURRent[:DC]',
        query: (ctx) => {
          ctx.countReading();
          return this.#measure(this.#pick(ctx, 'MEAS'), 'A');
        },
      },
    ];
  }
}
