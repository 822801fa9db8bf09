/**
 * Counter role over a SCPI session. "No oscillation" is a reading, not a
 * fault: the SCPI not-a-number (9.91E37), zero, or no reply within the gate
 * plus the profile's margin all give `no-signal` (each switchable in the
 * profile). A dropped link still throws DisconnectedError.
 *
 * After a timeout of the reading command the driver resyncs at once (the
 * session's `*ESE n;*ESE?` exchange). If nothing came late, the silence was
 * real; if the reading came late it was dropped and the reading is taken
 * again; if alignment cannot be proven the reading is an AlignmentError.
 * Every value is checked for shape (profile `replyFormat`) and range
 * (0 < f ≤ `maxInputHz`) before it becomes a frequency.
 */
import { AlignmentError, ReplyFormatError, TimeoutError } from './errors.ts';
import type { CounterProfile } from './profile-schema.ts';
import type { Counter, FrequencyReading, InstrumentIdentity } from './roles.ts';
import { formatScpiNumber, parseIdentity, parseNumeric } from './scpi-reply.ts';
import type { ScpiSession } from './scpi-session.ts';

export class CounterDriver implements Counter {
  readonly role = 'counter' as const;
  private gate: number;
  private readCommand: string;

  constructor(
    readonly session: ScpiSession,
    readonly profile: CounterProfile,
  ) {
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
    if (!(seconds > 0) || !Number.isFinite(seconds))
      throw new RangeError(`gateS: must be a positive number of seconds, got ${seconds}`);
    // Refused here too, below every plan check, so no caller can send a gate the profile rules out.
    if (seconds < this.profile.minGateS || seconds > this.profile.maxGateS) {
      throw new RangeError(
        `gateS: ${seconds} s is outside the counter's gate range ${this.profile.minGateS}–${this.profile.maxGateS} s (profile minGateS/maxGateS)`,
      );
    }
    await this.session.write(this.profile.commands.setGate.render({ gateS: formatScpiNumber(seconds) }), {
      checkErrors: this.profile.checkErrorsAfterWrite,
    });
    this.gate = seconds;
    this.readCommand = this.renderRead();
  }

  async readFrequency(): Promise<FrequencyReading> {
    const reply = await this.readInStep();
    return reply === null ? { status: 'no-signal', cause: 'timeout' } : this.interpret(reply);
  }

  /** The reading command's own reply; null for silence proven real (and meaning no signal). */
  private async readInStep(): Promise<string | null> {
    const command = this.readCommand;
    for (let attempt = 1; ; attempt += 1) {
      try {
        return await this.session.query(command, { timeoutS: this.measureTimeoutS });
      } catch (error) {
        if (!(error instanceof TimeoutError)) throw error;
        // A counter that does not even answer the session's own resync is out of step.
        if (error.command !== command)
          throw this.session.nameFailure(
            new AlignmentError(command, `no answer to the resync ${error.command}`, { cause: error }),
          );
        let late: number;
        try {
          late = await this.session.resync();
        } catch (syncError) {
          if (syncError instanceof TimeoutError)
            throw this.session.nameFailure(
              new AlignmentError(command, `no answer to the resync ${syncError.command}`, { cause: syncError }),
            );
          throw syncError;
        }
        if (late === 0) {
          // Proven silence: the counter answered the resync and owed nothing.
          if (this.profile.noSignal.timeout) return null;
          throw error;
        }
        if (attempt >= 2)
          throw this.session.nameFailure(
            new AlignmentError(command, `the reading came later than gate + margin (${this.measureTimeoutS} s) twice`),
          );
      }
    }
  }

  private interpret(reply: string): FrequencyReading {
    const noSignal = this.profile.noSignal;
    const value = parseNumeric(reply);
    if (value.kind === 'not-a-number') {
      if (noSignal.notANumber) return { status: 'no-signal', cause: 'not-a-number' };
      throw new ReplyFormatError('a frequency (the profile does not treat not-a-number as no signal)', reply);
    }
    if (value.kind === 'infinity' || value.value < 0) throw new ReplyFormatError('a frequency of 0 Hz or more', reply);
    if (noSignal.zero && value.value <= noSignal.belowHz) return { status: 'no-signal', cause: 'zero' };
    if (!REPLY_SHAPE[this.profile.replyFormat].test(reply)) {
      throw new ReplyFormatError(
        `a frequency in ${this.profile.replyFormat === 'nr3' ? 'NR3 form (+1.0E+04)' : 'NR2 or NR3 form'} (profile replyFormat)`,
        reply,
      );
    }
    if (!(value.value > 0) || value.value > this.profile.maxInputHz) {
      throw new ReplyFormatError(`a frequency in 0 < f ≤ ${this.profile.maxInputHz} Hz (profile maxInputHz)`, reply);
    }
    return { status: 'ok', frequencyHz: value.value };
  }

  close(): Promise<void> {
    return this.session.close();
  }

  private renderRead(): string {
    return this.profile.commands.readFrequency.render({ gateS: formatScpiNumber(this.gate) });
  }
}

/** Reply shapes by profile `replyFormat`, on a reply parseNumeric already passed (IEEE 488.2 NR2 has a point, NR3 an exponent). */
const REPLY_SHAPE = {
  nr3: /[eE]/,
  decimal: /[.eE]/,
  any: /^/,
} as const;

export function createCounter(session: ScpiSession, profile: CounterProfile): Counter {
  return new CounterDriver(session, profile);
}
