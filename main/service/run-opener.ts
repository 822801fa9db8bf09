/**
 * Opening a stored run in two steps (issue 12, big runs open fast): the
 * page first asks `previewRun` — the run reduced to its plot's pixel
 * columns (app/analysis/pixel-preview.ts), a few hundred kilobytes, drawn
 * at once — and then `openRun` for the full columns. The table read for the
 * preview (from the column cache, main/store/cached-samples.ts) is kept for
 * the `openRun` of the same run that follows, once, so the store is read
 * once per opening; any edit through the service drops it.
 */
import { runPreviewOf } from '../../app/analysis/pixel-preview.ts';
import type { RunDetail } from '../../app/contract/bench-api.ts';
import type { RunPreview } from '../../app/contract/run-preview.ts';

export interface RunOpener {
  preview(id: string, columns: number): Promise<RunPreview>;
  open(id: string): Promise<RunDetail>;
  /** The run changed (renamed, noted, deleted): a kept table of it is stale. */
  forget(id: string): void;
}

export function createRunOpener(read: (id: string) => Promise<RunDetail>): RunOpener {
  // At most one run's table, waiting for its openRun; a second preview replaces it.
  let kept: { id: string; detail: RunDetail } | null = null;
  return {
    async preview(id, columns) {
      const detail = await read(id);
      // A run still being written grows between the two calls: its openRun reads it again.
      kept = detail.meta.status === 'running' ? null : { id, detail };
      return runPreviewOf(detail, columns);
    },
    async open(id) {
      if (kept !== null && kept.id === id) {
        const { detail } = kept;
        kept = null;
        return detail;
      }
      return read(id);
    },
    forget(id) {
      if (kept?.id === id) kept = null;
    },
  };
}
