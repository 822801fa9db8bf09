/**
 * The stores of one app instance and the wiring from BenchApi events into
 * them. Plain functions: tests call them with a fake bench and no React.
 */
import type { BenchApi, BenchEvent } from '../contract/bench-api.ts';
import { createConnectionStore, type ConnectionStore } from './connection-store.ts';
import { columnSetFromStored, rowCount } from './columns.ts';
import { createLiveRunStore, type LiveRunStore } from './live-run-store.ts';
import { createRunsStore, type RunsStore } from './runs-store.ts';
import { createSettingsStore, type KeyValue, type SettingsStore } from './settings-store.ts';
import { createStore, type StoreApi } from 'zustand/vanilla';

export interface NoticeState {
  /** Latest error pushed by main, shown until dismissed. */
  message: string | null;
  dismiss: () => void;
}

export interface AppStores {
  connection: ConnectionStore;
  liveRun: LiveRunStore;
  runs: RunsStore;
  settings: SettingsStore;
  notice: StoreApi<NoticeState>;
}

export function createAppStores(bench: BenchApi, storage: KeyValue | null = null): AppStores {
  return {
    connection: createConnectionStore(bench),
    liveRun: createLiveRunStore(),
    runs: createRunsStore(bench),
    settings: createSettingsStore(storage),
    notice: createStore<NoticeState>()((set) => ({ message: null, dismiss: () => set({ message: null }) })),
  };
}

export function routeEvent(stores: AppStores, event: BenchEvent): void {
  switch (event.type) {
    case 'connection':
      stores.connection.getState().setConnection(event.state);
      break;
    case 'live':
      stores.connection.getState().setReadout(event.readout);
      break;
    case 'run-started':
      stores.liveRun.getState().started(event.meta);
      stores.runs.getState().upsert(event.meta);
      break;
    case 'samples':
      stores.liveRun.getState().samples(event.runId, event.rows);
      break;
    case 'progress':
      stores.liveRun.getState().progressed(event.progress);
      break;
    case 'run-ended':
      stores.liveRun.getState().ended(event.meta);
      stores.runs.getState().upsert(event.meta);
      break;
    case 'run-event':
      stores.liveRun.getState().runEvent(event.runId, event.event);
      break;
    case 'bench-status':
      stores.connection.getState().setStatus(event.status);
      break;
    case 'error':
      stores.notice.setState({ message: event.message });
      break;
    case 'peers':
      stores.connection.getState().setPeers(event.others);
      break;
  }
}

/** Subscribes the stores to the bench's events; returns the unsubscribe. */
export function connectStores(bench: BenchApi, stores: AppStores): () => void {
  return bench.subscribe((event) => routeEvent(stores, event));
}

/**
 * After a reload: a run main is still recording becomes this window's live
 * run again (its stored readings so far, then the pushed batches), so the
 * status strip, progress and plots carry on where they were.
 */
export async function restoreRunContext(bench: BenchApi, stores: AppStores): Promise<void> {
  if (stores.liveRun.getState().meta) return;
  const [status, runs] = await Promise.all([bench.getBenchStatus(), bench.listRuns()]);
  if (status.source !== 'run') return;
  const running = runs
    .filter((run) => run.status === 'running')
    .sort((a, b) => b.startedAt.localeCompare(a.startedAt))[0];
  if (!running) return;
  const detail = await bench.openRun(running.id);
  if (stores.liveRun.getState().meta) return;
  const columns = columnSetFromStored(detail.samples.numeric, detail.samples.text);
  stores.liveRun.getState().resumed(detail.meta, columns, rowCount(columns), detail.events);
}
