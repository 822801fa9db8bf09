/**
 * One connection between a host and a simulated instrument, seen from the
 * device: bytes in from the host are framed into lines (`\n`, a trailing
 * `\r` dropped); replies go out asynchronously as bytes, shaped by the fault
 * injector (delayed, replaced by garbage, swallowed, or the link dropped).
 */
import type { Clock } from '../time/clock.ts';

export type ReplyAction =
  | { kind: 'normal' }
  | { kind: 'delay'; delayS: number }
  | { kind: 'garbage'; bytes: Uint8Array }
  | { kind: 'drop' }
  | { kind: 'silent' };

type DataListener = (chunk: Uint8Array) => void;
type CloseListener = (reason: Error | null) => void;

const encoder = new TextEncoder();

export class DeviceLink {
  #open = true;
  #pending = '';
  /** Per link: a multi-byte character split across chunks must not mix with another link's bytes. */
  readonly #decoder = new TextDecoder();
  #linesInFlight = 0;
  #inputEnded: (() => void) | null = null;
  readonly #onLine: (line: string) => void;
  readonly #onClosed: () => void;
  readonly #dataListeners = new Set<DataListener>();
  readonly #closeListeners = new Set<CloseListener>();

  constructor(onLine: (line: string) => void, onClosed: () => void) {
    this.#onLine = onLine;
    this.#onClosed = onClosed;
  }

  get open(): boolean {
    return this.#open;
  }

  onData(listener: DataListener): () => void {
    this.#dataListeners.add(listener);
    return () => this.#dataListeners.delete(listener);
  }

  onClose(listener: CloseListener): () => void {
    this.#closeListeners.add(listener);
    return () => this.#closeListeners.delete(listener);
  }

  /** Bytes from the host. */
  write(data: Uint8Array | string): void {
    if (!this.#open) return;
    this.#pending += typeof data === 'string' ? data : this.#decoder.decode(data, { stream: true });
    for (let nl = this.#pending.indexOf('\n'); nl >= 0; nl = this.#pending.indexOf('\n')) {
      let line = this.#pending.slice(0, nl);
      this.#pending = this.#pending.slice(nl + 1);
      if (line.endsWith('\r')) line = line.slice(0, -1);
      this.#linesInFlight++;
      this.#onLine(line);
    }
  }

  /** The device finished a line from this link (replied or not). */
  lineDone(): void {
    this.#linesInFlight = Math.max(0, this.#linesInFlight - 1);
    this.#checkDrained();
  }

  /**
   * The host half-closed its side (sent everything it will send): once the
   * lines already received are answered, `onDrained` runs (the server then
   * ends its side), as an instrument answers what it was asked before hanging up.
   */
  endInput(onDrained: () => void): void {
    this.#inputEnded = onDrained;
    this.#checkDrained();
  }

  #checkDrained(): void {
    if (this.#inputEnded && this.#linesInFlight === 0) {
      const done = this.#inputEnded;
      this.#inputEnded = null;
      // After the last reply's microtask has delivered it.
      queueMicrotask(() => queueMicrotask(done));
    }
  }

  /** A reply from the device, shaped by `action`. */
  reply(text: string, action: ReplyAction, clock: Clock): void {
    switch (action.kind) {
      case 'normal':
        this.#deliverSoon(encoder.encode(text));
        return;
      case 'delay':
        clock.setTimer(action.delayS, () => this.#deliverSoon(encoder.encode(text)));
        return;
      case 'garbage':
        this.#deliverSoon(action.bytes);
        return;
      case 'drop':
        this.drop(new Error('connection dropped by the simulated instrument (fault)'));
        return;
      case 'silent':
        return;
    }
  }

  /** The device side ends the connection; the host sees `close` with the reason. */
  drop(reason: Error): void {
    if (!this.#open) return;
    this.#finish();
    queueMicrotask(() => {
      for (const listener of this.#closeListeners) listener(reason);
      this.#closeListeners.clear();
    });
  }

  /** The host ends the connection. */
  close(): void {
    if (!this.#open) return;
    this.#finish();
    this.#closeListeners.clear();
  }

  #finish(): void {
    this.#open = false;
    this.#dataListeners.clear();
    this.#onClosed();
  }

  #deliverSoon(bytes: Uint8Array): void {
    // Asynchronous, as a real link is: the host's write() returns before the reply arrives.
    queueMicrotask(() => {
      if (!this.#open) return;
      for (const listener of this.#dataListeners) listener(bytes);
    });
  }
}
