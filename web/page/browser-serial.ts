/**
 * Serial ports the user granted to this page (the browser's port chooser,
 * navigator.serial.requestPort), and the seam for the Web Serial transport
 * (issue 16 item 1, built separately): until a transport is registered the
 * page can list a granted port but says plainly that it cannot talk over it.
 * A granted port is addressed as `serial:browser-N` (N = 1, 2… in grant order).
 */
import type { SerialPortInfo } from '../../app/contract/bench-api.ts';
import type { SerialAddress } from '../../main/instruments/address.ts';
import type { Transport } from '../../main/instruments/transport.ts';
import type { Clock } from '../../main/time/clock.ts';

/** The part of the W3C Web Serial SerialPort the page uses here. */
export interface GrantedPort {
  getInfo(): { usbVendorId?: number; usbProductId?: number };
}

export type WebSerialTransportFactory = (
  port: GrantedPort,
  settings: SerialAddress & { clock?: Pick<Clock, 'setTimer'> },
) => Transport;

const PREFIX = 'browser-';
const granted: GrantedPort[] = [];
let factory: WebSerialTransportFactory | null = null;

/** Plugs in the Web Serial transport (the page entry does this when the build has one). */
export function registerWebSerialTransport(make: WebSerialTransportFactory): void {
  factory = make;
}

export function hasWebSerialTransport(): boolean {
  return factory !== null;
}

function describe(port: GrantedPort, index: number): SerialPortInfo {
  const info = port.getInfo();
  const hex = (n: number | undefined): string => (n === undefined ? '?' : n.toString(16).padStart(4, '0'));
  return {
    path: `${PREFIX}${index + 1}`,
    manufacturer: info.usbVendorId === undefined ? null : `USB ${hex(info.usbVendorId)}:${hex(info.usbProductId)}`,
  };
}

export function grantedPorts(): SerialPortInfo[] {
  return granted.map(describe);
}

/** Adds a port the user picked in the browser's chooser (the same port twice is kept once). */
export function addGrantedPort(port: GrantedPort): SerialPortInfo {
  const known = granted.indexOf(port);
  if (known >= 0) return describe(port, known);
  granted.push(port);
  return describe(port, granted.length - 1);
}

/** The transport for `serial:browser-N`, or a refusal that says what is missing. */
export function browserSerialTransport(address: SerialAddress, clock: Pick<Clock, 'setTimer'> | undefined): Transport {
  const index = address.path.startsWith(PREFIX) ? Number(address.path.slice(PREFIX.length)) - 1 : -1;
  const port = granted[index];
  if (port === undefined)
    throw new Error(
      `serial:${address.path}: not a port granted to this page; pick one with "Serial port in this browser" (granted: ${
        granted.length === 0
          ? 'none'
          : grantedPorts()
              .map((p) => p.path)
              .join(', ')
      })`,
    );
  if (factory === null)
    throw new Error(
      `serial:${address.path}: this build of the web edition has no Web Serial transport yet; use the simulated bench here, or the desktop app or \`tunebench serve\` for instruments`,
    );
  return factory(port, { ...address, clock });
}
