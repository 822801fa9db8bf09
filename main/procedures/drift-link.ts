/**
 * Link keeping for the drift log: turns dropped links and silent instruments
 * into gaps (opened once, reconnect tried at each slot, closed with their
 * length when data flows again) instead of ending the log.
 */
import { DisconnectedError } from '../instruments/errors.ts';
import type { RoleName } from '../instruments/roles.ts';
import type { ProcedureContext } from './context.ts';
import { isRecoverableInstrumentFault, readCounter, type CounterReading } from './read-counter.ts';

/** Failed readings in a row after which the counter is treated as gone (and reopened). */
export const SILENT_AFTER_FAILURES = 3;

/** How often the instruments' error queues are read during a log, s (nothing else would report them). */
export const ERROR_CHECK_EVERY_S = 5;

export class DriftLink {
  readonly #ctx: ProcedureContext;
  readonly #gateS: number;
  #gapStartS: number | null = null;
  #gapMissed = 0;
  #failuresInRow = 0;
  #counterNeedsReopen = false;
  #thermometerNeedsReopen = false;
  #lastErrorCheckS = Number.NEGATIVE_INFINITY;
  gaps = 0;

  constructor(ctx: ProcedureContext, gateS: number) {
    this.#ctx = ctx;
    this.#gateS = gateS;
  }

  /** One counter reading for the slot at `slotS`, or null while the link is down. */
  async readCounter(slotS: number): Promise<CounterReading | null> {
    const ctx = this.#ctx;
    if (this.#counterNeedsReopen) {
      if (!(await this.#reopen('counter'))) {
        this.#gapMissed++;
        return null;
      }
      this.#counterNeedsReopen = false;
    }
    let reading: CounterReading;
    try {
      reading = await readCounter(ctx.bench.counter);
    } catch (error) {
      if (!(error instanceof DisconnectedError)) throw error;
      ctx.event({ type: 'link-lost', role: 'counter', error: error.message });
      this.#openGap(slotS, 'link-lost');
      this.#counterNeedsReopen = true;
      this.#gapMissed++;
      return null;
    }
    ctx.count(reading);
    // At a fixed, oscillating setpoint a counter that times out is more likely silent than the DUT stalled.
    const silentNoSignal = reading.status === 'no-signal' && reading.detail === 'timeout';
    if (reading.status === 'timeout' || reading.status === 'error' || silentNoSignal) {
      ctx.event({
        type: 'fault',
        role: 'counter',
        status: reading.status,
        error: reading.detail,
        errorName: reading.errorName,
      });
      this.#failuresInRow++;
      if (this.#failuresInRow >= SILENT_AFTER_FAILURES) {
        // Reopening the link is the usual cure for an instrument that has stopped answering.
        this.#openGap(slotS, 'not-answering');
        this.#counterNeedsReopen = true;
      }
      return reading;
    }
    this.#failuresInRow = 0;
    this.closeGap();
    return reading;
  }

  /** Temperature in °C, or NaN without a thermometer or when it fails (recorded). */
  async readTemperature(): Promise<number> {
    const ctx = this.#ctx;
    const thermometer = ctx.bench.thermometer;
    if (!thermometer) return Number.NaN;
    if (this.#thermometerNeedsReopen) {
      if (!(await this.#reopen('thermometer'))) return Number.NaN;
      this.#thermometerNeedsReopen = false;
    }
    try {
      return await thermometer.readTemperature();
    } catch (error) {
      if (error instanceof DisconnectedError) {
        ctx.event({ type: 'link-lost', role: 'thermometer', error: error.message });
        this.#thermometerNeedsReopen = true;
        return Number.NaN;
      }
      if (isRecoverableInstrumentFault(error)) {
        ctx.event({ type: 'fault', role: 'thermometer', error: error.message, errorName: error.name });
        return Number.NaN;
      }
      throw error;
    }
  }

  /** Reads the error queues every ERROR_CHECK_EVERY_S (or now, with force) and records what they held. */
  async checkErrorQueues(force = false): Promise<void> {
    const ctx = this.#ctx;
    const nowS = ctx.timeS();
    if (!force && nowS - this.#lastErrorCheckS < ERROR_CHECK_EVERY_S) return;
    this.#lastErrorCheckS = nowS;
    if (!this.#counterNeedsReopen) await ctx.recordQueuedErrors('counter');
    if (ctx.bench.thermometer && !this.#thermometerNeedsReopen) await ctx.recordQueuedErrors('thermometer');
  }

  closeGap(): void {
    if (this.#gapStartS === null) return;
    const nowS = this.#ctx.timeS();
    this.#ctx.event({
      type: 'gap-end',
      gap_start_s: this.#gapStartS,
      duration_s: nowS - this.#gapStartS,
      missed_slots: this.#gapMissed,
    });
    this.#gapStartS = null;
    this.#gapMissed = 0;
  }

  #openGap(slotS: number, cause: string): void {
    if (this.#gapStartS !== null) return;
    this.#gapStartS = slotS;
    this.gaps++;
    this.#ctx.event({ type: 'gap-start', cause });
  }

  async #reopen(role: RoleName): Promise<boolean> {
    const ctx = this.#ctx;
    // Without a reconnect hook, just try again: the driver may reopen by itself.
    if (!ctx.bench.reconnect) return true;
    try {
      await ctx.bench.reconnect(role);
      // A reopened counter may have been power-cycled: its gate is set again.
      if (role === 'counter') await ctx.bench.counter.setGate(this.#gateS);
      ctx.event({ type: 'reconnected', role });
      if (role === 'counter') this.#failuresInRow = 0;
      return true;
    } catch (error) {
      ctx.event({ type: 'reconnect-failed', role, error: error instanceof Error ? error.message : String(error) });
      return false;
    }
  }
}
