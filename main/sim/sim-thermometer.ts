/**
 * Simulated temperature logger speaking SCPI: MEASure:TEMPerature? in °C,
 * the ambient profile plus a little sensor noise, at 1 m°C resolution.
 */
import type { Clock } from '../time/clock.ts';
import type { Rng } from './prng.ts';
import { ScpiDevice, type CommandContext } from './scpi-device.ts';
import { formatNr3 } from './scpi-params.ts';

export const THERMOMETER_IDENTITY = 'tunebench,SIM-THERMOMETER,0,0.1';

export interface SimThermometerOptions {
  clock: Clock;
  rng: Rng;
  /** True ambient temperature at clock time tS. */
  ambientCAt: (tS: number) => number;
  noiseC?: number;
}

export class SimThermometer {
  readonly device: ScpiDevice;
  readonly #options: SimThermometerOptions;

  constructor(options: SimThermometerOptions) {
    this.#options = options;
    const read = (ctx: CommandContext): string => {
      ctx.countReading();
      return formatNr3(this.#reading(), 6);
    };
    this.device = new ScpiDevice({
      role: 'thermometer',
      identity: THERMOMETER_IDENTITY,
      clock: options.clock,
      onReset: () => undefined,
      commands: [
        { pattern: 'MEASure[:SCALar]:TEMPerature[:DC]', query: read },
        { pattern: 'READ[:SCALar][:TEMPerature]', query: read },
        { pattern: 'UNIT:TEMPerature', query: () => 'C' },
      ],
    });
  }

  #reading(): number {
    const trueC = this.#options.ambientCAt(this.#options.clock.now());
    const noisy = trueC + (this.#options.noiseC ?? 0.003) * this.#options.rng.gaussian();
    return Math.round(noisy * 1000) / 1000;
  }

  state(): { temperatureC: number; readings: number } {
    return { temperatureC: this.#options.ambientCAt(this.#options.clock.now()), readings: this.device.readingCount };
  }
}
