/**
 * A Web Serial port for tests, built on real ReadableStream/WritableStream
 * pairs (Node 20 globals) whose far end is a TCP connection to an instrument
 * — the simulated bench served on 127.0.0.1 — through a byte bridge. It keeps
 * the rules of the API (https://wicg.github.io/serial/) the transport relies
 * on: open() once, close() refused while a stream is locked, `readable` and
 * `writable` null when closed (or once their stream is closed), and on an
 * unplug both streams error, become null and 'disconnect' fires.
 */
import { connect, type Socket } from 'node:net';
import type { WebSerial, WebSerialOpenOptions, WebSerialPort, WebSerialPortInfo } from '../web-serial-types.ts';

export interface FarEnd {
  host: string;
  port: number;
}

/** `tcp://HOST:PORT` (what serveSimBench reports) as a far end. */
export function farEndOf(address: string): FarEnd {
  const url = new URL(address);
  return { host: url.hostname, port: Number(url.port) };
}

export interface FakeSerialPortOptions {
  far: FarEnd;
  info?: WebSerialPortInfo;
  /** Hand far-end bytes to the page in chunks of at most this many (1: every byte is its own read). Default: as they came. */
  chunkBytes?: number;
}

function namedError(name: string, message: string): Error {
  const error = new Error(message);
  error.name = name;
  return error;
}

/** The controller's `signal` (in Node 20 and the Streams standard; missing from @types/node 20). */
function abortSignalOf(controller: WritableStreamDefaultController): AbortSignal {
  return (controller as WritableStreamDefaultController & { signal: AbortSignal }).signal;
}

function connectTo(far: FarEnd): Promise<Socket> {
  return new Promise((resolve, reject) => {
    const socket = connect(far.port, far.host, () => {
      socket.off('error', reject);
      socket.setNoDelay(true);
      resolve(socket);
    });
    socket.once('error', reject);
  });
}

export class FakeSerialPort implements WebSerialPort {
  readable: ReadableStream<Uint8Array> | null = null;
  writable: WritableStream<Uint8Array> | null = null;
  connected = true;
  /** Every open()'s options, in order. */
  readonly opens: WebSerialOpenOptions[] = [];
  /** Chunks handed to the page so far (one read each). */
  chunksDelivered = 0;
  /** Far-end bytes are dropped while true (an instrument that went quiet). */
  mute = false;
  /** Writes are held (never complete) while true: flow control holding the line off. */
  holdWrites = false;
  private readonly far: FarEnd;
  private readonly info: WebSerialPortInfo;
  private readonly chunkBytes: number;
  private socket: Socket | null = null;
  private readController: ReadableStreamDefaultController<Uint8Array> | null = null;
  private writeController: WritableStreamDefaultController | null = null;
  private readonly disconnectListeners = new Set<() => void>();
  private cutAfterBytes: number | null = null;

  constructor(options: FakeSerialPortOptions) {
    this.far = options.far;
    this.info = options.info ?? {};
    this.chunkBytes = options.chunkBytes ?? Number.POSITIVE_INFINITY;
  }

  getInfo(): WebSerialPortInfo {
    return { ...this.info };
  }

  addEventListener(_type: 'disconnect', listener: () => void): void {
    this.disconnectListeners.add(listener);
  }

  removeEventListener(_type: 'disconnect', listener: () => void): void {
    this.disconnectListeners.delete(listener);
  }

  async open(options: WebSerialOpenOptions): Promise<void> {
    if (!this.connected) throw namedError('NetworkError', 'The device has been lost.');
    if (this.readable !== null || this.writable !== null)
      throw namedError('InvalidStateError', 'The port is already open.');
    if (!Number.isInteger(options.baudRate) || options.baudRate <= 0)
      throw new TypeError('Requested baud rate must be greater than zero.');
    this.opens.push({ ...options });
    const socket = await connectTo(this.far);
    this.socket = socket;
    const writable = new WritableStream<Uint8Array>({
      start: (controller) => {
        this.writeController = controller;
      },
      write: (chunk, controller) =>
        this.holdWrites
          ? // Held until the stream is aborted, which signals the sink (as the browser's serial sink does).
            new Promise<void>((_resolve, reject) =>
              abortSignalOf(controller).addEventListener('abort', () =>
                reject(namedError('AbortError', 'write aborted')),
              ),
            )
          : new Promise<void>((resolve, reject) => socket.write(chunk, (error) => (error ? reject(error) : resolve()))),
      close: () => {
        if (this.writable === writable) this.writable = null;
      },
      abort: () => {
        if (this.writable === writable) this.writable = null;
      },
    });
    this.readable = this.newReadable();
    this.writable = writable;
    socket.on('data', (chunk: Buffer) => this.fromFarEnd(new Uint8Array(chunk)));
    socket.on('error', () => undefined);
  }

  async close(): Promise<void> {
    if (this.readable?.locked === true || this.writable?.locked === true)
      throw new TypeError('Cannot close a port while its streams are locked.');
    const readable = this.readable;
    const writable = this.writable;
    this.readable = null;
    this.writable = null;
    this.readController = null;
    await readable?.cancel();
    await writable?.abort();
    this.socket?.destroy();
    this.socket = null;
  }

  /**
   * A non-fatal line error (parity): the current stream errors and, as the
   * API does, `readable` is a new stream on the same open port.
   */
  lineError(): void {
    const controller = this.readController;
    this.readable = this.newReadable();
    controller?.error(namedError('ParityError', 'Parity error.'));
  }

  private newReadable(): ReadableStream<Uint8Array> {
    const readable = new ReadableStream<Uint8Array>({
      start: (controller) => {
        this.readController = controller;
      },
      cancel: () => {
        if (this.readable !== readable) return;
        this.readController = null;
        this.readable = null;
      },
    });
    return readable;
  }

  /** The next far-end chunk reaches the page only up to this many bytes; then the adapter is unplugged. */
  cutNextReply(afterBytes: number): void {
    this.cutAfterBytes = afterBytes;
  }

  /** The adapter is pulled out: the streams error as the API's "device lost", then 'disconnect' fires. */
  unplug(): void {
    this.connected = false;
    const lost = namedError('NetworkError', 'The device has been lost.');
    this.readController?.error(lost);
    this.writeController?.error(lost);
    this.readController = null;
    this.writeController = null;
    this.readable = null;
    this.writable = null;
    this.socket?.destroy();
    this.socket = null;
    setTimeout(() => this.emitDisconnect(), 0);
  }

  /** Only the 'disconnect' event, streams untouched (an API that reports the loss by event first). */
  emitDisconnect(): void {
    for (const listener of [...this.disconnectListeners]) listener();
  }

  private fromFarEnd(bytes: Uint8Array): void {
    if (this.mute || this.readController === null) return;
    let chunk = bytes;
    const cut = this.cutAfterBytes;
    if (cut !== null) chunk = bytes.subarray(0, cut);
    for (let at = 0; at < chunk.length; at += this.chunkBytes) {
      // A copy per chunk: the page owns what it reads.
      this.readController.enqueue(chunk.slice(at, Math.min(chunk.length, at + this.chunkBytes)));
      this.chunksDelivered += 1;
    }
    if (cut !== null) {
      this.cutAfterBytes = null;
      this.unplug();
    }
  }
}

/** `navigator.serial` over a list of fake ports the user has granted; unplugged ports are not listed. */
export class FakeWebSerial implements WebSerial {
  readonly ports: FakeSerialPort[] = [];

  async getPorts(): Promise<WebSerialPort[]> {
    return this.ports.filter((port) => port.connected);
  }
}
