/**
 * The stores of one app instance and the wiring from BenchApi events into
 * them. Plain functions: tests call them with a fake bench and no React.
 */
import type { BenchApi, BenchEvent } from '../contract/bench-api.ts';
import { createConnectionStore, type ConnectionStore } from './connection-store.ts';
import { createLiveRunStore, type LiveRunStore } from './live-run-store.ts';
import { createRunsStore, type RunsStore } from './runs-store.ts';
import { createSettingsStore, type KeyValue, type SettingsStore } from './settings-store.ts';
import { createStore, type StoreApi } from 'zustand/vanilla';

export interface NoticeState {
  /** Latest error pushed by main, shown until dismissed. */
  message: string | null;
  dismiss(): void;
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
