/**
 * The service's ports filled with the real modules: the run store (D1's
 * main/store), the procedures (main/procedures), bench assembly
 * (main/bench) and the simulated bench (main/sim).
 */
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { listProfiles, loadProfile } from '../instruments/profile-loader.ts';
import { listSerialPorts } from '../instruments/serial-transport.ts';
import { addNote, deleteRun, listRuns, openRun, renameDut, restoreRun } from '../store/run-store.ts';
import type { Clock } from '../time/clock.ts';
import { RealClock } from '../time/real-clock.ts';
import { createBenchService, type BenchService, type BenchServiceOptions } from './bench-service.ts';
import { importCsvOffThread, openImportStream } from './import-off-thread.ts';
import { analyzeOffThread } from './drift-analysis-off-thread.ts';
import { openBench } from './open-bench.ts';
import type { RunStorePort, ServicePorts } from './ports.ts';
import { driftPort, pushingPort, sweepPort } from './procedure-ports.ts';
import { createCampaignMethods } from './campaign-methods.ts';

export { driftPort, pushingPort, sweepPort };

export function storePort(runsDir: string): RunStorePort {
  return {
    list: () => listRuns(runsDir),
    open: (id) => openRun(runsDir, id),
    rename: (id, dutId) => renameDut(runsDir, id, dutId),
    addNote: async (id, text) => {
      await addNote(runsDir, id, text);
    },
    delete: (id) => deleteRun(runsDir, id),
    restore: (id) => restoreRun(runsDir, id),
    // Parsed in a worker thread: the main thread stays free to serve Stop (issue: a 10 MB import held calls 5.5 s).
    importCsv: (fileName, csvText, dutId): Promise<RunMeta> =>
      importCsvOffThread({ runsDir, fileName, csvText, dutId }),
    openImport: (fileName, dutId) => openImportStream({ runsDir, fileName, dutId }),
  };
}

/** Shipped and user profiles with the role each one drives; unreadable ones are left out. */
export async function profilesWithRoles(): Promise<{ name: string; role: string }[]> {
  const found: { name: string; role: string }[] = [];
  for (const { name } of await listProfiles()) {
    try {
      found.push({ name, role: (await loadProfile(name)).role });
    } catch {
      // A broken user profile is reported when it is used, not in the picker.
    }
  }
  return found;
}

export interface DefaultServiceOptions extends Partial<Omit<BenchServiceOptions, 'runsDir'>> {
  runsDir: string;
  /** Clock of the simulated bench; the real clock when omitted. Tests pass a faster one. */
  simClock?: () => Clock;
}

export function defaultPorts(options: DefaultServiceOptions): ServicePorts {
  const realClock = new RealClock();
  return {
    runsDir: options.runsDir,
    openBench: (config) => openBench(config, { clock: realClock, simClock: options.simClock ?? (() => realClock) }),
    listSerialPorts: async () =>
      (await listSerialPorts()).ports.map((port) => ({ path: port.path, manufacturer: port.manufacturer ?? null })),
    listProfiles: profilesWithRoles,
    store: storePort(options.runsDir),
    procedures: { sweep: sweepPort, drift: driftPort, pushing: pushingPort },
    campaigns: createCampaignMethods,
  };
}

export function createDefaultBenchService(options: DefaultServiceOptions): BenchService {
  return createBenchService({ ...defaultPorts(options), analyzeDrift: analyzeOffThread, ...options });
}
