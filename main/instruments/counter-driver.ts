/**
 * Counter role over a SCPI session. "No oscillation" is a reading, not a
 * fault: the SCPI not-a-number (9.91E37), zero, or no reply within the gate
 * plus the profile's margin all give `no-signal` (each switchable in the
 * profile). A dropped link still throws DisconnectedError. After a timeout
 * the session gets back in step by itself before the next command, so a
 * late reading is never taken for the next one.
 */
import { ReplyFormatError, TimeoutError } from './errors.ts';
import type { CounterProfile } from './profile-schema.ts';
import type { Counter, FrequencyReading, InstrumentIdentity } from './roles.ts';
import { formatScpiNumber, parseIdentity, parseNumeric } from './scpi-reply.ts';
import type { ScpiSession } from './scpi-session.ts';

export class CounterDriver implements Counter {
  readonly role = 'counter' as const;
  private gate: number;
  private readCommand: string;

  constructor(readonly session: ScpiSession, readonly profile: CounterProfile) {
    this.gate = profile.defaultGateS;
    this.readCommand = this.renderRead();
  }

  get gateS(): number {
    return this.gate;
  }

  get gateRangeS(): { minS: number; maxS: number } {
    return { minS: this.profile.minGateS, maxS: this.profile.maxGateS };
  }

  /** Longest wait for one reading, s. */
  get measureTimeoutS(): number {
    return this.gate + this.profile.timeouts.measureMarginS;
  }

  async identify(): Promise<InstrumentIdentity> {
    return parseIdentity(await this.session.query(this.profile.commands.identify.render({})));
  }

  async setGate(seconds: number): Promise<void> {
    if (!(seconds > 0) || !Number.isFinite(seconds)) throw new RangeError(`gateS: must be a positive number of seconds, got ${seconds}`);
    // Refused here too, below every plan check, so no caller can send a gate the profile rules out.
    if (seconds < this.profile.minGateS || seconds > this.profile.maxGateS) {
      throw new RangeError(`gateS: ${seconds} s is outside the counter's gate range ${this.profile.minGateS}–${this.profile.maxGateS} s (profile minGateS/maxGateS)`);
    }
    await this.session.write(this.profile.commands.setGate.render({ gateS: formatScpiNumber(seconds) }), {
      checkErrors: this.profile.checkErrorsAfterWrite,
    });
    this.gate = seconds;
    this.readCommand = this.renderRead();
  }

  async readFrequency(): Promise<FrequencyReading> {
    const noSignal = this.profile.noSignal;
    let reply: string;
    try {
      reply = await this.session.query(this.readCommand, { timeoutS: this.measureTimeoutS });
    } catch (error) {
      // Only silence after the reading command itself means "no signal"; a counter
      // that does not even answer the session's resync (*OPC?) is a fault.
      if (error instanceof TimeoutError && error.command === this.readCommand && noSignal.timeout) {
        return { status: 'no-signal', cause: 'timeout' };
      }
      throw error;
    }
    const value = parseNumeric(reply);
    if (value.kind === 'not-a-number') {
      if (noSignal.notANumber) return { status: 'no-signal', cause: 'not-a-number' };
      throw new ReplyFormatError('a frequency (the profile does not treat not-a-number as no signal)', reply);
    }
    if (value.kind === 'infinity' || value.value < 0) throw new ReplyFormatError('a frequency of 0 Hz or more', reply);
    if (noSignal.zero && value.value <= noSignal.belowHz) return { status: 'no-signal', cause: 'zero' };
    return { status: 'ok', frequencyHz: value.value };
  }

  close(): Promise<void> {
    return this.session.close();
  }

  private renderRead(): string {
    return this.profile.commands.readFrequency.render({ gateS: formatScpiNumber(this.gate) });
  }
}

export function createCounter(session: ScpiSession, profile: CounterProfile): Counter {
  return new CounterDriver(session, profile);
}
