/**
 * Finding a granted Web Serial port again. A page cannot name a device path;
 * what survives an unplug is the user's grant and the adapter's USB vendor
 * and product ids (`getInfo()`), so a port that comes back is matched on
 * those. The ids also name the port in the address tunebench records:
 * `serial:usb-VVVV-PPPP?baud=…` (hex), which reads back to the same ids.
 */
import type { WebSerial, WebSerialPort, WebSerialPortInfo } from './web-serial-types.ts';

export interface UsbIds {
  vendorId: number;
  productId: number;
}

const USB_PATH = /^usb-([0-9a-f]{4})-([0-9a-f]{4})$/i;

/** The USB ids of a port, or null when it is not a USB device (a built-in UART, Bluetooth). */
export function usbIdsOf(info: WebSerialPortInfo): UsbIds | null {
  const { usbVendorId, usbProductId } = info;
  return usbVendorId === undefined || usbProductId === undefined
    ? null
    : { vendorId: usbVendorId, productId: usbProductId };
}

const hex4 = (n: number): string => n.toString(16).padStart(4, '0');

/** `usb-0403-6001` for those ids; `web-serial` for a port without USB ids. */
export function webSerialPortPath(ids: UsbIds | null): string {
  return ids === null ? 'web-serial' : `usb-${hex4(ids.vendorId)}-${hex4(ids.productId)}`;
}

/** The ids a `usb-VVVV-PPPP` path names, or null for any other path. */
export function usbIdsFromPath(path: string): UsbIds | null {
  const match = USB_PATH.exec(path);
  if (match === null) return null;
  return { vendorId: parseInt(match[1] ?? '', 16), productId: parseInt(match[2] ?? '', 16) };
}

export function describeUsbIds(ids: UsbIds): string {
  return `USB ${hex4(ids.vendorId)}:${hex4(ids.productId)}`;
}

/**
 * The granted port with these ids that is present and not open (an open one
 * belongs to another instrument of this page). `previous` wins when it is
 * still a candidate. Throws an Error saying what the user can do when none,
 * or more than one indistinguishable port, qualifies.
 */
export async function findGrantedPort(
  serial: WebSerial,
  ids: UsbIds,
  previous?: WebSerialPort,
): Promise<WebSerialPort> {
  const candidates = (await serial.getPorts()).filter((port) => {
    const found = usbIdsOf(port.getInfo());
    return (
      found !== null &&
      found.vendorId === ids.vendorId &&
      found.productId === ids.productId &&
      port.connected !== false &&
      port.readable === null &&
      port.writable === null
    );
  });
  if (previous !== undefined && candidates.includes(previous)) return previous;
  const only = candidates[0];
  if (candidates.length === 1 && only !== undefined) return only;
  if (candidates.length === 0)
    throw new Error(
      `no port with ${describeUsbIds(ids)} is plugged in and allowed for this page; plug the adapter back in, or choose its port again`,
    );
  throw new Error(
    `${candidates.length} allowed ports have ${describeUsbIds(ids)} and cannot be told apart; choose this instrument's port again`,
  );
}
