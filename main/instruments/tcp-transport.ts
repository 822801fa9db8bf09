/**
 * Raw TCP socket transport (SCPI over a socket, port 5025 by common practice).
 * Each open() makes a fresh socket, so a session can reopen after a drop;
 * listeners stay attached to the transport across reopenings.
 */
import net from 'node:net';
import type { Clock } from '../time/clock.ts';
import { DEFAULT_SCPI_PORT, formatAddress } from './address.ts';
import { DisconnectedError, TimeoutError } from './errors.ts';
import { TransportListeners } from './transport-listeners.ts';
import type { Transport, TransportEvents } from './transport.ts';

/** Longest wait for the far end to finish closing, s. */
const CLOSE_GRACE_S = 1;

export interface TcpTransportOptions {
  host: string;
  /** Default 5025. */
  port?: number;
  /** Give up connecting after this long, s; default 5. */
  connectTimeoutS?: number;
  /** Timer source for the connect timeout; default Node's timers. */
  clock?: Pick<Clock, 'setTimer'>;
}

export class TcpTransport implements Transport {
  readonly address: string;
  private readonly host: string;
  private readonly port: number;
  private readonly connectTimeoutS: number;
  private readonly setTimer: (seconds: number, callback: () => void) => () => void;
  private readonly listeners = new TransportListeners();
  private socket: net.Socket | null = null;

  constructor(options: TcpTransportOptions) {
    if (options.host === '') throw new TypeError('host: must not be empty');
    this.host = options.host;
    this.port = options.port ?? DEFAULT_SCPI_PORT;
    if (!Number.isInteger(this.port) || this.port < 1 || this.port > 65535)
      throw new TypeError(`port: ${this.port} is not 1-65535`);
    this.connectTimeoutS = options.connectTimeoutS ?? 5;
    if (!(this.connectTimeoutS > 0)) throw new TypeError('connectTimeoutS: must be positive');
    this.setTimer = options.clock?.setTimer.bind(options.clock) ?? nodeTimer;
    this.address = formatAddress({ kind: 'tcp', host: this.host, port: this.port });
  }

  get isOpen(): boolean {
    return this.socket !== null;
  }

  open(): Promise<void> {
    if (this.socket !== null) return Promise.resolve();
    return new Promise((resolve, reject) => {
      const socket = net.createConnection({ host: this.host, port: this.port });
      const fail = (error: Error): void => {
        cancelTimer();
        socket.destroy();
        reject(error);
      };
      const cancelTimer = this.setTimer(this.connectTimeoutS, () =>
        fail(new TimeoutError(`connect to ${this.address}`, this.connectTimeoutS)),
      );
      socket.once('error', fail);
      socket.once('connect', () => {
        cancelTimer();
        socket.off('error', fail);
        // Small request/reply lines: send each at once rather than batching (Nagle).
        socket.setNoDelay(true);
        this.attach(socket);
        resolve();
      });
    });
  }

  write(data: Uint8Array | string): Promise<void> {
    const socket = this.socket;
    if (socket === null) return Promise.reject(new DisconnectedError(this.address, 'write on a closed link'));
    return new Promise((resolve, reject) => {
      socket.write(data, (error) => {
        if (error) reject(new DisconnectedError(this.address, error.message, { cause: error }));
        else resolve();
      });
    });
  }

  /**
   * Ends the connection after pending writes have gone out (a final
   * "output off" must not be lost), forcing it shut if the far end lingers.
   */
  close(): Promise<void> {
    const socket = this.socket;
    if (socket === null) return Promise.resolve();
    this.socket = null;
    return new Promise((resolve) => {
      const cancelForce = this.setTimer(CLOSE_GRACE_S, () => socket.destroy());
      socket.once('close', () => {
        cancelForce();
        resolve();
      });
      socket.end();
    });
  }

  on<E extends keyof TransportEvents>(event: E, listener: TransportEvents[E]): () => void {
    return this.listeners.on(event, listener);
  }

  private attach(socket: net.Socket): void {
    this.socket = socket;
    let lastError: Error | null = null;
    socket.on('data', (chunk: Buffer) => this.listeners.emitData(chunk));
    socket.on('error', (error) => {
      lastError = error;
    });
    socket.on('close', () => {
      // Our own close() already cleared the socket: that is not a lost link.
      if (this.socket !== socket) {
        this.listeners.emitClose(null);
        return;
      }
      this.socket = null;
      this.listeners.emitClose(lastError ?? new Error('remote end closed the connection'));
    });
  }
}

function nodeTimer(seconds: number, callback: () => void): () => void {
  const handle = setTimeout(callback, seconds * 1000);
  return () => clearTimeout(handle);
}
