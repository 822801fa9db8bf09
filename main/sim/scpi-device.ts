/**
 * Engine shared by the simulated instruments: lines in from any number of
 * links (connections), processed one at a time in arrival order, replies out
 * to the link that asked; error queue and Event Status Register; the
 * IEEE 488.2 common commands and SYSTem:ERRor. A device adds its own
 * command table. Replies pass through the device's fault hooks.
 */
import type { Clock } from '../time/clock.ts';
import { DeviceLink, type ReplyAction } from './device-link.ts';
import { ScpiError, SCPI_ERRORS, esrBitFor } from './scpi-errors.ts';
import {
  compilePattern,
  matchPattern,
  splitProgramMessage,
  type CompiledPattern,
  type ProgramUnit,
  type Suffixes,
} from './scpi-parser.ts';
import { parseBoolean, parseNumber, type NumberSpec } from './scpi-params.ts';
import { commonCommands } from './scpi-common-commands.ts';

export interface CommandContext {
  params: readonly string[];
  suffixes: Suffixes;
  /**
   * For a query that may wait indefinitely (a counter with no signal): a
   * newer message interrupts it (−410) and the returned signal aborts.
   */
  interruptible(): AbortSignal;
  number(index: number, spec: NumberSpec, field: string): number;
  bool(index: number, field: string): boolean;
  /** Marks this query as a measurement reading (counts toward reading-triggered faults). */
  countReading(): void;
}

export interface CommandDef {
  pattern: string;
  set?: (ctx: CommandContext) => void | Promise<void>;
  query?: (ctx: CommandContext) => string | Promise<string | null> | null;
}

/** Hooks the fault injector plugs into (see faults.ts). */
export interface DeviceFaultHooks {
  /** True while the device is hung: input is swallowed, nothing answers. */
  silent(): boolean;
  /** Decides what happens to a reply; `reading` is the reading number when the reply is a measurement. */
  replyAction(reading: number | null): ReplyAction;
}

interface CompiledCommand extends CommandDef {
  compiled: CompiledPattern;
}

const QUEUE_LIMIT = 10;
const RESOLVE_CACHE_LIMIT = 512;

interface Resolved {
  command: CompiledCommand;
  /** Shared between uses: handlers must not modify it. */
  suffixes: Suffixes;
  path: string[];
}

export class ScpiDevice {
  readonly role: string;
  readonly identity: string;
  readonly clock: Clock;
  faults: DeviceFaultHooks | null = null;
  readonly #commands: CompiledCommand[];
  readonly #links = new Set<DeviceLink>();
  readonly #inbox: { link: DeviceLink; line: string }[] = [];
  #errors: { code: number; text: string }[] = [];
  #esr = 0;
  #readings = 0;
  #pumping = false;
  #waiting: AbortController | null = null;
  readonly #resolved = new Map<string, Resolved | null>();
  readonly #onReset: () => void;

  constructor(options: { role: string; identity: string; clock: Clock; commands: CommandDef[]; onReset: () => void }) {
    this.role = options.role;
    this.identity = options.identity;
    this.clock = options.clock;
    this.#onReset = options.onReset;
    this.#commands = [...commonCommands(this), ...options.commands].map((c) => ({
      ...c,
      compiled: compilePattern(c.pattern),
    }));
  }

  /** Opens a new connection to the device. */
  connect(): DeviceLink {
    const link = new DeviceLink(
      (line) => this.#receive(link, line),
      () => this.#links.delete(link),
    );
    this.#links.add(link);
    return link;
  }

  /** Drops every open connection (a fault, or the server closing). */
  dropAllLinks(reason: Error): void {
    for (const link of [...this.#links]) link.drop(reason);
  }

  get readingCount(): number {
    return this.#readings;
  }

  get errorQueue(): readonly { code: number; text: string }[] {
    return this.#errors;
  }

  pushError(code: number, text: string): void {
    this.#esr |= esrBitFor(code);
    if (this.#errors.length >= QUEUE_LIMIT) {
      this.#errors[QUEUE_LIMIT - 1] = { code: SCPI_ERRORS.queueOverflow.code, text: SCPI_ERRORS.queueOverflow.message };
      return;
    }
    this.#errors.push({ code, text });
  }

  popError(): string {
    const next = this.#errors.shift();
    return next ? `${next.code},"${next.text}"` : '0,"No error"';
  }

  readEsr(): number {
    const value = this.#esr;
    this.#esr = 0;
    return value;
  }

  /** Event status enable register (IEEE 488.2 *ESE), 0..255; kept across *CLS and *RST like a real one. */
  ese = 0;

  setOpc(): void {
    this.#esr |= 1;
  }

  clearStatus(): void {
    this.#errors = [];
    this.#esr = 0;
  }

  reset(): void {
    this.#onReset();
  }

  #receive(link: DeviceLink, line: string): void {
    if (this.faults?.silent()) {
      link.lineDone();
      return;
    }
    // A new message while a query waits with no answer interrupts it (IEEE 488.2 §6.3.2.3, from memory).
    if (this.#waiting) {
      this.#waiting.abort();
      this.pushError(SCPI_ERRORS.queryInterrupted.code, SCPI_ERRORS.queryInterrupted.message);
    }
    this.#inbox.push({ link, line });
    if (!this.#pumping) void this.#pump();
  }

  async #pump(): Promise<void> {
    this.#pumping = true;
    try {
      for (let item = this.#inbox.shift(); item; item = this.#inbox.shift()) {
        try {
          await this.#execute(item.link, item.line);
        } finally {
          item.link.lineDone();
        }
      }
    } finally {
      this.#pumping = false;
    }
  }

  async #execute(link: DeviceLink, line: string): Promise<void> {
    const split = splitProgramMessage(line);
    if (!split.ok) {
      this.pushError(SCPI_ERRORS.syntax.code, `${SCPI_ERRORS.syntax.message};${split.detail}`);
      return;
    }
    const replies: string[] = [];
    let reading: number | null = null;
    let path: string[] = [];
    // Created only for a query that may wait indefinitely (AbortController is not free per line).
    let controller: AbortController | null = null;
    const interrupted = (): boolean => controller?.signal.aborted === true;
    for (const unit of split.units) {
      const found = this.#resolve(unit, path);
      if (!found) {
        this.pushError(SCPI_ERRORS.undefinedHeader.code, SCPI_ERRORS.undefinedHeader.message);
        break; // a command error discards the rest of the message
      }
      if (!unit.common) path = found.path;
      const ctx: CommandContext = {
        params: unit.params,
        suffixes: found.suffixes,
        interruptible: () => {
          controller ??= new AbortController();
          this.#waiting = controller;
          return controller.signal;
        },
        number: (i, spec, field) => parseNumber(unit.params[i], spec, field),
        bool: (i, field) => parseBoolean(unit.params[i], field),
        countReading: () => {
          this.#readings++;
          reading = this.#readings;
        },
      };
      try {
        if (unit.query) {
          const reply = await found.command.query?.(ctx);
          this.#waiting = null;
          if (interrupted()) return;
          if (reply !== null && reply !== undefined) replies.push(reply);
        } else {
          await found.command.set?.(ctx);
        }
      } catch (error) {
        this.#waiting = null;
        if (interrupted()) return;
        if (!(error instanceof ScpiError)) throw error;
        this.pushError(error.code, error.queueText);
        if (error.code <= -100 && error.code > -200) break;
      }
    }
    if (replies.length > 0) this.#send(link, replies.join(';'), reading);
  }

  /**
   * Finds the command a header names. A header without a leading `:` is
   * tried first below the previous command's path (SCPI compound headers),
   * then from the root. Results are cached per (path, header, query).
   */
  #resolve(unit: ProgramUnit, path: readonly string[]): Resolved | null {
    const relative = !unit.common && !unit.rooted && path.length > 0;
    const key = `${unit.query ? '?' : ''}${relative ? path.join(':') : ''}|${unit.header}`;
    const cached = this.#resolved.get(key);
    if (cached !== undefined) return cached;
    const written = unit.header.split(':');
    const candidates = relative ? [[...path, ...written], written] : [written];
    let found: Resolved | null = null;
    for (const mnemonics of candidates) {
      for (const command of this.#commands) {
        if (unit.query ? !command.query : !command.set) continue;
        const suffixes = matchPattern(command.compiled, mnemonics);
        if (suffixes) {
          found = { command, suffixes, path: mnemonics.slice(0, -1) };
          break;
        }
      }
      if (found) break;
    }
    if (this.#resolved.size < RESOLVE_CACHE_LIMIT) this.#resolved.set(key, found);
    return found;
  }

  #send(link: DeviceLink, text: string, reading: number | null): void {
    const action = this.faults?.replyAction(reading) ?? { kind: 'normal' };
    link.reply(`${text}\n`, action, this.clock);
  }
}
