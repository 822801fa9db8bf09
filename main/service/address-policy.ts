/**
 * What a bench reached through the API (browser mode, the desktop window) may
 * be: the user's own instruments — loopback, the private LAN, a serial device
 * — or the simulated bench. A page must not turn `connect` into a probe of
 * other hosts' services, nor name a profile by path and have a file read.
 * Anything else needs the explicit setting (`tunebench serve --allow-address`
 * or TUNEBENCH_ALLOW_ADDRESS). Bench files given on the command line are not
 * checked here: the user typed those paths.
 */
import { lookup } from 'node:dns/promises';
import { isIP } from 'node:net';
import type { BenchConfig } from '../../app/contract/plans.ts';
import { AddressError } from '../instruments/errors.ts';
import { parseAddress, type InstrumentAddress } from '../instruments/address.ts';
import { BenchApiError } from './errors.ts';

/** A profile chosen over the API: a name from the profile folders, never a path. */
export const PROFILE_NAME = /^[A-Za-z0-9][A-Za-z0-9_-]{0,63}$/;

export interface AddressPolicy {
  /** Hosts (names or IP addresses, lower case) allowed beyond loopback and private LANs; "*" allows any. */
  extraHosts: ReadonlySet<string>;
  /** Resolves a host name to its addresses (injected in tests). */
  resolve?: (host: string) => Promise<string[]>;
}

/** The setting as written: "HOST[,HOST…]" or "*"; empty means none. */
export function parseAllowedHosts(text: string | undefined): Set<string> {
  return new Set(
    (text ?? '')
      .split(',')
      .map((host) =>
        host
          .trim()
          .toLowerCase()
          .replace(/^\[|\]$/g, ''),
      )
      .filter((host) => host !== ''),
  );
}

function ipv4Parts(ip: string): number[] {
  return ip.split('.').map(Number);
}

/** Loopback, private (RFC 1918, RFC 4193), link-local (RFC 3927, RFC 4291) — a bench's own network. */
export function isBenchIp(ip: string): boolean {
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(ip);
  if (mapped) return isBenchIp(mapped[1] as string);
  if (isIP(ip) === 4) {
    const [a = -1, b = -1] = ipv4Parts(ip);
    return (
      a === 127 || a === 10 || (a === 172 && b >= 16 && b <= 31) || (a === 192 && b === 168) || (a === 169 && b === 254)
    );
  }
  if (isIP(ip) === 6) {
    const lower = ip.toLowerCase();
    return lower === '::1' || /^f[cd][0-9a-f]{2}:/.test(lower) || /^fe[89ab][0-9a-f]:/.test(lower);
  }
  return false;
}

/** Device paths a serial instrument can have: /dev/tty*, /dev/cu.*, /dev/serial/…, /dev/pts/N, COMn. */
export function isSerialDevicePath(path: string): boolean {
  if (path.includes('..')) return false;
  return (
    /^\/dev\/(tty[A-Za-z0-9._-]*|cu\.[A-Za-z0-9._-]+|pts\/\d+|serial\/by-(id|path)\/[A-Za-z0-9:._+-]+|rfcomm\d+)$/.test(
      path,
    ) || /^(\\\\\.\\)?COM\d{1,3}$/i.test(path)
  );
}

async function defaultResolve(host: string): Promise<string[]> {
  return (await lookup(host, { all: true })).map((entry) => entry.address);
}

const HOW_TO_ALLOW =
  'an instrument elsewhere needs `tunebench serve --allow-address HOST` (or TUNEBENCH_ALLOW_ADDRESS=HOST)';

async function checkOne(role: string, text: string, profile: string | undefined, policy: AddressPolicy): Promise<void> {
  if (profile !== undefined && !PROFILE_NAME.test(profile)) {
    throw new BenchApiError(
      `connect: config.${role}.profile: choose a profile by its name (letters, digits, "-", "_"); paths to profile files are taken only from a bench file on the command line`,
      `config.${role}.profile`,
    );
  }
  let address: InstrumentAddress;
  try {
    address = parseAddress(text);
  } catch (error) {
    throw new BenchApiError(
      `connect: config.${role}.address: ${error instanceof AddressError ? error.message : 'not an instrument address'}`,
      `config.${role}.address`,
    );
  }
  if (address.kind === 'sim' || policy.extraHosts.has('*')) return;
  if (address.kind === 'serial') {
    if (isSerialDevicePath(address.path)) return;
    throw new BenchApiError(
      `connect: config.${role}.address: ${address.path} is not a serial device path (expected /dev/tty…, /dev/cu.…, /dev/serial/by-id/… or COMn)`,
      `config.${role}.address`,
    );
  }
  const host = address.host.toLowerCase();
  if (policy.extraHosts.has(host)) return;
  const refuse = (why: string): never => {
    throw new BenchApiError(
      `connect: config.${role}.address: ${host} ${why}; a bench is on loopback or a private LAN (10.x, 172.16–31.x, 192.168.x, link-local); ${HOW_TO_ALLOW}`,
      `config.${role}.address`,
    );
  };
  if (isIP(host) !== 0) {
    if (!isBenchIp(host)) refuse('is not a loopback or private-LAN address');
    return;
  }
  if (host === 'localhost') return;
  let addresses: string[];
  try {
    addresses = await (policy.resolve ?? defaultResolve)(host);
  } catch {
    return refuse('could not be resolved');
  }
  if (addresses.length === 0 || !addresses.every(isBenchIp)) refuse('resolves beyond loopback and private LANs');
}

/** Refuses, naming the field, any role whose address or profile a bench reached over the API may not have. */
export async function checkApiBench(config: BenchConfig | 'sim', policy: AddressPolicy): Promise<void> {
  if (config === 'sim') return;
  for (const [role, entry] of [
    ['supply', config.supply],
    ['counter', config.counter],
    ['thermometer', config.thermometer],
  ] as const) {
    if (entry) await checkOne(role, entry.address, entry.profile, policy);
  }
}
