/**
 * Saved runs: the list, which ones are picked (for overlay and datasheet),
 * opened runs as columns, and the last deletion so it can be undone.
 */
import { createStore, type StoreApi } from 'zustand/vanilla';
import type { BenchApi, RunDetail, RunMeta } from '../contract/bench-api.ts';
import { MAX_PREVIEW_COLUMNS, type RunPreview } from '../contract/run-preview.ts';
import { errorText } from '../bridge/bench-call-error.ts';
import { columnSetFromStored, type ColumnSet } from './columns.ts';

export interface OpenedRun {
  /** For a log held in main: meta and events, samples empty. */
  detail: RunDetail;
  columns: ColumnSet;
  rows: number;
  /**
   * Set for a big drift log whose readings stay in main (app/contract/run-window.ts): the page holds
   * only what it draws, asked from main per view, and main's analysis. `columns` is then empty.
   */
  held?: { rowCount: number; preview: RunPreview['preview'] };
}

export interface RunsState {
  runs: RunMeta[];
  /** Picked run ids, in the order picked. */
  picked: string[];
  /** The run shown in detail, if any. */
  focusId: string | null;
  opened: Record<string, OpenedRun>;
  /** Runs being opened whose screen-resolution preview has arrived before their full columns. */
  previews: Record<string, RunPreview>;
  lastDeleted: RunMeta | null;
  loading: boolean;
  error: string | null;
}

export interface RunsActions {
  refresh: () => Promise<void>;
  open: (id: string) => Promise<OpenedRun | null>;
  focus: (id: string | null) => Promise<void>;
  togglePick: (id: string) => void;
  setPicked: (ids: string[]) => void;
  rename: (id: string, dutId: string) => Promise<void>;
  addNote: (id: string, text: string) => Promise<void>;
  remove: (id: string) => Promise<void>;
  undoRemove: () => Promise<void>;
  importCsv: (fileName: string, csvText: string, dutId: string) => Promise<RunMeta | null>;
  upsert: (meta: RunMeta) => void;
}

export type RunsStore = StoreApi<RunsState & RunsActions>;

function newestFirst(a: RunMeta, b: RunMeta): number {
  return b.startedAt.localeCompare(a.startedAt);
}

export interface RunsStoreOptions {
  /** Pixel columns to ask a preview for (the plot's width in device pixels). Default 2000. */
  previewColumns?: () => number;
  /** Resolves once the page has painted what was just set (the preview), before the full columns are asked for. */
  afterPaint?: () => Promise<void>;
}

function without<T>(record: Record<string, T>, id: string): Record<string, T> {
  const rest = { ...record };
  delete rest[id];
  return rest;
}

/** The window's width in device pixels (no plot is wider), else 2000. */
function screenColumns(): number {
  if (typeof window === 'undefined') return 2000;
  const px = Math.round(window.innerWidth * (window.devicePixelRatio || 1));
  return Math.min(MAX_PREVIEW_COLUMNS, Math.max(200, px));
}

/** In a page: after the next frame has been painted; elsewhere at once. */
function nextPaint(): Promise<void> {
  if (typeof requestAnimationFrame !== 'function') return Promise.resolve();
  return new Promise((resolve) => requestAnimationFrame(() => setTimeout(resolve, 0)));
}

/** A finished drift log with a preview stays in main when the carrier can show it from there. */
function holdsInMain(bench: BenchApi, shown: RunPreview): boolean {
  return (
    shown.meta.kind === 'drift' &&
    shown.meta.status !== 'running' &&
    bench.windowRun !== undefined &&
    bench.analyzeRun !== undefined &&
    bench.runCsvPart !== undefined
  );
}

export function createRunsStore(bench: BenchApi, options: RunsStoreOptions = {}): RunsStore {
  const previewColumns = options.previewColumns ?? screenColumns;
  const afterPaint = options.afterPaint ?? nextPaint;
  return createStore<RunsState & RunsActions>()((set, get) => {
    async function guarded<T>(work: () => Promise<T>): Promise<T | null> {
      set({ loading: true, error: null });
      try {
        const result = await work();
        set({ loading: false });
        return result;
      } catch (error) {
        set({ loading: false, error: errorText(error) });
        return null;
      }
    }
    function forget(id: string): Pick<RunsState, 'opened' | 'previews' | 'picked' | 'focusId'> {
      return {
        opened: without(get().opened, id),
        previews: without(get().previews, id),
        picked: get().picked.filter((p) => p !== id),
        focusId: get().focusId === id ? null : get().focusId,
      };
    }
    return {
      runs: [],
      picked: [],
      focusId: null,
      opened: {},
      previews: {},
      lastDeleted: null,
      loading: false,
      error: null,
      async refresh() {
        await guarded(async () => set({ runs: [...(await bench.listRuns())].sort(newestFirst) }));
      },
      async open(id) {
        const cached = get().opened[id];
        // A run still being written is re-read each time; finished runs are cached.
        if (cached && cached.detail.meta.status !== 'running') return cached;
        return guarded(async () => {
          // A big run is drawn first from its preview (a few thousand numbers), then from every reading.
          if (bench.previewRun) {
            const first = await bench.previewRun(id, previewColumns()).catch(() => null);
            if (first?.preview) {
              performance.mark('tunebench:open-run:preview');
              set({ previews: { ...get().previews, [id]: first } });
              await afterPaint();
              if (holdsInMain(bench, first)) {
                const held: OpenedRun = {
                  detail: {
                    meta: first.meta,
                    events: first.events,
                    samples: { names: [], numeric: {}, text: {}, rowCount: 0 },
                  },
                  columns: columnSetFromStored({}, {}),
                  rows: 0,
                  held: { rowCount: first.rowCount, preview: first.preview },
                };
                set({ opened: { ...get().opened, [id]: held }, previews: without(get().previews, id) });
                return held;
              }
            }
          }
          const detail = await bench.openRun(id).catch((error: unknown) => {
            set({ previews: without(get().previews, id) });
            throw error;
          });
          performance.mark('tunebench:open-run:fetched');
          const columns = columnSetFromStored(detail.samples.numeric, detail.samples.text);
          performance.mark('tunebench:open-run:columns');
          const opened: OpenedRun = { detail, columns, rows: columns.time_s.length };
          // The full columns replace the preview in one step: the plot never shows neither.
          set({ opened: { ...get().opened, [id]: opened }, previews: without(get().previews, id) });
          return opened;
        });
      },
      async focus(id) {
        set({ focusId: id });
        if (id !== null) await get().open(id);
      },
      togglePick(id) {
        const { picked } = get();
        set({ picked: picked.includes(id) ? picked.filter((p) => p !== id) : [...picked, id] });
      },
      setPicked(ids) {
        set({ picked: ids });
      },
      async rename(id, dutId) {
        const meta = await guarded(() => bench.renameRun(id, dutId));
        if (meta) get().upsert(meta);
      },
      async addNote(id, text) {
        const done = await guarded(async () => {
          await bench.addNote(id, text);
          return true;
        });
        if (done) {
          // The cached copy lacks the note: re-read it.
          const opened = { ...get().opened };
          delete opened[id];
          set({ opened });
          if (get().focusId === id) void get().open(id);
          const meta = get().runs.find((r) => r.id === id);
          const notes = meta ? (meta.dut.notes ? `${meta.dut.notes}\n${text}` : text) : text;
          if (meta) get().upsert({ ...meta, dut: { ...meta.dut, notes } });
        }
      },
      async remove(id) {
        const meta = get().runs.find((r) => r.id === id) ?? null;
        const done = await guarded(async () => {
          await bench.deleteRun(id);
          return true;
        });
        if (done) set({ ...forget(id), runs: get().runs.filter((r) => r.id !== id), lastDeleted: meta });
      },
      async undoRemove() {
        const deleted = get().lastDeleted;
        if (!deleted) return;
        const meta = await guarded(() => bench.restoreRun(deleted.id));
        if (meta) {
          set({ lastDeleted: null });
          get().upsert(meta);
        }
      },
      async importCsv(fileName, csvText, dutId) {
        const meta = await guarded(() => bench.importCsv(fileName, csvText, dutId));
        if (meta) get().upsert(meta);
        return meta;
      },
      upsert(meta) {
        const others = get().runs.filter((r) => r.id !== meta.id);
        set({ runs: [meta, ...others].sort(newestFirst) });
      },
    };
  });
}
