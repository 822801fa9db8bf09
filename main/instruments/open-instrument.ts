/**
 * One call from a bench-file entry to a working role driver: load the
 * profile, build the transport, open the SCPI session with the profile's
 * terminator / timeouts / error checking, send the profile's init commands.
 */
import type { Clock } from '../time/clock.ts';
import { createTransport, type CreateTransportOptions } from './create-transport.ts';
import { RoleConnectError } from './errors.ts';
import { createCounter } from './counter-driver.ts';
import { defaultProfileName, loadProfile } from './profile-loader.ts';
import type { InstrumentProfile } from './profile-schema.ts';
import { createChamber } from './chamber-driver.ts';
import type { Chamber, Counter, RoleName, Supply, Thermometer } from './roles.ts';
import { ScpiSession, type SessionEvent } from './scpi-session.ts';
import { createSupply } from './supply-driver.ts';
import { createThermometer } from './thermometer-driver.ts';
import type { Transport } from './transport.ts';

export interface InstrumentConfig {
  /** Address string: tcp://, serial:, sim, or a VISA resource. */
  address: string;
  /** Profile name or path; default `<role>-scpi`. */
  profile?: string;
}

export interface OpenInstrumentOptions {
  clock: Clock;
  sim?: (role: RoleName) => Transport;
  /** Transport for serial addresses where device paths cannot be opened (a page: Web Serial). */
  serial?: CreateTransportOptions['serial'];
  userProfileDir?: string;
  shippedProfileDir?: string;
  connectTimeoutS?: number;
  /** The profile, already loaded (skips loading `config.profile`). */
  loadedProfile?: InstrumentProfile;
  reconnect?: { attempts: number; delayS: number };
  onEvent?: (event: SessionEvent) => void;
}

type RoleDriver<R extends RoleName> = R extends 'supply'
  ? Supply
  : R extends 'counter'
    ? Counter
    : R extends 'chamber'
      ? Chamber
      : Thermometer;

export async function openInstrument<R extends RoleName>(
  role: R,
  config: InstrumentConfig,
  options: OpenInstrumentOptions,
): Promise<RoleDriver<R>> {
  const profile: InstrumentProfile =
    options.loadedProfile ??
    (await loadProfile(config.profile ?? defaultProfileName(role), {
      role,
      userDir: options.userProfileDir,
      shippedDir: options.shippedProfileDir,
    }));
  const transport = createTransport(config.address, {
    sim: options.sim,
    serial: options.serial,
    role,
    connectTimeoutS: options.connectTimeoutS,
    clock: options.clock,
  });
  const session = new ScpiSession({
    transport,
    clock: options.clock,
    terminator: profile.lineTerminator,
    defaultTimeoutS: profile.timeouts.defaultS,
    checkErrorsAfterWrite: profile.checkErrorsAfterWrite,
    reconnect: options.reconnect,
    onEvent: options.onEvent,
    role,
  });
  try {
    await session.open();
    for (const command of profile.init) await session.write(command, { checkErrors: false });
    // Start with an empty error queue so the first real write reports only its own errors.
    if (profile.checkErrorsAfterWrite) await session.drainErrors();
  } catch (error) {
    await session.close();
    throw new RoleConnectError(role, config.address, session.lastCommand, error);
  }
  return driverFor(session, profile, config.address) as RoleDriver<R>;
}

function driverFor(
  session: ScpiSession,
  profile: InstrumentProfile,
  address: string,
): Supply | Counter | Thermometer | Chamber {
  switch (profile.role) {
    case 'supply':
      return createSupply(session, profile);
    case 'counter':
      return createCounter(session, profile);
    case 'thermometer':
      return createThermometer(session, profile);
    case 'chamber':
      return createChamber(session, profile, address);
  }
}
