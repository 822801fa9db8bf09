/**
 * A SCPI conversation with one instrument: the link discipline of ScpiLink
 * (one command in flight, timeouts, resync, reconnect; see scpi-link.ts)
 * plus the error queue drained with SYST:ERR? (after every write when asked,
 * or on demand) and the IEEE 488.2 common commands.
 */
import { InstrumentError, ReplyFormatError, type ScpiErrorEntry } from './errors.ts';
import { parseErrorEntry, parseIdentity, parseNumeric, type ScpiNumeric } from './scpi-reply.ts';
import type { InstrumentIdentity } from './roles.ts';
import { positive, ScpiLink, type LinkIo, type ScpiLinkOptions } from './scpi-link.ts';
import { isOne } from './session-resync.ts';

export type { SessionEvent, LinkIo } from './scpi-link.ts';

export interface ScpiSessionOptions extends ScpiLinkOptions {
  /** Drain SYST:ERR? after every write (writes only; queries on demand). Default false. */
  checkErrorsAfterWrite?: boolean;
  /** Most entries read in one drain (a queue that never says 0 must not loop forever). Default 32. */
  maxErrorEntries?: number;
}

export interface QueryOptions {
  timeoutS?: number;
}

export interface WriteOptions {
  /** Overrides the session's checkErrorsAfterWrite for this write. */
  checkErrors?: boolean;
}

export class ScpiSession extends ScpiLink {
  checkErrorsAfterWrite: boolean;
  private readonly maxErrorEntries: number;

  constructor(options: ScpiSessionOptions) {
    super(options);
    this.checkErrorsAfterWrite = options.checkErrorsAfterWrite ?? false;
    this.maxErrorEntries = positive('maxErrorEntries', options.maxErrorEntries ?? 32);
  }

  /** Sends a command that has no reply; drains the error queue after it when configured. */
  write(command: string, options?: WriteOptions): Promise<void> {
    const check = options?.checkErrors ?? this.checkErrorsAfterWrite;
    return this.exclusive(async (io) => {
      await io.send(command);
      if (!check) return;
      const entries = await this.readErrorQueue(io);
      if (entries.length > 0) throw new InstrumentError(entries, command);
    });
  }

  /** Query whose reply is one SCPI number, tagged (NaN and infinities are tags). */
  async queryNumeric(command: string, options?: QueryOptions): Promise<ScpiNumeric> {
    return parseNumeric(await this.query(command, options));
  }

  async identify(): Promise<InstrumentIdentity> {
    return parseIdentity(await this.query('*IDN?'));
  }

  /** *RST: instrument defaults (outputs off on most supplies). */
  reset(): Promise<void> {
    return this.write('*RST');
  }

  /** *CLS: clears the status registers and the error queue. */
  clearStatus(): Promise<void> {
    return this.write('*CLS', { checkErrors: false });
  }

  /** *OPC?: resolves when the instrument has finished every pending operation. */
  async waitComplete(options?: QueryOptions): Promise<void> {
    const reply = await this.query('*OPC?', options);
    if (!isOne(reply)) throw new ReplyFormatError('"1" from *OPC?', reply);
  }

  /** Reads SYST:ERR? until it reports code 0; returns the entries, oldest first. */
  drainErrors(): Promise<ScpiErrorEntry[]> {
    return this.exclusive((io) => this.readErrorQueue(io));
  }

  /** Drains the error queue and throws InstrumentError if it held anything. */
  async checkErrors(): Promise<void> {
    const entries = await this.drainErrors();
    if (entries.length > 0) throw new InstrumentError(entries);
  }

  private async readErrorQueue(io: LinkIo): Promise<ScpiErrorEntry[]> {
    const entries: ScpiErrorEntry[] = [];
    for (let i = 0; i < this.maxErrorEntries; i += 1) {
      const entry = parseErrorEntry(await io.ask('SYST:ERR?'));
      if (entry.code === 0) return entries;
      entries.push(entry);
    }
    entries.push({ code: 0, message: `error queue not empty after ${this.maxErrorEntries} reads; stopped` });
    return entries;
  }
}
