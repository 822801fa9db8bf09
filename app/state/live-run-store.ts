/**
 * The run in progress (or the last one): metadata, progress and the readings
 * as growable columns held by reference. Each batch bumps `version`; plots
 * watch `version` and draw from the columns, components select scalars.
 */
import { createStore, type StoreApi } from 'zustand/vanilla';
import type { ProgressInfo, RunEvent, RunMeta } from '../contract/bench-api.ts';
import { appendRows, createColumnSet, rowCount, type ColumnSet } from './columns.ts';

export interface LiveRunState {
  meta: RunMeta | null;
  progress: ProgressInfo | null;
  columns: ColumnSet;
  rows: number;
  version: number;
  events: RunEvent[];
  /** True between run-started and run-ended. */
  active: boolean;
  paused: boolean;
}

export interface LiveRunActions {
  started: (meta: RunMeta) => void;
  /** A run already under way when this window (re)loaded: its stored readings so far, then live batches. */
  resumed: (meta: RunMeta, columns: ColumnSet, rows: number, events: RunEvent[]) => void;
  samples: (runId: string, rows: readonly Record<string, number | string>[]) => void;
  progressed: (progress: ProgressInfo) => void;
  ended: (meta: RunMeta) => void;
  runEvent: (runId: string, event: RunEvent) => void;
  /** Set when a pause/resume call to main succeeded (main's progress may lag). */
  setPaused: (paused: boolean) => void;
}

export type LiveRunStore = StoreApi<LiveRunState & LiveRunActions>;

export function createLiveRunStore(): LiveRunStore {
  return createStore<LiveRunState & LiveRunActions>()((set, get) => ({
    meta: null,
    progress: null,
    columns: createColumnSet(),
    rows: 0,
    version: 0,
    events: [],
    active: false,
    paused: false,
    started(meta) {
      // A fresh column set: the previous run's columns may still be on screen elsewhere.
      set({
        meta,
        progress: null,
        columns: createColumnSet(),
        rows: 0,
        version: get().version + 1,
        events: [],
        active: true,
        paused: false,
      });
    },
    resumed(meta, columns, rows, events) {
      if (get().meta?.id === meta.id && get().active) return;
      const paused = events.reduce(
        (p, e) => (e.type === 'pause' || e.type === 'paused' ? true : e.type === 'resume' ? false : p),
        false,
      );
      set({
        meta,
        progress: null,
        columns,
        rows,
        version: get().version + 1,
        events,
        active: meta.status === 'running',
        paused,
      });
    },
    samples(runId, rows) {
      const { meta, columns } = get();
      if (!meta || meta.id !== runId || rows.length === 0) return;
      appendRows(columns, rows);
      set({ rows: rowCount(columns), version: get().version + 1 });
    },
    progressed(progress) {
      const { meta } = get();
      if (meta && meta.id !== progress.runId) return;
      // Only a 'paused' phase says anything about pausing; other phases may be the last one before it.
      set(progress.phase === 'paused' ? { progress, paused: true } : { progress });
    },
    ended(meta) {
      const current = get().meta;
      if (current && current.id !== meta.id) return;
      set({ meta, active: false, paused: false, version: get().version + 1 });
    },
    setPaused(paused) {
      if (get().active) set({ paused });
    },
    runEvent(runId, event) {
      const { meta, events } = get();
      if (!meta || meta.id !== runId) return;
      // Another window may pause or resume the same run; its events keep this one in step.
      const pausedNow =
        event.type === 'pause' || event.type === 'paused'
          ? { paused: true }
          : event.type === 'resume'
            ? { paused: false }
            : {};
      set({ events: [...events, event], ...pausedNow });
    },
  }));
}
