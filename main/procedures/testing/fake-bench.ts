/**
 * Small in-memory role drivers for procedure tests: a supply that remembers
 * every write and can be told to fail, and a counter over a toy DUT with a
 * first-order settling lag on the tuning port, a stall threshold and ±1-count
 * quantisation. The simulated bench (main/sim/) is the realistic one; these
 * exist so a test can put a fault on one exact operation.
 */
import type { Clock } from '../../time/clock.ts';
import { ChannelCeilings, type ChannelPurpose } from '../../instruments/channel-ceilings.ts';
import type { Counter, FrequencyReading, InstrumentIdentity, Supply, Thermometer } from '../../instruments/roles.ts';
import type { BenchRoles, EventBody, ProcedureEvent, RunSink, SampleRow } from '../types.ts';

const IDENTITY: InstrumentIdentity = {
  idn: 'TEST,FAKE,0,1',
  manufacturer: 'TEST',
  model: 'FAKE',
  serial: '0',
  firmware: '1',
};

export type SupplyOp = 'setVoltage' | 'setCurrentLimit' | 'setOverVoltageProtection' | 'setOutput' | 'measureVoltage';

export interface ChannelState {
  voltageV: number;
  output: boolean;
  currentLimitA: number | null;
  ovpV: number | null;
  /** Clock time of the last setpoint change. */
  changedAtS: number;
  previousV: number;
}

export class FakeSupply implements Supply {
  readonly role = 'supply' as const;
  readonly capabilities = { channels: 2, measureVoltage: true, measureCurrent: false, overVoltageProtection: true };
  readonly channels = new Map<number, ChannelState>();
  /** Every operation in order, e.g. "setOutput 1 true". */
  readonly log: string[] = [];
  /** Return an Error to make that call fail (checked before the state changes). */
  failWith: ((op: SupplyOp, channel: number, value: number | boolean) => Error | null) | null = null;
  readonly #clock: Clock;

  constructor(clock: Clock) {
    this.#clock = clock;
    for (const ch of [1, 2])
      this.channels.set(ch, {
        voltageV: 0,
        output: false,
        currentLimitA: null,
        ovpV: null,
        changedAtS: 0,
        previousV: 0,
      });
  }

  channel(ch: number): ChannelState {
    const state = this.channels.get(ch);
    if (!state) throw new RangeError(`no channel ${ch}`);
    return state;
  }

  #op(op: SupplyOp, ch: number, value: number | boolean): void {
    this.log.push(`${op} ${ch} ${String(value)}`);
    const error = this.failWith?.(op, ch, value) ?? null;
    if (error) throw error;
  }

  identify(): Promise<InstrumentIdentity> {
    return Promise.resolve(IDENTITY);
  }
  /** Same ceilings as the real driver, so procedure tests meet the same refusals. */
  readonly ceilings = new ChannelCeilings();
  limitChannel(ch: number, purpose: ChannelPurpose, maxV: number): void {
    this.ceilings.set(ch, purpose, maxV);
  }
  async setVoltage(ch: number, volts: number): Promise<void> {
    this.ceilings.check(ch, volts, 'fake supply');
    this.#op('setVoltage', ch, volts);
    const state = this.channel(ch);
    state.previousV = this.effectiveV(ch, 0);
    state.voltageV = volts;
    state.changedAtS = this.#clock.now();
  }
  getVoltageSetpoint(ch: number): Promise<number> {
    return Promise.resolve(this.channel(ch).voltageV);
  }
  async setCurrentLimit(ch: number, amps: number): Promise<void> {
    this.#op('setCurrentLimit', ch, amps);
    this.channel(ch).currentLimitA = amps;
  }
  async setOverVoltageProtection(ch: number, volts: number): Promise<void> {
    this.#op('setOverVoltageProtection', ch, volts);
    this.channel(ch).ovpV = volts;
  }
  async setOutput(ch: number, on: boolean): Promise<void> {
    this.#op('setOutput', ch, on);
    this.channel(ch).output = on;
  }
  getOutput(ch: number): Promise<boolean> {
    return Promise.resolve(this.channel(ch).output);
  }
  async measureVoltage(ch: number): Promise<number> {
    this.#op('measureVoltage', ch, 0);
    const state = this.channel(ch);
    return state.output ? state.voltageV : 0;
  }
  measureCurrent(): Promise<number> {
    return Promise.resolve(0);
  }
  close(): Promise<void> {
    return Promise.resolve();
  }

  /** Tuning-port voltage seen by the DUT: first-order lag with time constant tauS. */
  effectiveV(ch: number, tauS: number): number {
    const state = this.channel(ch);
    if (!state.output) return 0;
    if (tauS <= 0) return state.voltageV;
    const t = this.#clock.now() - state.changedAtS;
    return state.voltageV + (state.previousV - state.voltageV) * Math.exp(-t / tauS);
  }
}

export interface ToyDut {
  /** Frequency at a settled tuning voltage, Hz; 0 or less = stalled. */
  frequencyAtV(volts: number): number;
  /** Tuning-port time constant, s. */
  tauS: number;
  /** Frequency change per volt of DUT supply (channel 2) away from 3.3 V, Hz/V. */
  pushingHzPerV?: number;
}

/** f = 100 kHz + 200 kHz/V · (V − 1 V) above a 1 V stall threshold (a made-up sensor-interface oscillator). */
export const TOY_DUT: ToyDut = { frequencyAtV: (v) => (v < 1 ? 0 : 100e3 + 200e3 * (v - 1)), tauS: 0 };

export class FakeCounter implements Counter {
  readonly role = 'counter' as const;
  gateS = 0.1;
  reads = 0;
  /** Return an Error (thrown) or a reading (returned) to override one read. */
  override: ((readIndex: number) => Error | FrequencyReading | null) | null = null;
  readonly #clock: Clock;
  readonly #supply: FakeSupply;
  readonly #dut: ToyDut;

  constructor(clock: Clock, supply: FakeSupply, dut: ToyDut) {
    this.#clock = clock;
    this.#supply = supply;
    this.#dut = dut;
  }

  identify(): Promise<InstrumentIdentity> {
    return Promise.resolve(IDENTITY);
  }
  async setGate(seconds: number): Promise<void> {
    this.gateS = seconds;
  }
  async readFrequency(): Promise<FrequencyReading> {
    const index = this.reads++;
    // The reading is the mean over the gate, sampled at its midpoint (enough for a toy).
    await this.#clock.sleep(this.gateS / 2);
    const dutSupply = this.#supply.channel(2);
    const pushHz = (this.#dut.pushingHzPerV ?? 0) * (dutSupply.voltageV - 3.3);
    const f = this.#dut.frequencyAtV(this.#supply.effectiveV(1, this.#dut.tauS)) + pushHz;
    await this.#clock.sleep(this.gateS / 2);
    const forced = this.override?.(index) ?? null;
    if (forced instanceof Error) throw forced;
    if (forced) return forced;
    if (!(f > 0)) return { status: 'no-signal', cause: 'not-a-number' };
    const countHz = 1 / this.gateS;
    return { status: 'ok', frequencyHz: Math.round(f / countHz) * countHz };
  }
  close(): Promise<void> {
    return Promise.resolve();
  }
}

export function fakeBench(
  clock: Clock,
  dut: ToyDut = TOY_DUT,
): BenchRoles & { supply: FakeSupply; counter: FakeCounter } {
  const supply = new FakeSupply(clock);
  const counter = new FakeCounter(clock, supply, dut);
  return { supply, counter, controlChannel: 1, dutSupplyChannel: 2 };
}

/** A RunSink that keeps everything in memory. */
export class MemorySink implements RunSink {
  readonly rows: SampleRow[] = [];
  readonly events: ProcedureEvent[] = [];
  flushes = 0;
  appendSample(row: SampleRow): void {
    this.rows.push({ ...row });
  }
  appendEvent(event: ProcedureEvent): void {
    this.events.push({ ...event });
  }
  flush(): Promise<void> {
    this.flushes++;
    return Promise.resolve();
  }
  eventsOfType(type: string): EventBody[] {
    return this.events.filter((e) => e.type === type);
  }
}

/** 25 °C plus a slow sine, one reading per call. */
export class FakeThermometer implements Thermometer {
  readonly role = 'thermometer' as const;
  failNext: Error | null = null;
  readonly #clock: Clock;
  constructor(clock: Clock) {
    this.#clock = clock;
  }
  identify(): Promise<InstrumentIdentity> {
    return Promise.resolve(IDENTITY);
  }
  async readTemperature(): Promise<number> {
    const error = this.failNext;
    this.failNext = null;
    if (error) throw error;
    return 25 + Math.sin(this.#clock.now() / 3600);
  }
  close(): Promise<void> {
    return Promise.resolve();
  }
}
