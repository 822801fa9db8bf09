/**
 * Live readouts while a bench is connected and no run holds it: control
 * setpoint and measured voltage, frequency and temperature, polled a few
 * times a second of real time. A failed read shows as null rather than
 * stopping the poll; the poll is stopped (and awaited) before a run starts so
 * it never interleaves with a procedure's commands.
 */
import type { LiveReadout } from '../../app/contract/bench-api.ts';
import type { BenchRoles } from '../procedures/types.ts';
import type { Clock } from '../time/clock.ts';

export interface LivePollerOptions {
  roles: BenchRoles;
  clock: Clock;
  emit: (readout: LiveReadout) => void;
  /** Real time between the starts of two polls, ms. Default 333 (3 Hz). */
  periodMs?: number;
}

async function orNull<T>(read: () => Promise<T>): Promise<T | null> {
  try {
    return await read();
  } catch {
    return null;
  }
}

export async function readLive(roles: BenchRoles, clock: Clock): Promise<LiveReadout> {
  const channel = roles.controlChannel;
  const controlSetV = await orNull(() => roles.supply.getVoltageSetpoint(channel));
  const controlMeasV = roles.supply.capabilities.measureVoltage ? await orNull(() => roles.supply.measureVoltage(channel)) : null;
  const reading = await orNull(() => roles.counter.readFrequency());
  const thermometer = roles.thermometer;
  const temperatureC = thermometer ? await orNull(() => thermometer.readTemperature()) : null;
  return {
    controlSetV,
    controlMeasV,
    frequencyHz: reading && reading.status === 'ok' ? reading.frequencyHz : null,
    temperatureC,
    timeS: clock.now(),
  };
}

export class LivePoller {
  readonly #options: LivePollerOptions;
  #running = false;
  #loop: Promise<void> | null = null;
  #wake: (() => void) | null = null;

  constructor(options: LivePollerOptions) {
    this.#options = options;
  }

  start(): void {
    if (this.#running) return;
    this.#running = true;
    this.#loop = this.#run();
  }

  /** Stops polling and waits for a read in progress to finish. */
  async stop(): Promise<void> {
    this.#running = false;
    this.#wake?.();
    await this.#loop;
    this.#loop = null;
  }

  async #run(): Promise<void> {
    const periodMs = this.#options.periodMs ?? 333;
    while (this.#running) {
      const startedMs = performance.now();
      const readout = await readLive(this.#options.roles, this.#options.clock);
      if (!this.#running) break;
      this.#options.emit(readout);
      const waitMs = Math.max(20, periodMs - (performance.now() - startedMs));
      await new Promise<void>((resolve) => {
        const handle = setTimeout(resolve, waitMs);
        this.#wake = () => {
          clearTimeout(handle);
          resolve();
        };
      });
      this.#wake = null;
    }
  }
}
