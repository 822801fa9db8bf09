/**
 * Bench assembly: from a bench file (or "sim") to opened role drivers, their
 * identities for run.json, a reconnect hook for the procedures, and one
 * close(). Any address may be `sim`: those roles are played by one
 * in-process simulated bench on the same clock, so a bench file can mix real
 * and simulated instruments.
 */
import type { BenchConfig } from '../../app/contract/plans.ts';
import { openInstrument, type OpenInstrumentOptions } from '../instruments/open-instrument.ts';
import { RoleConnectError } from '../instruments/errors.ts';
import { defaultProfileName, loadProfile } from '../instruments/profile-loader.ts';
import type { InstrumentProfile, SupplyProfile } from '../instruments/profile-schema.ts';
import { checkBenchChannels } from './bench-checks.ts';
import { probeRoles, type ControlFound } from './role-probe.ts';
import { parseAddress } from '../instruments/address.ts';
import type { Chamber, Counter, RoleName, Supply, Thermometer } from '../instruments/roles.ts';
import type { SessionEvent } from '../instruments/scpi-session.ts';
import { ScpiSession } from '../instruments/scpi-session.ts';
import type { RecordableBench } from '../procedures/recorded-run.ts';
import { createSimBench, type SimBench, type SimBenchOptions } from '../sim/sim-bench.ts';
import type { Clock } from '../time/clock.ts';

export interface AssembledBench extends RecordableBench {
  /** The control channel as found at connect (output state and setpoint), before anything was written. */
  controlFound: ControlFound;
  /** Every role is simulated. */
  simulated: boolean;
  /** The in-process simulated bench behind `sim` addresses, if any (tests read its state). */
  sim: SimBench | null;
  /** The temperature chamber, when the bench file names one. */
  chamber?: Chamber | undefined;
  close(): Promise<void>;
}

export interface AssembleOptions {
  clock: Clock;
  /** DUT, seed, faults… of the in-process simulated bench (for `sim` addresses). */
  sim?: Omit<SimBenchOptions, 'clock'>;
  connectTimeoutS?: number;
  /** Transport for serial addresses where device paths cannot be opened (a page: Web Serial). */
  serial?: OpenInstrumentOptions['serial'];
  /** Reopen policy of each SCPI session after a dropped link. */
  reconnect?: OpenInstrumentOptions['reconnect'];
  userProfileDir?: string;
  onSessionEvent?: (role: RoleName, event: SessionEvent) => void;
}

/** The bench file equivalent of "no --bench": every role simulated, thermometer included. */
export const SIM_BENCH_CONFIG: BenchConfig = {
  supply: { address: 'sim', controlChannel: 1, dutSupplyChannel: 2 },
  counter: { address: 'sim' },
  thermometer: { address: 'sim' },
};

/** The simulated bench with its chamber, for campaigns without --bench. */
export const SIM_CAMPAIGN_BENCH_CONFIG: BenchConfig = { ...SIM_BENCH_CONFIG, chamber: { address: 'sim' } };

type AnyDriver = Supply | Counter | Thermometer | Chamber;

function isSimAddress(address: string): boolean {
  return parseAddress(address).kind === 'sim';
}

/** The SCPI session under a driver made by openInstrument (its drivers keep it public). */
function sessionOf(driver: AnyDriver): ScpiSession | null {
  const candidate = (driver as { session?: unknown }).session;
  return candidate instanceof ScpiSession ? candidate : null;
}

export async function assembleBench(config: BenchConfig | 'sim', options: AssembleOptions): Promise<AssembledBench> {
  const bench = config === 'sim' ? SIM_BENCH_CONFIG : config;
  checkBenchChannels(bench);
  const entries: [RoleName, { address: string; profile?: string | undefined }][] = [
    ['supply', bench.supply],
    ['counter', bench.counter],
  ];
  if (bench.thermometer) entries.push(['thermometer', bench.thermometer]);
  if (bench.chamber) entries.push(['chamber', bench.chamber]);
  // Every profile is loaded and the bench checked against it before any instrument is touched.
  const profiles = new Map<RoleName, InstrumentProfile>();
  for (const [role, entry] of entries) {
    profiles.set(
      role,
      await loadProfile(entry.profile ?? defaultProfileName(role), { role, userDir: options.userProfileDir }),
    );
  }
  const supplyProfile = profiles.get('supply') as SupplyProfile;
  checkBenchChannels(bench, { channels: supplyProfile.capabilities.channels, profile: supplyProfile.name });
  const anySim = entries.some(([, entry]) => isSimAddress(entry.address));
  const sim = anySim ? createSimBench({ ...options.sim, clock: options.clock }) : null;
  const linkListeners = new Set<(role: RoleName, event: SessionEvent) => void>();
  const opened: { role: RoleName; driver: AnyDriver; address: string }[] = [];
  try {
    for (const [role, entry] of entries) {
      const driver = await openInstrument(
        role,
        { address: entry.address, profile: entry.profile },
        {
          clock: options.clock,
          sim: sim === null ? undefined : (simRole) => sim.transport(simRole),
          serial: options.serial,
          connectTimeoutS: options.connectTimeoutS,
          loadedProfile: profiles.get(role),
          reconnect: options.reconnect,
          userProfileDir: options.userProfileDir,
          onEvent: (event) => {
            options.onSessionEvent?.(role, event);
            for (const listener of linkListeners) listener(role, event);
          },
        },
      );
      opened.push({ role, driver, address: entry.address });
    }
    const instruments: AssembledBench['instruments'] = [];
    for (const { role, driver, address } of opened) {
      const identity = await driver.identify().catch((error: unknown) => {
        throw new RoleConnectError(role, address, sessionOf(driver)?.lastCommand ?? null, error);
      });
      instruments.push({ role, idn: identity.idn, address });
    }
    const byRole = new Map(opened.map((o) => [o.role, o.driver]));
    const supply = byRole.get('supply') as Supply;
    const controlFound = await probeRoles(supply, bench.supply.controlChannel, instruments);
    return {
      supply,
      counter: byRole.get('counter') as Counter,
      thermometer: byRole.get('thermometer') as Thermometer | undefined,
      chamber: byRole.get('chamber') as Chamber | undefined,
      controlChannel: bench.supply.controlChannel,
      dutSupplyChannel: bench.supply.dutSupplyChannel,
      instruments,
      controlFound,
      simulated: entries.every(([, entry]) => isSimAddress(entry.address)),
      sim,
      async reconnect(role) {
        await sessionFor(byRole, role).reconnect();
      },
      drainErrors: (role) => sessionFor(byRole, role).drainErrors(),
      subscribeLinkEvents(listener) {
        linkListeners.add(listener);
        return () => linkListeners.delete(listener);
      },
      async close() {
        await closeAll(opened);
        sim?.close();
      },
    };
  } catch (error) {
    await closeAll(opened);
    sim?.close();
    throw error;
  }
}

function sessionFor(byRole: Map<RoleName, AnyDriver>, role: RoleName): ScpiSession {
  const driver = byRole.get(role);
  const session = driver === undefined ? null : sessionOf(driver);
  if (session === null) throw new Error(`no ${role} with a SCPI session on this bench`);
  return session;
}

async function closeAll(opened: { driver: { close(): Promise<void> } }[]): Promise<void> {
  for (const { driver } of opened) {
    try {
      await driver.close();
    } catch {
      // Closing is best effort: the link may already be gone.
    }
  }
}
