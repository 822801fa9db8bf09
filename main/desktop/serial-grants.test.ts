import { describe, expect, it } from 'vitest';
import { isAppOrigin } from './app-url.ts';
import {
  allowDevice,
  allowPermissionCheck,
  allowPermissionRequest,
  grantKey,
  offerablePorts,
  SerialGrants,
  type SerialPortDescription,
} from './serial-grants.ts';
import { portLabel, serialChooserDialog } from './serial-chooser.ts';

const appOrigin = (origin: string): boolean => isAppOrigin(origin, undefined);

const ADAPTER: SerialPortDescription = {
  portId: 'a1b2',
  portName: 'ttyUSB0',
  displayName: 'USB serial adapter',
  vendorId: '1027',
  productId: '24577',
  serialNumber: 'BENCH42',
};
const NO_SERIAL_NUMBER: SerialPortDescription = {
  portId: 'c3',
  portName: 'ttyUSB1',
  vendorId: '6790',
  productId: '29987',
};
const BUILT_IN: SerialPortDescription = { portId: 'd4', portName: 'ttyS0' };
/**
 * ADAPTER as Electron's device permission handler describes it (PortInfoToValue in
 * Electron's serial_chooser_context.cc, read from its source): numeric ids, snake_case keys.
 */
const ADAPTER_DEVICE = { name: 'USB serial adapter', vendor_id: 1027, product_id: 24577, serial_number: 'BENCH42' };

describe('isAppOrigin', () => {
  it('is the app scheme origin (with or without the slash) or the dev server origin, nothing near them', () => {
    expect(isAppOrigin('tunebench://app', undefined)).toBe(true);
    expect(isAppOrigin('tunebench://app/', undefined)).toBe(true);
    expect(isAppOrigin('http://localhost:5173', 'http://localhost:5173/')).toBe(true);
    for (const other of [
      'tunebench://app.evil',
      'tunebench://x@app',
      'tunebench://app/index.html',
      'tunebench://app/?q',
      'https://app',
      'http://localhost:5173',
      'null',
      '',
    ])
      expect(isAppOrigin(other, undefined), other).toBe(false);
    expect(isAppOrigin('http://localhost:5174', 'http://localhost:5173')).toBe(false);
  });
});

describe('permission decisions', () => {
  it('a check allows serial for the app page only, and no other permission for anyone', () => {
    const serial = { permission: 'serial', requestingOrigin: 'tunebench://app/', securityOrigin: 'tunebench://app' };
    expect(allowPermissionCheck(serial, appOrigin)).toBe(true);
    expect(allowPermissionCheck({ ...serial, securityOrigin: 'https://example.org' }, appOrigin)).toBe(false);
    expect(allowPermissionCheck({ ...serial, embeddingOrigin: 'tunebench://app' }, appOrigin)).toBe(false);
    expect(allowPermissionCheck({ permission: 'serial', requestingOrigin: 'https://example.org/' }, appOrigin)).toBe(
      false,
    );
    for (const permission of ['media', 'hid', 'usb', 'geolocation', 'notifications', 'clipboard-read', 'fileSystem'])
      expect(allowPermissionCheck({ ...serial, permission }, appOrigin), permission).toBe(false);
  });

  it('a request is always refused: ports are granted only through the chooser', () => {
    for (const permission of ['serial', 'media', 'notifications', 'openExternal', 'unknown'])
      expect(allowPermissionRequest(permission)).toBe(false);
  });

  it('a device is allowed only when it is a serial port the user chose, asked for by the app origin', () => {
    const grants = new SerialGrants();
    const ask = (device: unknown, deviceType = 'serial', origin = 'tunebench://app') =>
      allowDevice({ deviceType, origin, device }, grants, appOrigin);
    expect(ask(ADAPTER_DEVICE)).toBe(false);
    grants.grant(ADAPTER);
    expect(ask(ADAPTER_DEVICE)).toBe(true);
    expect(ask({ ...ADAPTER_DEVICE, serial_number: 'BENCH43' })).toBe(false);
    expect(ask({ ...ADAPTER_DEVICE, product_id: 24592 })).toBe(false);
    expect(ask(ADAPTER_DEVICE, 'usb')).toBe(false);
    expect(ask(ADAPTER_DEVICE, 'hid')).toBe(false);
    expect(ask(ADAPTER_DEVICE, 'serial', 'https://example.org')).toBe(false);
    expect(ask({ name: 'USB serial adapter' })).toBe(false);
    expect(ask({ ...ADAPTER_DEVICE, vendor_id: '1027' })).toBe(false);
    expect(ask(null)).toBe(false);
  });
});

describe('what identifies a chosen port when Electron asks again', () => {
  it('USB ids and serial number, whatever connection (portId) or OS name it comes back with', () => {
    const grants = new SerialGrants();
    grants.grant({ ...ADAPTER, portId: 'first', portName: 'ttyUSB3' });
    expect(grants.allowsDevice(ADAPTER_DEVICE)).toBe(true);
    expect(grantKey(ADAPTER)).toBe('usb:1027:24577:sn:BENCH42');
  });

  it("Windows' device instance id, and on macOS the driver too", () => {
    const windows = { ...ADAPTER, deviceInstanceId: 'USB\\VID_0403&PID_6001\\BENCH42' };
    const grants = new SerialGrants();
    grants.grant(windows);
    expect(grants.allowsDevice({ name: 'x', device_instance_id: 'USB\\VID_0403&PID_6001\\BENCH42' })).toBe(true);
    const mac = { ...ADAPTER, usbDriverName: 'AppleUSBFTDI' };
    grants.grant(mac);
    expect(grants.allowsDevice({ ...ADAPTER_DEVICE, usb_driver: 'AppleUSBFTDI' })).toBe(true);
    expect(grants.allowsDevice({ ...ADAPTER_DEVICE, usb_driver: 'other' })).toBe(false);
  });

  it('a port without a serial number (or without USB ids) has no lasting key: Electron grants it for that connection only', () => {
    expect(grantKey(NO_SERIAL_NUMBER)).toBeNull();
    expect(grantKey(BUILT_IN)).toBeNull();
    const grants = new SerialGrants();
    grants.grant(NO_SERIAL_NUMBER);
    expect(grants.size).toBe(0);
    expect(grants.allowsDevice({ name: 'ttyUSB1', vendor_id: 6790, product_id: 29987 })).toBe(false);
  });

  it('offers only well-formed port entries', () => {
    expect(offerablePorts([ADAPTER, { portName: 'x' }, 'junk', { portId: '', portName: 'y' }, BUILT_IN])).toEqual([
      ADAPTER,
      BUILT_IN,
    ]);
    expect(offerablePorts(undefined)).toEqual([]);
  });
});

describe('the main-process chooser', () => {
  it('one button per port and Cancel, which is the default; a button maps back to its port', () => {
    const { options, portAt } = serialChooserDialog([ADAPTER, BUILT_IN]);
    expect(options.buttons).toEqual([
      'ttyUSB0 — USB serial adapter — vendor 1027, product 24577 — serial number BENCH42',
      'ttyS0',
      'Cancel',
    ]);
    expect(options.cancelId).toBe(2);
    expect(options.defaultId).toBe(2);
    expect(portAt(0)).toBe(ADAPTER);
    expect(portAt(1)).toBe(BUILT_IN);
    expect(portAt(2)).toBeNull();
    expect(portAt(-1)).toBeNull();
    expect(portAt(0.5)).toBeNull();
    expect(portLabel(NO_SERIAL_NUMBER)).toBe('ttyUSB1 — vendor 6790, product 29987');
  });
});
