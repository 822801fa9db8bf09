/**
 * Opens a bench for the service: each role's driver from its bench-file
 * entry (A's openInstrument), with any `sim` address served by one
 * in-process simulated bench (B's createSimBench) on its own clock. Reads
 * each instrument's identity for the connection state.
 */
import type { ConnectionState, RoleConnection } from '../../app/contract/bench-api.ts';
import type { BenchConfig } from '../../app/contract/plans.ts';
import { openInstrument } from '../instruments/open-instrument.ts';
import type { Counter, RoleName, Supply, Thermometer } from '../instruments/roles.ts';
import { createSimBench, SUPPLY_CONTROL_CHANNEL, SUPPLY_DUT_CHANNEL, type SimBench } from '../sim/sim-bench.ts';
import type { Clock } from '../time/clock.ts';
import type { OpenedBench } from './ports.ts';

export interface OpenBenchOptions {
  /** Clock for real instruments. */
  clock: Clock;
  /** Clock of the simulated bench (may run faster than real time). */
  simClock: () => Clock;
}

const SIM_CONFIG: BenchConfig = {
  supply: { address: 'sim', controlChannel: SUPPLY_CONTROL_CHANNEL, dutSupplyChannel: SUPPLY_DUT_CHANNEL },
  counter: { address: 'sim' },
  thermometer: { address: 'sim' },
};

function isSim(address: string): boolean {
  return address.trim().toLowerCase() === 'sim';
}

export async function openBench(config: BenchConfig | 'sim', options: OpenBenchOptions): Promise<OpenedBench> {
  const bench = config === 'sim' ? SIM_CONFIG : config;
  const entries = [bench.supply, bench.counter, bench.thermometer].filter((entry) => entry !== undefined);
  const allSim = entries.every((entry) => isSim(entry.address));
  const anySim = entries.some((entry) => isSim(entry.address));
  // A bench that is wholly simulated runs on the sim clock; a mixed one keeps real time.
  const clock = allSim ? options.simClock() : options.clock;
  const sim: SimBench | null = anySim ? createSimBench({ clock, dut: 'relaxation' }) : null;
  const opened: { close(): Promise<void> }[] = [];
  const roles: RoleConnection[] = [];
  const open = async <R extends RoleName>(role: R, entry: { address: string; profile?: string | undefined }) => {
    const driver = await openInstrument(role, { address: entry.address, ...(entry.profile ? { profile: entry.profile } : {}) }, {
      clock,
      ...(sim ? { sim: (r: RoleName) => sim.transport(r) } : {}),
    });
    opened.push(driver);
    const identity = await driver.identify();
    roles.push({ role, address: entry.address, idn: identity.idn, simulated: isSim(entry.address) });
    return driver;
  };
  const closeAll = async (): Promise<void> => {
    for (const driver of opened.splice(0).reverse()) await driver.close().catch(() => undefined);
    sim?.close();
  };
  try {
    const supply: Supply = await open('supply', bench.supply);
    const counter: Counter = await open('counter', bench.counter);
    const thermometer: Thermometer | undefined = bench.thermometer ? await open('thermometer', bench.thermometer) : undefined;
    const connection: ConnectionState = { connected: true, simulated: allSim, roles, error: null };
    return {
      roles: { supply, counter, thermometer, controlChannel: bench.supply.controlChannel, dutSupplyChannel: bench.supply.dutSupplyChannel },
      connection,
      clock,
      close: closeAll,
    };
  } catch (error) {
    await closeAll();
    throw error;
  }
}
