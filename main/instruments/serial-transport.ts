/**
 * Serial-line transport over the `serialport` package. Each open() creates a
 * fresh port object, so a session can reopen after a USB adapter comes back.
 */
import { SerialPort } from 'serialport';
import { formatAddress, SERIAL_DEFAULTS, type FlowControl, type Parity } from './address.ts';
import { DisconnectedError } from './errors.ts';
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
}

export class SerialTransport implements Transport {
  readonly address: string;
  private readonly options: Required<SerialTransportOptions>;
  private readonly listeners = new TransportListeners();
  private port: SerialPort | null = null;

  constructor(options: SerialTransportOptions) {
    if (options.path === '') throw new TypeError('path: must not be empty');
    this.options = { ...SERIAL_DEFAULTS, ...options };
    if (!Number.isInteger(this.options.baudRate) || this.options.baudRate <= 0) {
      throw new TypeError(`baudRate: ${this.options.baudRate} is not a positive integer`);
    }
    this.address = formatAddress({ kind: 'serial', ...this.options });
  }

  get isOpen(): boolean {
    return this.port !== null;
  }

  open(): Promise<void> {
    if (this.port !== null) return Promise.resolve();
    const { path, baudRate, dataBits, parity, stopBits, flow } = this.options;
    const port = new SerialPort({
      path, baudRate, dataBits, parity, stopBits,
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

  close(): Promise<void> {
    const port = this.port;
    if (port === null) return Promise.resolve();
    this.port = null;
    return new Promise((resolve) => {
      if (!port.isOpen) {
        this.listeners.emitClose(null);
        resolve();
        return;
      }
      // Let pending writes (a final "output off") reach the line before closing.
      port.drain(() => port.close(() => resolve()));
    });
  }

  on<E extends keyof TransportEvents>(event: E, listener: TransportEvents[E]): () => void {
    return this.listeners.on(event, listener);
  }

  private attach(port: SerialPort): void {
    this.port = port;
    port.on('data', (chunk: Buffer) => this.listeners.emitData(chunk));
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

export interface SerialPortListing {
  ports: { path: string; manufacturer?: string; serialNumber?: string; vendorId?: string; productId?: string }[];
  /** Why the list is empty when the system could not enumerate ports (e.g. no udevadm in a container). */
  error?: string;
}

/** Lists serial ports; never throws (SerialPort.list() fails where udev is missing). */
export async function listSerialPorts(): Promise<SerialPortListing> {
  try {
    const ports = await SerialPort.list();
    return {
      ports: ports.map((p) => ({ path: p.path, manufacturer: p.manufacturer, serialNumber: p.serialNumber, vendorId: p.vendorId, productId: p.productId })),
    };
  } catch (error) {
    return { ports: [], error: error instanceof Error ? error.message : String(error) };
  }
}
