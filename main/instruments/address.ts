/**
 * Instrument address strings (bench file `address`) parsed into typed
 * descriptors. Accepted forms:
 *   tcp://HOST:PORT                      raw socket (port defaults to 5025, common practice)
 *   serial:PATH?baud=N&parity=none|even|odd&stopbits=1|2&flow=none|rtscts|xon&databits=7|8
 *   sim, sim:supply, sim:counter, sim:thermometer
 *   TCPIP[n]::HOST::PORT::SOCKET         VISA raw-socket resource (open VISA specification)
 *   ASRL<PATH>::INSTR                    VISA serial resource, e.g. ASRL/dev/ttyUSB0::INSTR
 * Errors name the field and the expected form.
 */
import { AddressError } from './errors.ts';
import type { RoleName } from './roles.ts';

export type Parity = 'none' | 'even' | 'odd';
export type FlowControl = 'none' | 'rtscts' | 'xon';

export interface TcpAddress {
  kind: 'tcp';
  host: string;
  port: number;
}

export interface SerialAddress {
  kind: 'serial';
  path: string;
  baudRate: number;
  dataBits: 7 | 8;
  parity: Parity;
  stopBits: 1 | 2;
  flow: FlowControl;
}

export interface SimAddress {
  kind: 'sim';
  /** Which simulated instrument; absent means "the role this address is configured for". */
  role?: RoleName;
}

export type InstrumentAddress = TcpAddress | SerialAddress | SimAddress;

/** Default raw-socket port for SCPI instruments (common practice). */
export const DEFAULT_SCPI_PORT = 5025;
/** Serial defaults when the address names none: 9600 8N1, no flow control (the VISA defaults, from memory). */
export const SERIAL_DEFAULTS = { baudRate: 9600, dataBits: 8, parity: 'none', stopBits: 1, flow: 'none' } as const;

const ROLES: readonly RoleName[] = ['supply', 'counter', 'thermometer', 'chamber'];
const VISA_TCPIP = /^TCPIP(\d*)::([^:]+|\[[^\]]+\])::(\d+)::SOCKET$/i;
const VISA_ASRL = /^ASRL(.+)::INSTR$/i;

export function parseAddress(text: string): InstrumentAddress {
  const address = text.trim();
  if (address === '')
    throw new AddressError('address', 'is empty; expected tcp://HOST:PORT, serial:PATH?baud=N, sim or a VISA resource');
  const lower = address.toLowerCase();
  if (lower === 'sim' || lower.startsWith('sim:')) return parseSim(address.slice(4));
  if (lower.startsWith('tcp://')) return parseTcp(address.slice(6));
  if (lower.startsWith('serial:')) return parseSerial(address.slice(7));
  const tcpip = VISA_TCPIP.exec(address);
  if (tcpip !== null) return { kind: 'tcp', host: unbracket(tcpip[2] ?? ''), port: parsePort(tcpip[3] ?? '') };
  if (/^TCPIP\d*::/i.test(address)) {
    throw new AddressError(
      'resource',
      `"${address}" is not a raw-socket resource; expected TCPIP[n]::HOST::PORT::SOCKET`,
    );
  }
  const asrl = VISA_ASRL.exec(address);
  if (asrl !== null) {
    const path = asrl[1] ?? '';
    if (/^\d+$/.test(path))
      throw new AddressError(
        'resource',
        `numbered serial board ASRL${path} is not mapped; give the device path, e.g. ASRL/dev/ttyUSB0::INSTR`,
      );
    return { kind: 'serial', path, ...SERIAL_DEFAULTS };
  }
  throw new AddressError(
    'address',
    `"${address}" has no known form; expected tcp://HOST:PORT, serial:PATH?baud=N, sim, TCPIP::HOST::PORT::SOCKET or ASRL<PATH>::INSTR`,
  );
}

/** The canonical string for a descriptor (what run.json records). */
export function formatAddress(address: InstrumentAddress): string {
  switch (address.kind) {
    case 'tcp':
      return `tcp://${address.host.includes(':') ? `[${address.host}]` : address.host}:${address.port}`;
    case 'sim':
      return address.role === undefined ? 'sim' : `sim:${address.role}`;
    case 'serial':
      return `serial:${address.path}?baud=${address.baudRate}&databits=${address.dataBits}&parity=${address.parity}&stopbits=${address.stopBits}&flow=${address.flow}`;
  }
}

function parseSim(rest: string): SimAddress {
  if (rest === '') return { kind: 'sim' };
  const role = ROLES.find((r) => r === rest.toLowerCase());
  if (role === undefined) throw new AddressError('sim role', `"${rest}" is not one of ${ROLES.join(', ')}`);
  return { kind: 'sim', role };
}

function parseTcp(rest: string): TcpAddress {
  const match = /^(\[[^\]]+\]|[^:/[\]]+)(?::(\d*))?\/?$/.exec(rest);
  if (match === null)
    throw new AddressError('host', `"${rest}" is not HOST or HOST:PORT (IPv6 in brackets: [::1]:5025)`);
  const host = unbracket(match[1] ?? '');
  const port = match[2] === undefined ? DEFAULT_SCPI_PORT : parsePort(match[2]);
  return { kind: 'tcp', host, port };
}

function parsePort(text: string): number {
  const port = Number(text);
  if (text === '' || !Number.isInteger(port) || port < 1 || port > 65535) {
    throw new AddressError('port', `"${text}" is not a port number 1-65535`);
  }
  return port;
}

function unbracket(host: string): string {
  return host.startsWith('[') && host.endsWith(']') ? host.slice(1, -1) : host;
}

function parseSerial(rest: string): SerialAddress {
  const q = rest.indexOf('?');
  const path = q === -1 ? rest : rest.slice(0, q);
  if (path === '') throw new AddressError('path', 'is empty; expected serial:/dev/ttyUSB0 or serial:COM3');
  const result: SerialAddress = { kind: 'serial', path, ...SERIAL_DEFAULTS };
  if (q === -1) return result;
  for (const pair of rest.slice(q + 1).split('&')) {
    if (pair === '') continue;
    const eq = pair.indexOf('=');
    const key = (eq === -1 ? pair : pair.slice(0, eq)).toLowerCase();
    const value = eq === -1 ? '' : decodeURIComponent(pair.slice(eq + 1)).toLowerCase();
    switch (key) {
      case 'baud': {
        const baud = Number(value);
        if (!/^\d+$/.test(value) || baud < 50 || baud > 4_000_000)
          throw new AddressError('baud', `"${value}" is not a baud rate 50-4000000`);
        result.baudRate = baud;
        break;
      }
      case 'parity':
        result.parity = oneOf('parity', value, ['none', 'even', 'odd'] as const);
        break;
      case 'stopbits':
        result.stopBits = Number(oneOf('stopbits', value, ['1', '2'] as const)) as 1 | 2;
        break;
      case 'databits':
        result.dataBits = Number(oneOf('databits', value, ['7', '8'] as const)) as 7 | 8;
        break;
      case 'flow':
        result.flow = oneOf('flow', value, ['none', 'rtscts', 'xon'] as const);
        break;
      default:
        throw new AddressError(
          key === '' ? 'option' : key,
          'is not a serial option; expected baud, parity, stopbits, databits or flow',
        );
    }
  }
  return result;
}

function oneOf<T extends string>(field: string, value: string, allowed: readonly T[]): T {
  const found = allowed.find((a) => a === value);
  if (found === undefined) throw new AddressError(field, `"${value}" is not one of ${allowed.join(', ')}`);
  return found;
}
