/**
 * Serial ports the page may use: those the user grants through the browser's
 * chooser (navigator.serial.requestPort) and those granted before (getPorts,
 * so a reload keeps them). A port is addressed by its USB ids,
 * `serial:usb-VVVV-PPPP?baud=…` (main/instruments/web-serial-ports.ts), and
 * opened by the Web Serial transport (main/instruments/web-serial-transport.ts),
 * which finds it again after an unplug by those ids.
 */
import type { SerialPortInfo } from '../../contract/bench-api.ts';
import type { SerialAddress } from '../../../main/instruments/address.ts';
import type { Transport } from '../../../main/instruments/transport.ts';
import { describeUsbIds, usbIdsOf, webSerialPortPath } from '../../../main/instruments/web-serial-ports.ts';
import { WebSerialTransport } from '../../../main/instruments/web-serial-transport.ts';
import type { WebSerial, WebSerialPort } from '../../../main/instruments/web-serial-types.ts';
import type { Clock } from '../../../main/time/clock.ts';

/** navigator.serial with the chooser. */
export interface BrowserSerial extends WebSerial {
  requestPort(): Promise<WebSerialPort>;
}

let serial: BrowserSerial | null = null;
/** Ports chosen in this page, by path (a port without USB ids is only reachable as the one chosen). */
const chosen = new Map<string, WebSerialPort>();

/** The page's navigator.serial (the page entry sets it where the browser has Web Serial). */
export function useBrowserSerial(api: BrowserSerial | null): void {
  serial = api;
}

function describe(port: WebSerialPort): SerialPortInfo {
  const ids = usbIdsOf(port.getInfo());
  return { path: webSerialPortPath(ids), manufacturer: ids === null ? null : describeUsbIds(ids) };
}

/** The ports this page may open: granted ones (this visit or before), by path. */
export async function grantedPorts(): Promise<SerialPortInfo[]> {
  const found = new Map<string, SerialPortInfo>();
  for (const port of [...chosen.values(), ...(serial ? await serial.getPorts() : [])]) {
    const info = describe(port);
    if (!found.has(info.path)) found.set(info.path, info);
  }
  return [...found.values()];
}

/** Opens the browser's chooser; the port picked is offered from then on. */
export async function choosePort(): Promise<SerialPortInfo> {
  if (serial === null)
    throw new Error('this browser has no Web Serial (Chromium-based browsers have it, over HTTPS or on localhost)');
  const port = await serial.requestPort();
  const info = describe(port);
  chosen.set(info.path, port);
  return info;
}

/** The Web Serial transport for `serial:usb-VVVV-PPPP?…` (or the port chosen without USB ids). */
export function browserSerialTransport(
  address: SerialAddress,
  role: string | undefined,
  clock: Pick<Clock, 'setTimer'> | undefined,
): Transport {
  if (serial === null)
    throw new Error(`serial:${address.path}: this browser has no Web Serial; use a Chromium-based browser`);
  return new WebSerialTransport({ port: chosen.get(address.path), serial, address, role, clock });
}
