import { describe, expect, it } from 'vitest';
import { parseAddress, type SerialAddress } from './address.ts';
import { AddressError } from './errors.ts';
import { FakeWebSerial } from './testing/fake-web-serial.ts';
import { WEB_SERIAL_BUFFER_BYTES, webSerialOpenOptions } from './web-serial-options.ts';
import { findGrantedPort, usbIdsFromPath, webSerialPortPath } from './web-serial-ports.ts';
import { WebSerialTransport } from './web-serial-transport.ts';

function refusal(run: () => unknown): AddressError {
  try {
    run();
  } catch (error) {
    if (error instanceof AddressError) return error;
    throw error;
  }
  throw new Error('expected an AddressError');
}

describe('bench file serial settings → Web Serial open options', () => {
  it('maps every setting of the address grammar (Web Serial SerialOptions names)', () => {
    expect(
      webSerialOpenOptions('serial:/dev/ttyUSB0?baud=19200&databits=7&parity=even&stopbits=2&flow=rtscts'),
    ).toEqual({
      baudRate: 19200,
      dataBits: 7,
      parity: 'even',
      stopBits: 2,
      flowControl: 'hardware',
      bufferSize: WEB_SERIAL_BUFFER_BYTES,
    });
  });

  it('an address without settings opens at the serial defaults, 9600 8N1, no flow control', () => {
    expect(webSerialOpenOptions('ASRL/dev/ttyACM0::INSTR')).toEqual({
      baudRate: 9600,
      dataBits: 8,
      parity: 'none',
      stopBits: 1,
      flowControl: 'none',
      bufferSize: WEB_SERIAL_BUFFER_BYTES,
    });
  });

  it('refuses XON/XOFF flow control, naming the key, the role, the address and what is valid', () => {
    const error = refusal(() => webSerialOpenOptions('serial:COM3?baud=9600&flow=xon', { role: 'counter' }));
    expect(error.field).toBe('flow');
    expect(error.message).toContain('"xon" is not possible over Web Serial for the counter at serial:COM3?baud=9600');
    expect(error.message).toContain('flow=none or flow=rtscts');
  });

  it('checks a descriptor that did not come through the address parser', () => {
    const bad = { ...parseAddress('serial:COM3'), baudRate: 0 } as SerialAddress;
    expect(refusal(() => webSerialOpenOptions(bad)).field).toBe('baud');
    const sevenStop = { ...parseAddress('serial:COM3'), stopBits: 3 } as unknown as SerialAddress;
    expect(refusal(() => webSerialOpenOptions(sevenStop)).message).toContain('stopbits=1 or stopbits=2');
  });

  it('refuses an address that is not serial', () => {
    const error = refusal(() => webSerialOpenOptions('tcp://192.168.1.20:5025', { role: 'supply' }));
    expect(error.field).toBe('address');
    expect(error.message).toContain('is not a serial address for the supply');
  });

  it('the transport refuses, at construction, settings it could never open and a path that names no port', () => {
    const serial = new FakeWebSerial();
    expect(refusal(() => new WebSerialTransport({ serial, address: 'serial:usb-0403-6001?flow=xon' })).field).toBe(
      'flow',
    );
    const noPort = refusal(() => new WebSerialTransport({ serial, address: 'serial:/dev/ttyUSB0?baud=9600' }));
    expect(noPort.field).toBe('path');
    expect(noPort.message).toContain('serial:usb-VVVV-PPPP');
  });
});

describe('USB ids in the port path', () => {
  it('reads back the ids it writes, in hex', () => {
    const ids = { vendorId: 0x0403, productId: 0x6001 };
    expect(webSerialPortPath(ids)).toBe('usb-0403-6001');
    expect(usbIdsFromPath('usb-0403-6001')).toEqual(ids);
    expect(usbIdsFromPath('USB-10C4-EA60')).toEqual({ vendorId: 0x10c4, productId: 0xea60 });
    expect(webSerialPortPath(null)).toBe('web-serial');
    expect(usbIdsFromPath('/dev/ttyUSB0')).toBeNull();
    expect(usbIdsFromPath('usb-403-6001')).toBeNull();
  });

  it('finds no port when none is granted', async () => {
    await expect(findGrantedPort(new FakeWebSerial(), { vendorId: 1, productId: 2 })).rejects.toThrow(
      /no port with USB 0001:0002 is plugged in and allowed for this page/,
    );
  });
});
