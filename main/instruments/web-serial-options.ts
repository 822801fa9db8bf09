/**
 * The one place a bench file's serial settings (the `serial:PATH?baud=…`
 * address, address.ts) become Web Serial open options. What the API cannot
 * do is refused here, naming the address key the user wrote and what would
 * be valid; nothing is quietly dropped or approximated.
 */
import { z } from 'zod';
import { formatAddress, parseAddress, type SerialAddress } from './address.ts';
import { AddressError } from './errors.ts';
import type { WebSerialOpenOptions } from './web-serial-types.ts';

/**
 * Read buffer, bytes. The API's default of 255 fills in about 22 ms at
 * 115200 baud; 4 KiB rides out a page busy drawing a plot (tunebench's own
 * choice; the API allows up to 16 MiB).
 */
export const WEB_SERIAL_BUFFER_BYTES = 4096;

/** What Web Serial can open, in the address descriptor's terms. */
const webSerialLineSchema = z.object({
  baudRate: z.number().int().positive(),
  dataBits: z.union([z.literal(7), z.literal(8)]),
  parity: z.enum(['none', 'even', 'odd']),
  stopBits: z.union([z.literal(1), z.literal(2)]),
  flow: z.enum(['none', 'rtscts']),
});

type LineKey = keyof z.infer<typeof webSerialLineSchema>;

/** Descriptor field → the key the user writes in the address, and what would be valid. */
const FIELD_HELP: Record<LineKey, { key: string; valid: string }> = {
  baudRate: { key: 'baud', valid: 'a positive whole number of baud, e.g. baud=115200' },
  dataBits: { key: 'databits', valid: 'databits=7 or databits=8' },
  parity: { key: 'parity', valid: 'parity=none, parity=even or parity=odd' },
  stopBits: { key: 'stopbits', valid: 'stopbits=1 or stopbits=2' },
  flow: {
    key: 'flow',
    valid:
      'flow=none or flow=rtscts (hardware); Web Serial has no software XON/XOFF flow control, so flow=xon cannot be honoured',
  },
};

export interface WebSerialRefusalContext {
  /** The bench role the address is for, named in the refusal. */
  role?: string | undefined;
}

/** A serial address (string or parsed) as Web Serial open options; throws AddressError naming the key. */
export function webSerialOpenOptions(
  address: SerialAddress | string,
  context: WebSerialRefusalContext = {},
): WebSerialOpenOptions {
  const serial = serialDescriptor(address, context);
  const checked = webSerialLineSchema.safeParse(serial);
  if (!checked.success) {
    const issue = checked.error.issues[0];
    const field = (issue?.path[0] ?? 'flow') as LineKey;
    const help = FIELD_HELP[field] ?? FIELD_HELP.flow;
    const written = JSON.stringify(serial[field]);
    throw new AddressError(
      help.key,
      `${written} is not possible over Web Serial${where(context, formatAddress(serial))}; expected ${help.valid}`,
    );
  }
  const line = checked.data;
  return {
    baudRate: line.baudRate,
    dataBits: line.dataBits,
    parity: line.parity,
    stopBits: line.stopBits,
    flowControl: line.flow === 'rtscts' ? 'hardware' : 'none',
    bufferSize: WEB_SERIAL_BUFFER_BYTES,
  };
}

function serialDescriptor(address: SerialAddress | string, context: WebSerialRefusalContext): SerialAddress {
  if (typeof address !== 'string') return address;
  const parsed = parseAddress(address);
  if (parsed.kind !== 'serial')
    throw new AddressError(
      'address',
      `"${formatAddress(parsed)}" is not a serial address${where(context, null)}; Web Serial opens serial:PATH?baud=N addresses only`,
    );
  return parsed;
}

function where(context: WebSerialRefusalContext, address: string | null): string {
  const role = context.role === undefined ? '' : ` for the ${context.role}`;
  return `${role}${address === null ? '' : ` at ${address}`}`;
}
