/**
 * Simulated frequency counter speaking SCPI. A reading takes the gate
 * (aperture) time on the bench clock, averages the DUT's frequency over the
 * gate and is quantised to whole counts (resolution 1/gate Hz). With no
 * signal it answers 9.91E37 (the SCPI not-a-number), 0, or nothing at all
 * until the next message interrupts the query (−410), as configured.
 */
import type { Clock } from '../time/clock.ts';
import type { GateResult } from './dut-runtime.ts';
import { ScpiDevice, type CommandContext, type CommandDef } from './scpi-device.ts';
import { ScpiError } from './scpi-errors.ts';
import { formatNr3 } from './scpi-params.ts';

export type NoSignalReply = 'not-a-number' | 'zero' | 'silent';

export interface SimCounterOptions {
  clock: Clock;
  /** Counts the DUT over [startS, startS + gateS]. */
  gate: (startS: number, gateS: number) => GateResult;
  noSignal?: NoSignalReply;
  /** Gate after power-on/*RST, s. Default 0.1. */
  defaultGateS?: number;
}

export interface SimCounterState {
  gateS: number;
  noSignal: NoSignalReply;
  readings: number;
}

export const COUNTER_IDENTITY = 'tunebench,SIM-COUNTER,0,0.1';
/** SCPI not-a-number (SCPI-99 vol. 1, 7.2.1.5 — from memory). */
export const SCPI_NAN_TEXT = '+9.91000000000000E+37';

const MIN_GATE_S = 1e-3;
const MAX_GATE_S = 10;

export class SimCounter {
  readonly device: ScpiDevice;
  noSignal: NoSignalReply;
  gateS: number;
  readonly #options: SimCounterOptions;
  #initiated: Promise<GateResult> | null = null;

  constructor(options: SimCounterOptions) {
    this.#options = options;
    this.noSignal = options.noSignal ?? 'not-a-number';
    this.gateS = options.defaultGateS ?? 0.1;
    this.device = new ScpiDevice({
      role: 'counter',
      identity: COUNTER_IDENTITY,
      clock: options.clock,
      commands: this.#commands(),
      onReset: () => {
        this.gateS = options.defaultGateS ?? 0.1;
        this.#initiated = null;
      },
    });
  }

  state(): SimCounterState {
    return { gateS: this.gateS, noSignal: this.noSignal, readings: this.device.readingCount };
  }

  async #count(): Promise<GateResult> {
    const clock: Clock = this.#options.clock;
    const startS = clock.now();
    const gateS = this.gateS;
    await clock.sleep(gateS);
    return this.#options.gate(startS, gateS);
  }

  async #reply(ctx: CommandContext, result: GateResult): Promise<string | null> {
    ctx.countReading();
    if (result.status === 'ok') return formatNr3(result.frequencyHz, 15);
    if (this.noSignal === 'not-a-number') return SCPI_NAN_TEXT;
    if (this.noSignal === 'zero') return formatNr3(0, 15);
    // Waits for a signal that never comes; a newer message interrupts it.
    const signal = ctx.interruptible();
    await new Promise<void>((_resolve, reject) => {
      signal.addEventListener('abort', () => reject(new Error('interrupted')), { once: true });
    });
    return null;
  }

  #commands(): CommandDef[] {
    const gate: CommandDef = {
      pattern: '[SENSe]:FREQuency:APERture',
      set: (ctx) => {
        this.gateS = ctx.number(0, { unit: 'S', min: MIN_GATE_S, max: MAX_GATE_S, def: 0.1 }, 'FREQ:APER');
      },
      query: () => formatNr3(this.gateS, 6),
    };
    const measure = async (ctx: CommandContext): Promise<string | null> => this.#reply(ctx, await this.#count());
    return [
      gate,
      { ...gate, pattern: '[SENSe]:FREQuency:GATE:TIME' },
      { pattern: 'MEASure[:SCALar]:FREQuency', query: measure },
      { pattern: 'READ[:SCALar][:FREQuency]', query: measure },
      {
        pattern: 'INITiate[:IMMediate]',
        set: () => {
          this.#initiated = this.#count();
        },
      },
      {
        pattern: 'FETCh[:SCALar][:FREQuency]',
        query: async (ctx) => {
          if (!this.#initiated) throw new ScpiError('dataStale', 'no measurement initiated');
          return this.#reply(ctx, await this.#initiated);
        },
      },
    ];
  }
}
