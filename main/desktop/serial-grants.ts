/**
 * Who may use Web Serial in the desktop app, as pure decisions: only the
 * app's own page (its origin, in its own frame), only the `serial`
 * permission, and only ports the user chose in the main process's chooser.
 * Every other permission and device stays denied. Electron asks these
 * questions through the session's handlers; serial-access.ts wires them.
 */
import { z } from 'zod';

/** Electron's SerialPort structure, as far as a grant goes; checked, since it crosses into our code. */
export const serialPortDescriptionSchema = z.object({
  portId: z.string().min(1),
  portName: z.string(),
  displayName: z.string().optional(),
  vendorId: z.string().optional(),
  productId: z.string().optional(),
  serialNumber: z.string().optional(),
  /** Stable per device on Windows. */
  deviceInstanceId: z.string().optional(),
  /** macOS: one port may be listed once per driver. */
  usbDriverName: z.string().optional(),
});

export type SerialPortDescription = z.infer<typeof serialPortDescriptionSchema>;

/** The ports of a chooser event that are well formed; anything else is not offered. */
export function offerablePorts(portList: unknown): SerialPortDescription[] {
  if (!Array.isArray(portList)) return [];
  return portList.flatMap((entry) => {
    const checked = serialPortDescriptionSchema.safeParse(entry);
    return checked.success ? [checked.data] : [];
  });
}

/**
 * How Electron describes a serial port to the device permission handler: the
 * form it stores permissions in (`PortInfoToValue` in Electron's
 * shell/browser/serial/serial_chooser_context.cc, read from its source):
 * Windows' device instance id, else the USB ids (numbers) with the serial
 * number (and on macOS the driver). A port without those never reaches the
 * handler: Electron grants it for this connection only, by token, when the
 * chooser returns it.
 */
export const serialDeviceSchema = z.object({
  name: z.string().optional(),
  device_instance_id: z.string().optional(),
  vendor_id: z.number().int().nonnegative().optional(),
  product_id: z.number().int().nonnegative().optional(),
  serial_number: z.string().optional(),
  usb_driver: z.string().optional(),
});

type SerialDevice = z.infer<typeof serialDeviceSchema>;

const nonEmpty = (text: string | undefined): text is string => text !== undefined && text !== '';

function identity(device: SerialDevice): string | null {
  if (nonEmpty(device.device_instance_id)) return `win:${device.device_instance_id}`;
  const { vendor_id: vendor, product_id: product, serial_number: serial } = device;
  if (vendor === undefined || product === undefined || !nonEmpty(serial)) return null;
  return `usb:${vendor}:${product}:sn:${serial}${nonEmpty(device.usb_driver) ? `:driver:${device.usb_driver}` : ''}`;
}

/** The chooser's description of a port in the device handler's terms (the chooser gives USB ids as decimal text). */
function asDevice(port: SerialPortDescription): SerialDevice {
  const id = (text: string | undefined): number | undefined =>
    text !== undefined && /^\d+$/.test(text) ? Number(text) : undefined;
  return {
    device_instance_id: port.deviceInstanceId,
    vendor_id: id(port.vendorId),
    product_id: id(port.productId),
    serial_number: port.serialNumber,
    usb_driver: port.usbDriverName,
  };
}

/** What identifies a chosen port when Electron asks about it again (after a replug too); null when Electron never asks. */
export function grantKey(port: SerialPortDescription): string | null {
  return identity(asDevice(port));
}

/** The ports the user chose during this run of the app (in memory: a restart asks again). */
export class SerialGrants {
  private readonly keys = new Set<string>();

  grant(port: SerialPortDescription): void {
    const key = grantKey(port);
    if (key !== null) this.keys.add(key);
  }

  /** Whether a device, as the device permission handler gets it, is one the user chose. */
  allowsDevice(device: unknown): boolean {
    const checked = serialDeviceSchema.safeParse(device);
    const key = checked.success ? identity(checked.data) : null;
    return key !== null && this.keys.has(key);
  }

  get size(): number {
    return this.keys.size;
  }
}

/** Whether an origin string is the app's own page. */
export type OriginTest = (origin: string) => boolean;

export interface PermissionCheck {
  permission: string;
  requestingOrigin: string;
  /** Origin of the frame asking, for serial checks. */
  securityOrigin?: string | undefined;
  /** Set only for a cross-origin subframe. */
  embeddingOrigin?: string | undefined;
}

/**
 * Permission checks: `serial` for the app's own origin, asked by its own
 * frame (no cross-origin embedding), and nothing else.
 */
export function allowPermissionCheck(check: PermissionCheck, isAppOrigin: OriginTest): boolean {
  if (check.permission !== 'serial') return false;
  if (check.embeddingOrigin !== undefined && check.embeddingOrigin !== '') return false;
  return isAppOrigin(check.securityOrigin ?? check.requestingOrigin);
}

/**
 * Permission requests: always refused. Web Serial asks for a port through the
 * chooser event, never through a request, so nothing here grants anything.
 */
export function allowPermissionRequest(_permission: string): boolean {
  return false;
}

export interface DeviceCheck {
  deviceType: string;
  origin: string;
  device: unknown;
}

/** Device checks: a serial port the user chose, for the app's own origin; no HID, no USB, nothing unchosen. */
export function allowDevice(check: DeviceCheck, grants: SerialGrants, isAppOrigin: OriginTest): boolean {
  return check.deviceType === 'serial' && isAppOrigin(check.origin) && grants.allowsDevice(check.device);
}
