/**
 * Live readouts while a bench is connected and no run holds it: control
 * setpoint and measured voltage, frequency and temperature, polled a few
 * times a second of real time. A failed read shows as null rather than
 * stopping the poll; the poll is stopped (and awaited) before a run starts so
 * it never interleaves with a procedure's commands.
 */
import type { LiveReadout } from '../../app/contract/bench-api.ts';
import { DisconnectedError, TimeoutError } from '../instruments/errors.ts';
import type { BenchRoles } from '../procedures/types.ts';
import type { Clock } from '../time/clock.ts';
import type { IdleReading } from './bench-status.ts';

export interface LivePollerOptions {
  roles: BenchRoles;
  clock: Clock;
  emit: (readout: LiveReadout) => void;
  /** Each poll's figures with the output state and the links that failed (for the bench status). */
  onReading?: (reading: IdleReading) => void;
  /** Real time between the starts of two polls, ms. Default 333 (3 Hz). */
  periodMs?: number;
}

/** A failure that means the instrument cannot be reached (as opposed to one refused command). */
function isLinkFailure(error: unknown): boolean {
  return error instanceof DisconnectedError || error instanceof TimeoutError;
}

/** One idle poll: the readout plus the output state and each role whose link failed. */
export async function readLiveStatus(
  roles: BenchRoles,
  clock: Clock,
): Promise<{ readout: LiveReadout; idle: IdleReading }> {
  const lost: IdleReading['lost'] = {};
  const read = async <T>(role: 'supply' | 'counter' | 'thermometer', work: () => Promise<T>): Promise<T | null> => {
    try {
      return await work();
    } catch (error) {
      if (isLinkFailure(error) && lost[role] === undefined)
        lost[role] = error instanceof Error ? error.message : String(error);
      return null;
    }
  };
  const channel = roles.controlChannel;
  const controlSetV = await read('supply', () => roles.supply.getVoltageSetpoint(channel));
  // A supply that has just failed is not asked again in the same poll.
  const supplyUp = () => lost.supply === undefined;
  const controlMeasV =
    roles.supply.capabilities.measureVoltage && supplyUp()
      ? await read('supply', () => roles.supply.measureVoltage(channel))
      : null;
  const output = supplyUp() ? await read('supply', () => roles.supply.getOutput(channel)) : null;
  const reading = await read('counter', () => roles.counter.readFrequency());
  const thermometer = roles.thermometer;
  const temperatureC = thermometer ? await read('thermometer', () => thermometer.readTemperature()) : null;
  const readout: LiveReadout = {
    controlSetV,
    controlMeasV,
    frequencyHz: reading && reading.status === 'ok' ? reading.frequencyHz : null,
    temperatureC,
    timeS: clock.now(),
  };
  const { timeS: _timeS, ...figures } = readout;
  return { readout, idle: { ...figures, output, lost } };
}

export async function readLive(roles: BenchRoles, clock: Clock): Promise<LiveReadout> {
  return (await readLiveStatus(roles, clock)).readout;
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
      const { readout, idle } = await readLiveStatus(this.#options.roles, this.#options.clock);
      if (!this.#running) break;
      this.#options.emit(readout);
      this.#options.onReading?.(idle);
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
