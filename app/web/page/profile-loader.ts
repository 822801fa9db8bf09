/**
 * Stand-in for main/instruments/profile-loader.ts in the page (see
 * ../page-modules.ts): the shipped profiles are bundled into the page and
 * parsed by the same rules (profile-parse.ts); a page has no user profile
 * folder, so a name beyond the shipped ones is refused, naming them.
 */
import type * as Original from '../../../main/instruments/profile-loader.ts';
import { ProfileError } from '../../../main/instruments/errors.ts';
import { defaultProfileName, parseProfile } from '../../../main/instruments/profile-parse.ts';
import type { InstrumentProfile } from '../../../main/instruments/profile-schema.ts';
import chamberScpi from '../../../resources/profiles/chamber-scpi.json';
import counterScpi from '../../../resources/profiles/counter-scpi.json';
import supplyScpi from '../../../resources/profiles/supply-scpi.json';
import thermometerScpi from '../../../resources/profiles/thermometer-scpi.json';

export { defaultProfileName, parseProfile };

const SHIPPED: Readonly<Record<string, unknown>> = {
  'chamber-scpi': chamberScpi,
  'counter-scpi': counterScpi,
  'supply-scpi': supplyScpi,
  'thermometer-scpi': thermometerScpi,
};

async function loadShipped(name: string, options: Original.LoadProfileOptions = {}): Promise<InstrumentProfile> {
  const json = SHIPPED[name];
  if (json === undefined)
    throw new ProfileError(name, `not among the profiles of the web edition (${Object.keys(SHIPPED).join(', ')})`);
  const profile = parseProfile(json, name);
  if (options.role !== undefined && profile.role !== options.role)
    throw new ProfileError(
      name,
      `role: is "${profile.role}", but this instrument is configured as the ${options.role}`,
    );
  return profile;
}

export const loadProfile = loadShipped as typeof Original.loadProfile;

export const listProfiles: typeof Original.listProfiles = async () =>
  Object.keys(SHIPPED).map((name) => ({ name, source: 'shipped' as const }));
