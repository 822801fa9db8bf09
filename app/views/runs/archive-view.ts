/**
 * The run archive as a table one can sort and filter: by DUT (text), kind,
 * status and date, with Kvco (best-line slope of a sweep) as a column once
 * it is known. Pure: the screen keeps the choices, this orders the rows.
 */
import { formatFigure } from '../../analysis/format-figure.ts';
import type { RunKind, RunMeta, RunStatus } from '../../contract/bench-api.ts';

export type ArchiveSortKey = 'started' | 'dut' | 'kind' | 'status' | 'kvco';

export interface ArchiveFilter {
  text: string;
  kind: RunKind | 'all';
  status: RunStatus | 'all';
  /** ISO date (YYYY-MM-DD) bounds on the start, inclusive; '' for none. */
  from: string;
  to: string;
}

export const NO_FILTER: ArchiveFilter = { text: '', kind: 'all', status: 'all', from: '', to: '' };

export interface ArchiveSort {
  key: ArchiveSortKey;
  descending: boolean;
}

/** Runs that pass the filter, in the chosen order; runs without a Kvco sort after those with one. */
export function archiveRows(
  runs: readonly RunMeta[],
  filter: ArchiveFilter,
  sort: ArchiveSort,
  kvco: ReadonlyMap<string, number>,
): RunMeta[] {
  const text = filter.text.trim().toLowerCase();
  const kept = runs.filter((run) => {
    if (filter.kind !== 'all' && run.kind !== filter.kind) return false;
    if (filter.status !== 'all' && run.status !== filter.status) return false;
    if (text && !`${run.dut.id} ${run.dut.notes}`.toLowerCase().includes(text)) return false;
    const day = run.startedAt.slice(0, 10);
    if (filter.from && day < filter.from) return false;
    if (filter.to && day > filter.to) return false;
    return true;
  });
  const sign = sort.descending ? -1 : 1;
  const compare = (a: RunMeta, b: RunMeta): number => {
    switch (sort.key) {
      case 'dut':
        return sign * a.dut.id.localeCompare(b.dut.id);
      case 'kind':
        return sign * a.kind.localeCompare(b.kind);
      case 'status':
        return sign * a.status.localeCompare(b.status);
      case 'kvco': {
        const ka = kvco.get(a.id);
        const kb = kvco.get(b.id);
        if (ka === undefined || kb === undefined) return ka === undefined ? (kb === undefined ? 0 : 1) : -1;
        return sign * (ka - kb);
      }
      default:
        return sign * a.startedAt.localeCompare(b.startedAt);
    }
  };
  // Ties keep the newest first.
  return kept.sort((a, b) => compare(a, b) || b.startedAt.localeCompare(a.startedAt));
}

/** The archive's Kvco cell: the best-line slope ± its 1σ, to the digits the 1σ supports. */
export function kvcoText(hzPerV: number, uncertaintyHzPerV: number | undefined): string {
  return formatFigure(hzPerV, 'Hz/V', { uncertainty: uncertaintyHzPerV ?? null });
}
