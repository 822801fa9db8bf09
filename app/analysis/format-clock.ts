/**
 * Elapsed and remaining times as a clock reads them — "1 h 02 min",
 * "3 min 05 s", "42 s" — for an ETA or a log's length. The one formatter of
 * this kind: the renderer and the CLI's progress line both use it. (A
 * measured duration with its significant digits, such as a warm-up time, is
 * formatDuration in format-si.ts.)
 */
export function formatClockDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds) || seconds < 0) return '—';
  const s = Math.round(seconds);
  if (s >= 3600) return `${Math.floor(s / 3600)} h ${String(Math.floor((s % 3600) / 60)).padStart(2, '0')} min`;
  if (s >= 60) return `${Math.floor(s / 60)} min ${String(s % 60).padStart(2, '0')} s`;
  return `${s} s`;
}
