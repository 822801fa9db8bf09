/**
 * Opens a bench for the service through the one bench assembly
 * (main/bench/assemble.ts, assembleBench): each role's driver from its
 * bench-file entry, any `sim` address played by one in-process simulated
 * bench. This adds what the service needs on top: the clock (a wholly
 * simulated bench runs on the sim clock, which may run faster than real
 * time; a mixed one keeps real time) and the connection state shown in the
 * app.
 */
import type { ConnectionState, RoleConnection } from '../../app/contract/bench-api.ts';
import type { BenchConfig } from '../../app/contract/plans.ts';
import { assembleBench, SIM_CAMPAIGN_BENCH_CONFIG } from '../bench/assemble.ts';
import { parseAddress } from '../instruments/address.ts';
import type { Clock } from '../time/clock.ts';
import type { OpenedBench } from './ports.ts';

export interface OpenBenchOptions {
  /** Clock for real instruments. */
  clock: Clock;
  /** Clock of the simulated bench (may run faster than real time). */
  simClock: () => Clock;
}

function isSim(address: string): boolean {
  return parseAddress(address).kind === 'sim';
}

export async function openBench(config: BenchConfig | 'sim', options: OpenBenchOptions): Promise<OpenedBench> {
  // The simulated bench comes with its chamber: it sits idle (the DUT in lab air) until a campaign runs it.
  const bench = config === 'sim' ? SIM_CAMPAIGN_BENCH_CONFIG : config;
  const entries = [bench.supply, bench.counter, bench.thermometer, bench.chamber].filter(
    (entry) => entry !== undefined,
  );
  const allSim = entries.every((entry) => isSim(entry.address));
  const clock = allSim ? options.simClock() : options.clock;
  const assembled = await assembleBench(bench, { clock, sim: { dut: 'relaxation' } });
  // The connection lists the three roles every screen knows; the chamber is the campaign screen's.
  const roles: RoleConnection[] = assembled.instruments
    .filter((instrument) => instrument.role !== 'chamber')
    .map((instrument) => ({
      role: instrument.role as RoleConnection['role'],
      address: instrument.address,
      idn: instrument.idn,
      simulated: isSim(instrument.address),
    }));
  const connection: ConnectionState = { connected: true, simulated: assembled.simulated, roles, error: null };
  return {
    // With the reconnect and error-queue hooks the CLI's procedures have: a safe state whose readback finds
    // the supply's link wedged reopens it once and writes again (found by probing `serve` with a supply
    // wedged on its first connection: without the hook the safe state stayed unconfirmed).
    roles: {
      supply: assembled.supply,
      counter: assembled.counter,
      thermometer: assembled.thermometer,
      controlChannel: assembled.controlChannel,
      dutSupplyChannel: assembled.dutSupplyChannel,
      reconnect: assembled.reconnect,
      drainErrors: assembled.drainErrors,
    },
    chamber: assembled.chamber,
    connection,
    clock,
    close: () => assembled.close(),
  };
}
