/**
 * Simulated temperature chamber speaking SCPI (tunebench's own small command
 * set, matched by resources/profiles/chamber-scpi.json):
 *   TEMPerature:SETPoint <°C> / ?     setpoint, −70 … +180 °C
 *   TEMPerature:RAMP <°C/min> / ?     ramp-rate limit, 0.1 … hardware maximum
 *   MEASure:TEMPerature?              air temperature at the chamber's sensor
 *   CONTrol[:STATe] ON|OFF / ?        conditioning on (run) or off (stop)
 * Out-of-range values are refused with −222 like a real instrument. The
 * thermal behaviour is ChamberThermal's; *RST stops the chamber.
 */
import type { Clock } from '../time/clock.ts';
import type { ChamberThermal } from './chamber-thermal.ts';
import type { Rng } from './prng.ts';
import { ScpiDevice, type CommandContext } from './scpi-device.ts';
import { formatNr3 } from './scpi-params.ts';

export const CHAMBER_IDENTITY = 'tunebench,SIM-CHAMBER,0,0.1';
export const SIM_CHAMBER_RANGE_C = { min: -70, max: 180 } as const;

export class SimChamber {
  readonly device: ScpiDevice;
  readonly thermal: ChamberThermal;
  readonly #clock: Clock;
  readonly #rng: Rng;

  constructor(options: { clock: Clock; rng: Rng; thermal: ChamberThermal; hardwareRampCPerMin: number }) {
    this.#clock = options.clock;
    this.#rng = options.rng;
    this.thermal = options.thermal;
    const now = (): number => this.#clock.now();
    const air = (ctx: CommandContext): string => {
      ctx.countReading();
      // The air sensor: 0.02 °C noise, 0.01 °C resolution.
      const reading = this.thermal.airCAt(now()) + 0.02 * this.#rng.gaussian();
      return formatNr3(Math.round(reading * 100) / 100, 6);
    };
    this.device = new ScpiDevice({
      role: 'chamber',
      identity: CHAMBER_IDENTITY,
      clock: options.clock,
      onReset: () => this.thermal.setRunning(now(), false),
      commands: [
        {
          pattern: 'TEMPerature:SETPoint',
          set: (ctx) =>
            this.thermal.setSetpoint(now(), ctx.number(0, { unit: 'CEL', ...SIM_CHAMBER_RANGE_C }, 'TEMP:SETP')),
          query: () => formatNr3(this.thermal.state(now()).setpointC, 6),
        },
        {
          pattern: 'TEMPerature:RAMP',
          set: (ctx) =>
            this.thermal.setRamp(now(), ctx.number(0, { min: 0.1, max: options.hardwareRampCPerMin }, 'TEMP:RAMP')),
          query: () => formatNr3(this.thermal.state(now()).rampCPerMin, 6),
        },
        { pattern: 'MEASure[:SCALar]:TEMPerature[:DC]', query: air },
        {
          pattern: 'CONTrol[:STATe]',
          set: (ctx) => this.thermal.setRunning(now(), ctx.bool(0, 'CONT')),
          query: () => (this.thermal.state(now()).running ? '1' : '0'),
        },
      ],
    });
  }
}
