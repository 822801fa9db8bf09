/**
 * The reading-status rules (CONTRACTS.md samples.csv `status`), one place for
 * the CLI, the store's CSV import and the renderer: `ok` is a measured
 * frequency; `no-signal` is evidence that the DUT did not oscillate (its
 * frequency counts as NaN); `timeout` and `error` say nothing either way, so
 * the analyses drop the row.
 */
export const READING_STATUSES = ['ok', 'no-signal', 'timeout', 'error'] as const;
export type ReadingStatus = (typeof READING_STATUSES)[number];

export type StatusEffect = 'measured' | 'no-oscillation' | 'dropped';

export const STATUS_EFFECT: Readonly<Record<ReadingStatus, StatusEffect>> = {
  ok: 'measured',
  'no-signal': 'no-oscillation',
  timeout: 'dropped',
  error: 'dropped',
};

/** A status cell read as written by a person or by us: case and spaces ignored, empty is `ok`; null when not a status. */
export function readingStatus(cell: string): ReadingStatus | null {
  const word = cell.trim().toLowerCase();
  if (word === '') return 'ok';
  return (READING_STATUSES as readonly string[]).includes(word) ? (word as ReadingStatus) : null;
}

/** A direction cell: empty is `up`; null when neither up nor down. */
export function sweepDirection(cell: string): 1 | -1 | null {
  const word = cell.trim().toLowerCase();
  if (word === '' || word === 'up') return 1;
  return word === 'down' ? -1 : null;
}
