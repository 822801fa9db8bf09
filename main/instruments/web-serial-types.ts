/**
 * The part of the W3C Web Serial API (https://wicg.github.io/serial/) that
 * tunebench uses, declared here rather than taken from DOM typings: main's
 * tsconfig has no DOM library, the app's has no Web Serial, and the page and
 * the tests (Node's own ReadableStream/WritableStream) both satisfy these
 * shapes. The names are the API's own; only the byte-stream interfaces are
 * narrowed to what the transport calls.
 */

/** SerialOptions of `SerialPort.open()`. */
export interface WebSerialOpenOptions {
  baudRate: number;
  /** 7 or 8; the API's default 8. */
  dataBits?: 7 | 8;
  /** 1 or 2; the API's default 1. */
  stopBits?: 1 | 2;
  parity?: 'none' | 'even' | 'odd';
  /** Read and write buffer size, bytes; the API's default 255. */
  bufferSize?: number;
  /** 'hardware' is RTS/CTS; the API has no software (XON/XOFF) flow control. */
  flowControl?: 'none' | 'hardware';
}

/** SerialPortInfo of `SerialPort.getInfo()`: USB ids when the port is a USB device. */
export interface WebSerialPortInfo {
  usbVendorId?: number | undefined;
  usbProductId?: number | undefined;
}

export interface ByteReadResult {
  done: boolean;
  value?: Uint8Array | undefined;
}

/** ReadableStreamDefaultReader<Uint8Array>, as far as the transport reads it. */
export interface ByteReader {
  read(): Promise<ByteReadResult>;
  cancel(reason?: unknown): Promise<void>;
  releaseLock(): void;
}

/** WritableStreamDefaultWriter<Uint8Array>, as far as the transport writes it. */
export interface ByteWriter {
  write(chunk: Uint8Array): Promise<void>;
  close(): Promise<void>;
  abort(reason?: unknown): Promise<void>;
  releaseLock(): void;
}

export interface ByteReadable {
  getReader(): ByteReader;
}

export interface ByteWritable {
  getWriter(): ByteWriter;
}

/** One port the page may use (granted by the user through `requestPort()`). */
export interface WebSerialPort {
  /** Non-null while the port is open and has met no fatal error; a non-fatal line error replaces it with a new stream. */
  readonly readable: ByteReadable | null;
  readonly writable: ByteWritable | null;
  /** False once the device is gone (newer browsers; absent in older ones). */
  readonly connected?: boolean | undefined;
  open(options: WebSerialOpenOptions): Promise<void>;
  /** Rejects while `readable` or `writable` is locked by a reader or writer. */
  close(): Promise<void>;
  getInfo(): WebSerialPortInfo;
  /** 'disconnect' fires when the device goes away (unplugged). */
  addEventListener(type: 'disconnect', listener: () => void): void;
  removeEventListener(type: 'disconnect', listener: () => void): void;
}

/** `navigator.serial`, as far as finding granted ports again goes. */
export interface WebSerial {
  getPorts(): Promise<WebSerialPort[]>;
}
