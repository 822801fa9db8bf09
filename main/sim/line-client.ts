/**
 * A minimal line-oriented SCPI client over any Transport, used by the sim's
 * own tests and the `sim` self-check. (The real SCPI session with timeouts
 * and error draining lives in main/instruments/.)
 */
import type { Transport } from '../instruments/transport.ts';

export class LineClient {
  readonly transport: Transport;
  readonly #lines: string[] = [];
  readonly #waiters: ((line: string) => void)[] = [];
  #pending = '';
  readonly #decoder = new TextDecoder('utf-8', { fatal: false });
  closedWith: Error | null | undefined = undefined;

  constructor(transport: Transport) {
    this.transport = transport;
    transport.on('data', (chunk) => {
      this.#pending += this.#decoder.decode(chunk, { stream: true });
      for (let nl = this.#pending.indexOf('\n'); nl >= 0; nl = this.#pending.indexOf('\n')) {
        const line = this.#pending.slice(0, nl).replace(/\r$/, '');
        this.#pending = this.#pending.slice(nl + 1);
        const waiter = this.#waiters.shift();
        if (waiter) waiter(line);
        else this.#lines.push(line);
      }
    });
    transport.on('close', (reason) => {
      this.closedWith = reason;
    });
  }

  async send(command: string): Promise<void> {
    await this.transport.write(`${command}\n`);
  }

  /** The next reply line (already received or still to come). */
  nextLine(): Promise<string> {
    const ready = this.#lines.shift();
    if (ready !== undefined) return Promise.resolve(ready);
    return new Promise((resolve) => this.#waiters.push(resolve));
  }

  async query(command: string): Promise<string> {
    await this.send(command);
    return this.nextLine();
  }

  /** Lines received but not yet taken. */
  get buffered(): number {
    return this.#lines.length;
  }
}
