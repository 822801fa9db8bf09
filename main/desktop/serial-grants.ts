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
 * What identifies a chosen device when it is asked about again, strongest
 * first: Windows' device instance id; USB ids with the serial number; USB
 * ids with the OS port name (an adapter without a serial number plugged back
 * into the same socket — the identity a desktop serial address has too);
 * else only this connection of it (`portId`).
 */
export function grantKey(port: SerialPortDescription): string {
  if (port.deviceInstanceId !== undefined && port.deviceInstanceId !== '') return `win:${port.deviceInstanceId}`;
  const usb = port.vendorId !== undefined && port.productId !== undefined ? `${port.vendorId}:${port.productId}` : null;
  if (usb !== null && port.serialNumber !== undefined && port.serialNumber !== '')
    return `usb:${usb}:sn:${port.serialNumber}`;
  if (usb !== null) return `usb:${usb}:at:${port.portName}`;
  return `port:${port.portId}`;
}

/** The ports the user chose during this run of the app (in memory: a restart asks again). */
export class SerialGrants {
  private readonly keys = new Set<string>();

  grant(port: SerialPortDescription): void {
    this.keys.add(grantKey(port));
  }

  allows(port: SerialPortDescription): boolean {
    return this.keys.has(grantKey(port));
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
  if (check.deviceType !== 'serial' || !isAppOrigin(check.origin)) return false;
  const port = serialPortDescriptionSchema.safeParse(check.device);
  return port.success && grants.allows(port.data);
}
