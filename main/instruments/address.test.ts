import { describe, expect, it } from 'vitest';
import { AddressError } from './errors.ts';
import { formatAddress, parseAddress } from './address.ts';

function errorOf(text: string): AddressError {
  try {
    parseAddress(text);
  } catch (error) {
    if (error instanceof AddressError) return error;
    throw error;
  }
  throw new Error(`"${text}" was accepted`);
}

describe('parseAddress', () => {
  it('reads raw-socket addresses; 5025 is the default SCPI port (common practice)', () => {
    expect(parseAddress('tcp://127.0.0.1:5025')).toEqual({ kind: 'tcp', host: '127.0.0.1', port: 5025 });
    expect(parseAddress('tcp://bench-psu.lan')).toEqual({ kind: 'tcp', host: 'bench-psu.lan', port: 5025 });
    expect(parseAddress('TCP://[::1]:5026')).toEqual({ kind: 'tcp', host: '::1', port: 5026 });
  });

  it('reads serial addresses with every option and applies 9600 8N1 defaults', () => {
    expect(parseAddress('serial:/dev/ttyUSB0?baud=115200')).toEqual({
      kind: 'serial',
      path: '/dev/ttyUSB0',
      baudRate: 115200,
      dataBits: 8,
      parity: 'none',
      stopBits: 1,
      flow: 'none',
    });
    expect(parseAddress('serial:COM3?baud=19200&parity=even&stopbits=2&flow=rtscts&databits=7')).toEqual({
      kind: 'serial',
      path: 'COM3',
      baudRate: 19200,
      dataBits: 7,
      parity: 'even',
      stopBits: 2,
      flow: 'rtscts',
    });
    expect(parseAddress('serial:/dev/ttyS1?flow=xon')).toMatchObject({ baudRate: 9600, flow: 'xon' });
  });

  it('reads sim with and without a role', () => {
    expect(parseAddress('sim')).toEqual({ kind: 'sim' });
    expect(parseAddress('sim:counter')).toEqual({ kind: 'sim', role: 'counter' });
  });

  it('reads the open VISA resource forms', () => {
    expect(parseAddress('TCPIP0::192.168.0.20::5025::SOCKET')).toEqual({
      kind: 'tcp',
      host: '192.168.0.20',
      port: 5025,
    });
    expect(parseAddress('tcpip::localhost::5555::socket')).toEqual({ kind: 'tcp', host: 'localhost', port: 5555 });
    expect(parseAddress('ASRL/dev/ttyUSB0::INSTR')).toMatchObject({
      kind: 'serial',
      path: '/dev/ttyUSB0',
      baudRate: 9600,
    });
  });

  it.each([
    ['', 'address'],
    ['tcp://host:0', 'port'],
    ['tcp://host:70000', 'port'],
    ['tcp://host:50x', 'host'],
    ['tcp://', 'host'],
    ['serial:', 'path'],
    ['serial:/dev/ttyUSB0?baud=fast', 'baud'],
    ['serial:/dev/ttyUSB0?parity=mark', 'parity'],
    ['serial:/dev/ttyUSB0?stopbits=1.5', 'stopbits'],
    ['serial:/dev/ttyUSB0?databits=9', 'databits'],
    ['serial:/dev/ttyUSB0?flow=dtr', 'flow'],
    ['serial:/dev/ttyUSB0?speed=9600', 'speed'],
    ['sim:oscilloscope', 'sim role'],
    ['TCPIP0::10.0.0.1::inst0::INSTR', 'resource'],
    ['ASRL3::INSTR', 'resource'],
    ['http://127.0.0.1', 'address'],
  ])('rejects %j naming the field %s', (text, field) => {
    const error = errorOf(text);
    expect(error.field).toBe(field);
    expect(error.message).toContain(field);
  });

  it('formats descriptors back to strings that parse to the same descriptor', () => {
    for (const text of [
      'tcp://127.0.0.1:5025',
      'tcp://[::1]:6000',
      'sim',
      'sim:supply',
      'serial:/dev/ttyUSB0?baud=115200&parity=odd&flow=rtscts',
    ]) {
      const parsed = parseAddress(text);
      expect(parseAddress(formatAddress(parsed))).toEqual(parsed);
    }
  });
});
