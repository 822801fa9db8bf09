/**
 * Data quality of a recorded run, from its samples and events.jsonl: settle
 * timeouts, failed readings (status timeout/error), gaps, link retries and
 * instrument faults, each counted and, where a voltage applies, located. It
 * also marks the readings of points that never settled, so the sweep
 * analysis can leave them out of the fit.
 */
import { numericColumn } from './csv-columns.ts';
import type { ColumnTable } from '../contract/column-table.ts';
import { listVolts } from './list-volts.ts';

/** One events.jsonl entry as the reader returns it (anything beyond `type` is optional). */
export interface RunEventLike {
  type: string;
  time_s?: unknown;
  control_v?: unknown;
  [key: string]: unknown;
}

export interface RunQuality {
  settleTimeouts: { count: number; atV: number[] };
  failedReadings: { count: number; atV: number[] };
  gaps: number;
  linkRetries: number;
  faults: number;
  /** Points left out of the fit because they never settled (filled in by the sweep analysis). */
  unsettledPointsLeftOut: number;
}

const RETRY_TYPES = new Set(['link-lost', 'reconnected', 'reconnect-failed']);

function uniqueSorted(values: number[]): number[] {
  return [...new Set(values.map((v) => Number(v.toPrecision(12))))].sort((a, b) => a - b);
}

export function runQuality(
  table: ColumnTable,
  events: readonly RunEventLike[],
): { quality: RunQuality; unsettledRows: Uint8Array } {
  const n = table.rowCount;
  const controlV = numericColumn(table, 'control_v');
  const timeS = numericColumn(table, 'time_s');
  const status = table.text.status;
  const failedAt: number[] = [];
  let failed = 0;
  if (status) {
    for (let r = 0; r < n; r++) {
      const s = (status.levels[status.codes[r] as number] ?? '').toLowerCase();
      if (s === 'timeout' || s === 'error') {
        failed++;
        const v = controlV ? (controlV[r] as number) : NaN;
        if (Number.isFinite(v)) failedAt.push(v);
      }
    }
  }
  const unsettledRows = new Uint8Array(n);
  const timeoutAt: number[] = [];
  let timeouts = 0;
  let gaps = 0;
  let retries = 0;
  let faults = 0;
  for (const e of events) {
    if (e.type === 'gap-start') gaps++;
    else if (RETRY_TYPES.has(e.type)) retries++;
    else if (e.type === 'fault') faults++;
    else if (e.type === 'settle-timeout') {
      timeouts++;
      const v = typeof e.control_v === 'number' ? e.control_v : NaN;
      if (Number.isFinite(v)) timeoutAt.push(v);
      const t = typeof e.time_s === 'number' ? e.time_s : NaN;
      if (!controlV || !Number.isFinite(v)) continue;
      // The point's readings follow the event: the first run of rows at that voltage from its time on.
      let r = 0;
      if (timeS && Number.isFinite(t)) while (r < n && !((timeS[r] as number) >= t - 1e-9)) r++;
      while (r < n && Math.abs((controlV[r] as number) - v) > 1e-9 * Math.max(1, Math.abs(v))) r++;
      while (r < n && Math.abs((controlV[r] as number) - v) <= 1e-9 * Math.max(1, Math.abs(v))) unsettledRows[r++] = 1;
    }
  }
  return {
    quality: {
      settleTimeouts: { count: timeouts, atV: uniqueSorted(timeoutAt) },
      failedReadings: { count: failed, atV: uniqueSorted(failedAt) },
      gaps,
      linkRetries: retries,
      faults,
      unsettledPointsLeftOut: 0,
    },
    unsettledRows,
  };
}

/** The warnings a quality record gives (empty when the run was clean). */
export function qualityWarnings(q: RunQuality): string[] {
  const out: string[] = [];
  if (q.settleTimeouts.count > 0) {
    out.push(
      `${q.settleTimeouts.count} point(s) hit the settle timeout${q.settleTimeouts.atV.length ? ` (at ${listVolts(q.settleTimeouts.atV)} V)` : ''}`,
    );
  }
  if (q.failedReadings.count > 0) {
    out.push(
      `${q.failedReadings.count} reading(s) failed (counter timeout or error)${q.failedReadings.atV.length ? ` at ${listVolts(q.failedReadings.atV)} V` : ''}`,
    );
  }
  if (q.gaps > 0) out.push(`${q.gaps} gap(s) in the record`);
  if (q.linkRetries > 0) out.push(`${q.linkRetries} link loss/retry event(s)`);
  if (q.faults > 0) out.push(`${q.faults} instrument fault event(s)`);
  return out;
}
