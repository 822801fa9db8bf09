/**
 * Builds the Transport an address asks for. The simulated bench lives in
 * main/sim/ and is passed in, so this layer does not depend on it.
 */
import type { Clock } from '../time/clock.ts';
import { parseAddress, type InstrumentAddress, type SerialAddress } from './address.ts';
import { AddressError } from './errors.ts';
import type { RoleName } from './roles.ts';
import { SerialTransport } from './serial-transport.ts';
import { TcpTransport } from './tcp-transport.ts';
import type { Transport } from './transport.ts';

export interface CreateTransportOptions {
  /** Supplies the in-process simulated instrument for `sim` addresses. */
  sim?: (role: RoleName) => Transport;
  /**
   * Builds the transport for serial addresses where device paths cannot be
   * opened (a page: WebSerialTransport); default SerialTransport.
   */
  serial?: (address: SerialAddress, role: RoleName | undefined) => Transport;
  /** Role to simulate when the address is a bare `sim`. */
  role?: RoleName;
  /** TCP connect timeout, s; default 5. */
  connectTimeoutS?: number;
  clock?: Pick<Clock, 'setTimer'>;
}

export function createTransport(address: InstrumentAddress | string, options: CreateTransportOptions = {}): Transport {
  const descriptor = typeof address === 'string' ? parseAddress(address) : address;
  switch (descriptor.kind) {
    case 'tcp':
      return new TcpTransport({
        host: descriptor.host,
        port: descriptor.port,
        connectTimeoutS: options.connectTimeoutS,
        clock: options.clock,
      });
    case 'serial':
      if (options.serial !== undefined) return options.serial(descriptor, options.role);
      return new SerialTransport({ ...descriptor, clock: options.clock });
    case 'sim': {
      const role = descriptor.role ?? options.role;
      if (role === undefined)
        throw new AddressError(
          'sim role',
          'bare "sim" needs the role it stands for; write sim:supply, sim:counter or sim:thermometer',
        );
      if (options.sim === undefined) throw new AddressError('sim', 'no simulated bench is available here');
      return options.sim(role);
    }
  }
}
