/**
 * The wiring of Web Serial access onto a session, with a fake session that
 * records what is registered (nothing here may launch Electron).
 */
import { describe, expect, it, vi } from 'vitest';
import { isAppOrigin, isAppUrl } from './app-url.ts';
import { installSerialAccess, type ChooserContents, type PermissionSession } from './serial-access.ts';
import type { SerialPortDescription } from './serial-grants.ts';

type Handlers = Parameters<PermissionSession<ChooserContents>['setPermissionCheckHandler']>[0];
type RequestHandler = Parameters<PermissionSession<ChooserContents>['setPermissionRequestHandler']>[0];
type DeviceHandler = Parameters<PermissionSession<ChooserContents>['setDevicePermissionHandler']>[0];
type ChooserListener = Parameters<PermissionSession<ChooserContents>['on']>[1];

class FakeSession implements PermissionSession<ChooserContents> {
  check: Handlers | null = null;
  request: RequestHandler | null = null;
  device: DeviceHandler | null = null;
  chooser: ChooserListener | null = null;
  setPermissionCheckHandler(handler: Handlers): void {
    this.check = handler;
  }
  setPermissionRequestHandler(handler: RequestHandler): void {
    this.request = handler;
  }
  setDevicePermissionHandler(handler: DeviceHandler): void {
    this.device = handler;
  }
  on(_event: 'select-serial-port', listener: ChooserListener): this {
    this.chooser = listener;
    return this;
  }
}

const SUPPLY_PORT: SerialPortDescription = {
  portId: 'p1',
  portName: 'ttyUSB0',
  vendorId: '1027',
  productId: '24577',
  serialNumber: 'SUP1',
};
const COUNTER_PORT: SerialPortDescription = {
  portId: 'p2',
  portName: 'ttyUSB1',
  vendorId: '1027',
  productId: '24577',
  serialNumber: 'CNT7',
};
const APP_PAGE = { getURL: () => 'tunebench://app/index.html' };

function setup(choose: (ports: SerialPortDescription[]) => Promise<SerialPortDescription | null>) {
  const session = new FakeSession();
  const choosePort = vi.fn(choose);
  const log = vi.fn();
  const grants = installSerialAccess(session, {
    isAppOrigin: (origin) => isAppOrigin(origin, undefined),
    isOwnPage: (url) => isAppUrl(url, undefined),
    choosePort,
    log,
  });
  return { session, grants, choosePort, log };
}

/** Fires the chooser event as Electron would and resolves with what the page is told. */
function requestPort(session: FakeSession, ports: unknown[], contents: ChooserContents = APP_PAGE) {
  const event = { preventDefault: vi.fn() };
  const answer = new Promise<string>((resolve) => session.chooser?.(event, ports, contents, resolve));
  return { event, answer };
}

/** A port as Electron's device handler describes it (numeric USB ids, serial number; see serial-grants.ts). */
const device = (port: SerialPortDescription, origin = 'tunebench://app') => ({
  deviceType: 'serial',
  origin,
  device: {
    name: port.portName,
    vendor_id: Number(port.vendorId),
    product_id: Number(port.productId),
    serial_number: port.serialNumber,
  },
});

describe('installSerialAccess', () => {
  it('registers the check, request and device handlers and the select-serial-port listener', () => {
    const { session } = setup(async () => null);
    expect(session.check).toBeTypeOf('function');
    expect(session.request).toBeTypeOf('function');
    expect(session.device).toBeTypeOf('function');
    expect(session.chooser).toBeTypeOf('function');
  });

  it('the registered handlers deny every other permission and every request', () => {
    const { session } = setup(async () => null);
    const details = { securityOrigin: 'tunebench://app' };
    expect(session.check?.(null, 'serial', 'tunebench://app/', details)).toBe(true);
    expect(session.check?.(null, 'media', 'tunebench://app/', details)).toBe(false);
    expect(session.check?.(null, 'serial', 'https://example.org/', { securityOrigin: 'https://example.org' })).toBe(
      false,
    );
    for (const permission of ['serial', 'media', 'notifications', 'geolocation']) {
      const callback = vi.fn();
      session.request?.(null, permission, callback);
      expect(callback).toHaveBeenCalledExactlyOnceWith(false);
    }
  });

  it('grants the port the user picks in the chooser, and only that one', async () => {
    const { session, grants, choosePort } = setup(async (ports) => ports[1] ?? null);
    expect(session.device?.(device(COUNTER_PORT))).toBe(false);
    const { event, answer } = requestPort(session, [SUPPLY_PORT, COUNTER_PORT]);
    expect(event.preventDefault).toHaveBeenCalled();
    expect(await answer).toBe('p2');
    expect(choosePort).toHaveBeenCalledOnce();
    expect(grants.size).toBe(1);
    expect(session.device?.(device(COUNTER_PORT))).toBe(true);
    expect(session.device?.(device(SUPPLY_PORT))).toBe(false);
    expect(session.device?.(device(COUNTER_PORT, 'https://example.org'))).toBe(false);
    expect(session.device?.({ ...device(COUNTER_PORT), deviceType: 'usb' })).toBe(false);
  });

  it('a cancelled or failed chooser grants nothing', async () => {
    const cancelled = setup(async () => null);
    expect(await requestPort(cancelled.session, [SUPPLY_PORT]).answer).toBe('');
    expect(cancelled.grants.size).toBe(0);
    const failed = setup(async () => {
      throw new Error('dialog gone');
    });
    expect(await requestPort(failed.session, [SUPPLY_PORT]).answer).toBe('');
    expect(failed.grants.size).toBe(0);
    expect(failed.log).toHaveBeenCalledWith('tunebench: serial port chooser failed: dialog gone');
    // A choice that was not on the offered list is not a grant either.
    const stray = setup(async () => ({ ...SUPPLY_PORT, portId: 'elsewhere' }));
    expect(await requestPort(stray.session, [SUPPLY_PORT]).answer).toBe('');
    expect(stray.grants.size).toBe(0);
  });

  it('a page that is not the app gets no chooser and no port', async () => {
    const { session, choosePort, grants } = setup(async (ports) => ports[0] ?? null);
    const { answer } = requestPort(session, [SUPPLY_PORT], { getURL: () => 'https://example.org/' });
    expect(await answer).toBe('');
    expect(choosePort).not.toHaveBeenCalled();
    expect(grants.size).toBe(0);
  });

  it('malformed port entries are not offered; none left means no chooser', async () => {
    const { session, choosePort } = setup(async (ports) => ports[0] ?? null);
    expect(await requestPort(session, [{ portName: 'x' }, 'junk']).answer).toBe('');
    expect(choosePort).not.toHaveBeenCalled();
    expect(await requestPort(session, [{ portName: 'x' }, SUPPLY_PORT]).answer).toBe('p1');
    expect(choosePort).toHaveBeenCalledWith([SUPPLY_PORT], APP_PAGE);
  });
});
