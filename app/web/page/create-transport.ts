/**
 * Stand-in for main/instruments/create-transport.ts in the page (see
 * ../page-modules.ts): a page opens no TCP socket and has no serialport
 * module; it reaches the in-page simulated bench and the serial ports the
 * user granted through the browser, over the Web Serial transport
 * (./browser-serial.ts).
 */
import { parseAddress, type InstrumentAddress } from '../../../main/instruments/address.ts';
import type * as Original from '../../../main/instruments/create-transport.ts';
import { AddressError } from '../../../main/instruments/errors.ts';
import type { Transport } from '../../../main/instruments/transport.ts';
import { browserSerialTransport } from './browser-serial.ts';

export type CreateTransportOptions = Original.CreateTransportOptions;

export const createTransport: typeof Original.createTransport = (
  address: InstrumentAddress | string,
  options: CreateTransportOptions = {},
): Transport => {
  const descriptor = typeof address === 'string' ? parseAddress(address) : address;
  switch (descriptor.kind) {
    case 'tcp':
      throw new AddressError(
        'address',
        `tcp://${descriptor.host}:${descriptor.port}: a web page cannot open TCP sockets; use the desktop app or \`tunebench serve\` for instruments on the network`,
      );
    case 'serial':
      return browserSerialTransport(descriptor, options.role, options.clock);
    case 'sim': {
      const role = descriptor.role ?? options.role;
      if (role === undefined) throw new AddressError('sim role', 'bare "sim" needs the role it stands for');
      if (options.sim === undefined) throw new AddressError('sim', 'no simulated bench is available here');
      return options.sim(role);
    }
  }
};
