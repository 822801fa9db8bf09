/**
 * Serial-line transport over the `serialport` package. Each open() creates a
 * fresh port object, so a session can reopen after a USB adapter comes back.
 */
import type { SerialPort } from 'serialport';
import { z } from 'zod';
import type { Clock } from '../time/clock.ts';
import { formatAddress, SERIAL_DEFAULTS, type FlowControl, type Parity } from './address.ts';
import { DisconnectedError } from './errors.ts';
import type { ReadlineLines } from './readline-lines.ts';
import { TransportListeners } from './transport-listeners.ts';
import type { Transport, TransportEvents } from './transport.ts';

export interface SerialTransportOptions {
  path: string;
  /** Default 9600. */
  baudRate?: number;
  /** Default 8. */
  dataBits?: 7 | 8;
  /** Default none. */
  parity?: Parity;
  /** Default 1. */
  stopBits?: 1 | 2;
  /** Hardware (RTS/CTS) or software (XON/XOFF) flow control; default none. */
  flow?: FlowControl;
  /** Timer for the close grace; real time by default. */
  clock?: Pick<Clock, 'setTimer'>;
}

/** How long close() lets pending writes drain before closing anyway (a port held off by XOFF/CTS never drains). */
export const DRAIN_GRACE_S = 1;

interface LineSubscriber {
  terminator: string;
  onLine: (line: Buffer) => void;
  feed: ReadlineLines | null;
}

function nodeTimer(seconds: number, callback: () => void): () => void {
  const handle = setTimeout(callback, seconds * 1000);
  return () => clearTimeout(handle);
}

export class SerialTransport implements Transport {
  readonly address: string;
  private readonly options: Required<Omit<SerialTransportOptions, 'clock'>>;
  private readonly setTimer: (seconds: number, callback: () => void) => () => void;
  private readonly listeners = new TransportListeners();
  /** onLines subscribers; each gets a fresh line splitter per opened port. */
  private readonly lineSubscribers = new Set<LineSubscriber>();
  private readlineLines: typeof ReadlineLines | null = null;
  private port: SerialPort | null = null;

  constructor(options: SerialTransportOptions) {
    if (options.path === '') throw new TypeError('path: must not be empty');
    const { clock, ...line } = options;
    this.options = { ...SERIAL_DEFAULTS, ...line };
    this.setTimer = clock?.setTimer.bind(clock) ?? nodeTimer;
    if (!Number.isInteger(this.options.baudRate) || this.options.baudRate <= 0) {
      throw new TypeError(`baudRate: ${this.options.baudRate} is not a positive integer`);
    }
    this.address = formatAddress({ kind: 'serial', ...this.options });
  }

  get isOpen(): boolean {
    return this.port !== null;
  }

  async open(): Promise<void> {
    if (this.port !== null) return;
    // Loaded on first use: serialport's native binding would cost every CLI start ~40 ms, the
    // readline parser ~25 ms (measured with require() on the dev machine).
    const [{ SerialPort }, { ReadlineLines }] = await Promise.all([
      import('serialport'),
      import('./readline-lines.ts'),
    ]);
    this.readlineLines = ReadlineLines;
    if (this.port !== null) return;
    const { path, baudRate, dataBits, parity, stopBits, flow } = this.options;
    const port = new SerialPort({
      path,
      baudRate,
      dataBits,
      parity,
      stopBits,
      rtscts: flow === 'rtscts',
      xon: flow === 'xon',
      xoff: flow === 'xon',
      autoOpen: false,
    });
    return new Promise((resolve, reject) => {
      port.open((error) => {
        if (error) {
          // The OS error once; the address is in the error's own wording.
          reject(new DisconnectedError(this.address, error.message, { cause: error, opening: true }));
          return;
        }
        this.attach(port);
        resolve();
      });
    });
  }

  write(data: Uint8Array | string): Promise<void> {
    const port = this.port;
    if (port === null) return Promise.reject(new DisconnectedError(this.address, 'write on a closed link'));
    return new Promise((resolve, reject) => {
      port.write(data, (error: Error | null | undefined) => {
        if (error) reject(new DisconnectedError(this.address, error.message, { cause: error }));
        else resolve();
      });
    });
  }

  /**
   * Lets pending writes (a final "output off") reach the line, then closes;
   * after DRAIN_GRACE_S it closes anyway. A failed close is reported.
   */
  close(): Promise<void> {
    const port = this.port;
    if (port === null) return Promise.resolve();
    this.port = null;
    return new Promise((resolve, reject) => {
      if (!port.isOpen) {
        this.listeners.emitClose(null);
        resolve();
        return;
      }
      let closing = false;
      const shut = (): void => {
        if (closing) return;
        closing = true;
        cancelGrace();
        port.close((error: Error | null | undefined) => {
          if (error) reject(new DisconnectedError(this.address, `close failed: ${error.message}`, { cause: error }));
          else resolve();
        });
      };
      const cancelGrace = this.setTimer(DRAIN_GRACE_S, shut);
      port.drain(shut);
    });
  }

  on<E extends keyof TransportEvents>(event: E, listener: TransportEvents[E]): () => void {
    return this.listeners.on(event, listener);
  }

  /** Reply lines framed by @serialport/parser-readline (readline-lines.ts). */
  onLines(terminator: string, onLine: (line: Buffer) => void): () => void {
    const subscriber: LineSubscriber = { terminator, onLine, feed: null };
    if (this.port !== null && this.readlineLines !== null)
      subscriber.feed = new this.readlineLines(onLine, { terminator });
    this.lineSubscribers.add(subscriber);
    return () => {
      this.lineSubscribers.delete(subscriber);
    };
  }

  private attach(port: SerialPort): void {
    this.port = port;
    // A new port carries no part of an old line: fresh splitters.
    const Lines = this.readlineLines;
    for (const subscriber of this.lineSubscribers) {
      subscriber.feed = Lines === null ? null : new Lines(subscriber.onLine, { terminator: subscriber.terminator });
    }
    port.on('data', (chunk: Buffer) => {
      this.listeners.emitData(chunk);
      for (const subscriber of this.lineSubscribers) subscriber.feed?.push(chunk);
    });
    // Errors after open also arrive as a close with `disconnected: true`.
    port.on('error', () => undefined);
    port.on('close', (error: Error | null | undefined) => {
      if (this.port !== port) {
        this.listeners.emitClose(null);
        return;
      }
      this.port = null;
      this.listeners.emitClose(error ?? new Error('serial port closed'));
    });
  }
}

const optionalText = z.string().optional().catch(undefined);
const portListSchema = z.array(
  z.looseObject({
    path: z.string(),
    manufacturer: optionalText,
    serialNumber: optionalText,
    vendorId: optionalText,
    productId: optionalText,
  }),
);

export interface SerialPortListing {
  ports: { path: string; manufacturer?: string; serialNumber?: string; vendorId?: string; productId?: string }[];
  /** Why the list is empty when the system could not enumerate ports (e.g. no udevadm in a container). */
  error?: string;
}

/** Lists serial ports; never throws (SerialPort.list() fails where udev is missing). */
export async function listSerialPorts(): Promise<SerialPortListing> {
  try {
    const { SerialPort } = await import('serialport');
    // What the OS reports is checked like any other input (and typed by the check).
    const ports = portListSchema.parse(await SerialPort.list());
    return {
      ports: ports.map((p) => ({
        path: p.path,
        manufacturer: p.manufacturer,
        serialNumber: p.serialNumber,
        vendorId: p.vendorId,
        productId: p.productId,
      })),
    };
  } catch (error) {
    return { ports: [], error: error instanceof Error ? error.message : String(error) };
  }
}
