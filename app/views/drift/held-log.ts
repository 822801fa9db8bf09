/**
 * A big stored drift log whose readings stay in main (app/contract/run-window.ts):
 * the time plot draws the window main cut for the range on screen, asked
 * again when the range or width changes (a zoom is refined from main, never
 * from a coarser copy), the pixel preview until the first window comes; the
 * analysis and the CSV export come from main as well. The page holds a few
 * thousand numbers of the log at any time.
 */
import { useEffect, useMemo, useState } from 'react';
import { MAX_PREVIEW_COLUMNS, type PixelPreview } from '../../contract/run-preview.ts';
import type { CsvPart, RunAnalysis, RunWindow, RunWindowRequest } from '../../contract/run-window.ts';
import { MAX_CSV_PART_ROWS } from '../../contract/run-window.ts';
import { errorText } from '../../bridge/bench-call-error.ts';
import { previewPlotData, type PreviewPlotData } from './preview-plot.ts';
import type { BenchApi } from '../../contract/bench-api.ts';
import type { OpenedRun } from '../../state/runs-store.ts';

export interface HeldLog {
  rowCount: number;
  /** Drawn until the first window arrives. */
  preview: PixelPreview | null;
  window(request: RunWindowRequest): Promise<RunWindow>;
  analysis(): Promise<RunAnalysis>;
  csvPart(fromRow: number, rows: number): Promise<CsvPart>;
}

export interface HeldWindows {
  /** The time plot's series (time, frequency mean, lowest, highest, temperature mean) for this view. */
  data: (
    view: { xMin: number; xMax: number; widthPx: number } | null,
    widthPx: number,
  ) => { dense: boolean; data: PreviewPlotData };
  /** Called when a window asked for has arrived. */
  watch: (notify: () => void) => () => void;
}

/** The request for a view: the x range (null: the whole log) and the plot's width in whole pixels. */
export function windowRequest(
  view: { xMin: number; xMax: number; widthPx: number } | null,
  widthPx: number,
): RunWindowRequest {
  const px = Math.min(MAX_PREVIEW_COLUMNS, Math.max(1, Math.round(view?.widthPx ?? widthPx)));
  return view ? { xMin: view.xMin, xMax: view.xMax, widthPx: px } : { xMin: null, xMax: null, widthPx: px };
}

export function windowPlotData(window: RunWindow): PreviewPlotData {
  const f = window.series.find((s) => s.name === 'frequency_hz');
  const t = window.series.find((s) => s.name === 'temperature_c');
  const none = (): (number | null)[] => window.x.map(() => null);
  return [window.x, f?.mid ?? none(), f?.lo ?? none(), f?.hi ?? none(), t?.mid ?? none()];
}

export function heldWindows(held: HeldLog | null): HeldWindows {
  const listeners = new Set<() => void>();
  let shown: { key: string; window: RunWindow } | null = null;
  let pending: string | null = null;
  return {
    watch(notify) {
      listeners.add(notify);
      return () => listeners.delete(notify);
    },
    data(view, widthPx) {
      const request = windowRequest(view, widthPx);
      const key = JSON.stringify(request);
      if (held && shown?.key !== key && pending !== key) {
        pending = key;
        held.window(request).then(
          (window) => {
            // Only the newest view asked for is shown; an answer overtaken by a later zoom is dropped.
            if (pending !== key) return;
            pending = null;
            shown = { key, window };
            // Benchmarks time the first; tests read what each one held.
            performance.mark('tunebench:open-run:window', { detail: { points: window.x.length, dense: window.dense } });
            for (const notify of listeners) notify();
          },
          () => {
            if (pending === key) pending = null;
          },
        );
      }
      if (shown) return { dense: shown.window.dense, data: windowPlotData(shown.window) };
      if (held?.preview)
        return { dense: true, data: previewPlotData(held.preview, 'frequency_hz', 'temperature_c', view) };
      return { dense: true, data: [[], [], [], [], []] };
    },
  };
}

export function useHeldWindows(held: HeldLog | null, key: string): HeldWindows {
  return useMemo(() => heldWindows(held), [key]);
}

/** Main's analysis of the held log, null while it runs; a failed call becomes the outcome's message. */
export function useHeldAnalysis(key: string | null, held: HeldLog | undefined): RunAnalysis | null {
  const [state, setState] = useState<{ key: string; reply: RunAnalysis } | null>(null);
  useEffect(() => {
    if (key === null || !held) return;
    let live = true;
    held.analysis().then(
      (reply) => live && setState({ key, reply }),
      (error: unknown) =>
        live &&
        setState({ key, reply: { outcome: { ok: false, message: errorText(error) }, tempco: null, holdV: null } }),
    );
    return () => {
      live = false;
    };
  }, [key]);
  return state && state.key === key ? state.reply : null;
}

/** Every reading of the held log as CSV, fetched from main a part at a time into one Blob. */
export async function heldCsv(held: HeldLog): Promise<Blob> {
  const parts: string[] = [];
  let row = 0;
  do {
    const part = await held.csvPart(row, MAX_CSV_PART_ROWS);
    parts.push(part.text);
    if (part.nextRow <= row) break;
    row = part.nextRow;
  } while (row < held.rowCount);
  return new Blob(parts, { type: 'text/csv' });
}

/** The held log of an opened run, asked from `api`; undefined when the page holds the run's readings itself. */
export function heldLogOf(
  api: Pick<BenchApi, 'windowRun' | 'analyzeRun' | 'runCsvPart'>,
  opened: OpenedRun,
): HeldLog | undefined {
  const { held } = opened;
  const { windowRun, analyzeRun, runCsvPart } = api;
  if (!held || !windowRun || !analyzeRun || !runCsvPart) return undefined;
  const id = opened.detail.meta.id;
  return {
    rowCount: held.rowCount,
    preview: held.preview,
    window: (request) => windowRun.call(api, id, request),
    analysis: () => analyzeRun.call(api, id),
    csvPart: (fromRow, rows) => runCsvPart.call(api, id, fromRow, rows),
  };
}
