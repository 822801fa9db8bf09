/**
 * Serial-line transport over the W3C Web Serial API, for a page that drives
 * the instruments itself. It behaves like SerialTransport: bytes only (the
 * SCPI link above frames lines with the project's LineFramer), writes
 * drained for up to a second on close, and a port that goes away mid-run —
 * its stream ends or errors fatally, or it fires 'disconnect' — is a dropped
 * link (close event with a reason). Reopening after a drop looks the port up
 * again through `getPorts()` by its USB vendor/product ids, because an
 * adapter plugged back in is a new port object.
 *
 * No Node built-ins and no DOM typings: it runs in the page and in Node tests.
 */
import type { Clock } from '../time/clock.ts';
import { formatAddress, parseAddress, type SerialAddress } from './address.ts';
import { AddressError, DisconnectedError } from './errors.ts';
import { TransportListeners } from './transport-listeners.ts';
import type { Transport, TransportEvents } from './transport.ts';
import { webSerialOpenOptions } from './web-serial-options.ts';
import { findGrantedPort, usbIdsFromPath, usbIdsOf, webSerialPortPath, type UsbIds } from './web-serial-ports.ts';
import type {
  ByteReadable,
  ByteReader,
  ByteWriter,
  WebSerial,
  WebSerialOpenOptions,
  WebSerialPort,
} from './web-serial-types.ts';

/** How long close() lets pending writes drain before closing anyway; the same grace as SerialTransport's. */
export const WEB_SERIAL_DRAIN_GRACE_S = 1;

export interface WebSerialTransportOptions {
  /**
   * The port the user chose (`navigator.serial.requestPort()`). Without it the
   * address path must name USB ids (`usb-VVVV-PPPP`) and open() finds the
   * granted port with them.
   */
  port?: WebSerialPort | undefined;
  /** `navigator.serial`: where the port is found (again, after it was unplugged). */
  serial: WebSerial;
  /** The bench file's serial address: its line settings, and a path that is either `usb-VVVV-PPPP` or not used. */
  address: SerialAddress | string;
  /** The bench role, named in a refusal of the line settings. */
  role?: string | undefined;
  /** Timer for the close grace; the page's timers by default. */
  clock?: Pick<Clock, 'setTimer'>;
}

interface OpenLink {
  port: WebSerialPort;
  readable: ByteReadable;
  reader: ByteReader;
  writer: ByteWriter;
  onDisconnect: () => void;
}

function defaultTimer(seconds: number, callback: () => void): () => void {
  const handle = setTimeout(callback, seconds * 1000);
  return () => clearTimeout(handle);
}

const encoder = new TextEncoder();

function quietly(step: () => void): void {
  try {
    step();
  } catch {
    // Releasing a lock on a stream of a vanished port: nothing left to release.
  }
}
const messageOf = (error: unknown): string => (error instanceof Error ? error.message : String(error));

export class WebSerialTransport implements Transport {
  readonly address: string;
  /** The open options every open uses (checked once, at construction). */
  readonly openOptions: WebSerialOpenOptions;
  private readonly serial: WebSerial;
  private readonly ids: UsbIds | null;
  private readonly setTimer: (seconds: number, callback: () => void) => () => void;
  private readonly listeners = new TransportListeners();
  private port: WebSerialPort | null;
  private link: OpenLink | null = null;
  /** Set by a drop: the next open looks the port up again. */
  private lost = false;
  /** Teardown of a dropped link still under way (the next open waits for it). */
  private teardown: Promise<void> = Promise.resolve();
  private opening: Promise<void> | null = null;

  constructor(options: WebSerialTransportOptions) {
    const line = typeof options.address === 'string' ? parseAddress(options.address) : options.address;
    if (line.kind !== 'serial') throw new AddressError('address', 'Web Serial opens serial:PATH?baud=N addresses only');
    this.openOptions = webSerialOpenOptions(line, { role: options.role });
    this.port = options.port ?? null;
    this.serial = options.serial;
    this.ids = options.port === undefined ? usbIdsFromPath(line.path) : usbIdsOf(options.port.getInfo());
    if (this.port === null && this.ids === null)
      throw new AddressError(
        'path',
        `"${line.path}" names no port a page can open; give the adapter's USB ids as serial:usb-VVVV-PPPP?… (hex) or choose the port in the browser`,
      );
    this.setTimer = options.clock?.setTimer.bind(options.clock) ?? defaultTimer;
    this.address = formatAddress({ ...line, path: webSerialPortPath(this.ids) });
  }

  get isOpen(): boolean {
    return this.link !== null;
  }

  /** Opens the port (looking it up again after a drop); concurrent calls share one attempt. */
  open(): Promise<void> {
    if (this.link !== null) return Promise.resolve();
    this.opening ??= this.openLink().finally(() => {
      this.opening = null;
    });
    return this.opening;
  }

  private async openLink(): Promise<void> {
    await this.teardown;
    let port = this.port;
    try {
      // A port that is gone (even if its streams have not said so yet) is looked up again: a replug is a new object.
      const gone = port === null || this.lost || port.connected === false;
      if (gone && this.ids !== null) port = await findGrantedPort(this.serial, this.ids, port ?? undefined);
      if (port === null) throw new Error('no port chosen');
      await port.open(this.openOptions);
    } catch (error) {
      throw new DisconnectedError(this.address, messageOf(error), { cause: error, opening: true });
    }
    const readable = port.readable;
    const writable = port.writable;
    if (readable === null || writable === null) {
      await port.close().catch(() => undefined);
      throw new DisconnectedError(this.address, 'the port opened without its streams', { opening: true });
    }
    this.port = port;
    this.lost = false;
    const link: OpenLink = {
      port,
      readable,
      reader: readable.getReader(),
      writer: writable.getWriter(),
      onDisconnect: () => this.drop(link, new Error('serial port disconnected (adapter unplugged?)')),
    };
    port.addEventListener('disconnect', link.onDisconnect);
    this.link = link;
    void this.pump(link);
  }

  async write(data: Uint8Array | string): Promise<void> {
    const link = this.link;
    if (link === null) throw new DisconnectedError(this.address, 'write on a closed link');
    try {
      await link.writer.write(typeof data === 'string' ? encoder.encode(data) : data);
    } catch (error) {
      // A Web Serial write fails only when the port is gone (or closing): the link is.
      this.drop(link, error instanceof Error ? error : new Error(String(error)));
      throw new DisconnectedError(this.address, messageOf(error), { cause: error });
    }
  }

  /**
   * Lets pending writes (a final "output off") reach the line, then closes;
   * after the grace it aborts them and closes anyway. A failed close is reported.
   */
  async close(): Promise<void> {
    const link = this.link;
    if (link === null) {
      await this.teardown;
      return;
    }
    this.link = null;
    link.port.removeEventListener('disconnect', link.onDisconnect);
    try {
      await this.drainOrAbort(link.writer);
      await link.reader.cancel().catch(() => undefined);
      link.reader.releaseLock();
      await link.port.close();
    } catch (error) {
      throw new DisconnectedError(this.address, `close failed: ${messageOf(error)}`, { cause: error });
    } finally {
      this.listeners.emitClose(null);
    }
  }

  on<E extends keyof TransportEvents>(event: E, listener: TransportEvents[E]): () => void {
    return this.listeners.on(event, listener);
  }

  /** Reads until the link is closed or lost. A non-fatal line error (parity, framing, break, overrun) loses bytes, not the link. */
  private async pump(link: OpenLink): Promise<void> {
    for (;;) {
      let result;
      try {
        result = await link.reader.read();
      } catch (error) {
        if (this.link !== link) return;
        const fresh = link.port.readable;
        // After a non-fatal error the API puts a new stream in `readable`; after a fatal one, null.
        if (fresh !== null && fresh !== link.readable) {
          link.reader.releaseLock();
          link.readable = fresh;
          link.reader = fresh.getReader();
          continue;
        }
        this.drop(link, error instanceof Error ? error : new Error(String(error)));
        return;
      }
      if (this.link !== link) return;
      if (result.done) {
        this.drop(link, new Error('serial port stream ended'));
        return;
      }
      if (result.value !== undefined && result.value.byteLength > 0) this.listeners.emitData(result.value);
    }
  }

  /** The link went away under us: report it once, and free the port object for a later reopen. */
  private drop(link: OpenLink, reason: Error): void {
    if (this.link !== link) return;
    this.link = null;
    this.lost = true;
    link.port.removeEventListener('disconnect', link.onDisconnect);
    this.teardown = this.release(link);
    this.listeners.emitClose(reason);
  }

  /** Best effort on a port that may be dead: every step may fail, none may stop the others. */
  private async release(link: OpenLink): Promise<void> {
    await link.writer.abort().catch(() => undefined);
    quietly(() => link.writer.releaseLock());
    await link.reader.cancel().catch(() => undefined);
    quietly(() => link.reader.releaseLock());
    await link.port.close().catch(() => undefined);
  }

  private async drainOrAbort(writer: ByteWriter): Promise<void> {
    const drained = await new Promise<boolean>((resolve) => {
      const cancel = this.setTimer(WEB_SERIAL_DRAIN_GRACE_S, () => resolve(false));
      writer.close().then(
        () => {
          cancel();
          resolve(true);
        },
        () => {
          cancel();
          resolve(false);
        },
      );
    });
    if (!drained) await writer.abort().catch(() => undefined);
    writer.releaseLock();
  }
}
