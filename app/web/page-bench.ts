/**
 * The web edition's BenchApi, in the page: the desktop's own service
 * (main/service/bench-service.ts: one bench, one run, the live poll, the
 * status strip, bring-up by hand, the safe state on every way out) over the
 * page's adapters: runs in OPFS (./store/), the real-time clock, the
 * simulated bench in the page behind its in-memory transport, and serial
 * ports the user granted in the browser (./page/browser-serial.ts). Adds
 * what only the page has: the browser's port chooser and run folders as zip
 * files in and out.
 */
import type { BenchApi, RunMeta, SerialPortInfo } from '../contract/bench-api.ts';
import { createBenchService, type BenchService } from '../../main/service/bench-service.ts';
import { openBench } from '../../main/service/open-bench.ts';
import { driftPort, pushingPort, sweepPort } from '../../main/service/procedure-ports.ts';
import type { Clock } from '../../main/time/clock.ts';
import { RealClock } from '../../main/time/real-clock.ts';
import { choosePort, grantedPorts, useBrowserSerial, type BrowserSerial } from './page/browser-serial.ts';
import { listProfiles, loadProfile } from './page/profile-loader.ts';
import { usePageStore } from './page/store-index.ts';
import type { PageDir } from './store/page-dir.ts';
import { createPageRunStore, type PageRunStore } from './store/page-run-store.ts';
import { exportRunZip, importRunZip } from './store/run-zip.ts';

export interface PageBenchOptions {
  /** The runs folder (OPFS in the page, memory in tests). */
  root: PageDir;
  /** Clock of the simulated bench; real time when omitted (a demo may run it faster). */
  simClock?: () => Clock;
  /** navigator.serial (its chooser and granted ports), absent where the browser has no Web Serial. */
  serial?: BrowserSerial | undefined;
}

export interface PageBench {
  api: BenchApi;
  service: BenchService;
  store: PageRunStore;
}

export function createPageBench(options: PageBenchOptions): PageBench {
  const store = createPageRunStore(options.root);
  useBrowserSerial(options.serial ?? null);
  usePageStore(options.root, store);
  const realClock = new RealClock();
  const service = createBenchService({
    runsDir: 'opfs:/runs',
    openBench: (config) => openBench(config, { clock: realClock, simClock: options.simClock ?? (() => realClock) }),
    listSerialPorts: () => grantedPorts(),
    listProfiles: async () => {
      const found: { name: string; role: string }[] = [];
      for (const { name } of await listProfiles()) found.push({ name, role: (await loadProfile(name)).role });
      return found;
    },
    store,
    procedures: { sweep: sweepPort, drift: driftPort, pushing: pushingPort },
  });
  const api: BenchApi = {
    listSerialPorts: () => service.listSerialPorts(),
    listProfiles: () => service.listProfiles(),
    connect: (config) => service.connect(config),
    disconnect: () => service.disconnect(),
    getConnection: () => service.getConnection(),
    getBenchStatus: () => service.getBenchStatus(),
    manualControl: (request) => service.manualControl(request),
    startSweep: (plan, dutId) => service.startSweep(plan, dutId),
    startDrift: (plan, dutId) => service.startDrift(plan, dutId),
    startPushing: (plan, dutId) => service.startPushing(plan, dutId),
    pauseRun: () => service.pauseRun(),
    resumeRun: () => service.resumeRun(),
    stopRun: () => service.stopRun(),
    listRuns: () => service.listRuns(),
    previewRun: (id, columns) => service.previewRun(id, columns),
    openRun: (id) => service.openRun(id),
    renameRun: (id, dutId) => service.renameRun(id, dutId),
    addNote: (id, text) => service.addNote(id, text),
    deleteRun: (id) => service.deleteRun(id),
    restoreRun: (id) => service.restoreRun(id),
    importCsv: (fileName, csvText, dutId) => service.importCsv(fileName, csvText, dutId),
    subscribe: (listener) => service.subscribe(listener),
    chooseBrowserSerialPort: (): Promise<SerialPortInfo> => choosePort(),
    async exportRunZip(id: string): Promise<{ fileName: string; bytes: Uint8Array }> {
      return exportRunZip(store, id);
    },
    async importRunZip(fileName: string, bytes: Uint8Array): Promise<RunMeta[]> {
      return importRunZip(options.root, store, fileName, bytes);
    },
  };
  return { api, service, store };
}
