/**
 * Stand-in for main/service/address-policy.ts in the page (see
 * ../page-modules.ts): what a page may connect to is the simulated bench and
 * the serial ports the user granted in the browser; a network address or a
 * device path is refused, naming the field and what would be valid.
 */
import type { BenchConfig } from '../../contract/plans.ts';
import { parseAddress } from '../../../main/instruments/address.ts';
import type * as Original from '../../../main/service/address-policy.ts';
import { BenchApiError } from '../../../main/service/errors.ts';

export type AddressPolicy = Original.AddressPolicy;

export const checkApiBench: typeof Original.checkApiBench = async (config: BenchConfig | 'sim') => {
  if (config === 'sim') return;
  for (const [role, entry] of [
    ['supply', config.supply],
    ['counter', config.counter],
    ['thermometer', config.thermometer],
    ['chamber', config.chamber],
  ] as const) {
    if (!entry) continue;
    let ok = false;
    try {
      const address = parseAddress(entry.address);
      ok =
        address.kind === 'sim' ||
        (address.kind === 'serial' && /^(usb-[0-9a-f]{4}-[0-9a-f]{4}|web-serial)$/i.test(address.path));
    } catch {
      ok = false;
    }
    if (!ok)
      throw new BenchApiError(
        `connect: config.${role}.address: the web edition reaches "sim" or a port granted in this browser (serial:usb-VVVV-PPPP?baud=N)`,
        `config.${role}.address`,
      );
  }
};
