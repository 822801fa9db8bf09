/**
 * CSV text of plot data, quoted against formula injection: the page's chart
 * export (app/plots/plot-export.ts) and main's export of a big run's plot
 * data (app/analysis/drift-run-view.ts) write the same cells.
 */

export function csvCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined || (typeof value === 'number' && !Number.isFinite(value))) return '';
  const text = typeof value === 'number' ? String(value) : value;
  return /[",\r\n]/.test(text) || /^[=+\-@]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** CSV of aligned columns: header of labels, one row per x value, numbers in shortest round-trip form. */
export function columnsCsv(labels: readonly string[], columns: readonly ArrayLike<number | null>[]): string {
  const n = columns[0]?.length ?? 0;
  const lines = [labels.map(csvCell).join(',')];
  for (let i = 0; i < n; i += 1) lines.push(columns.map((c) => csvCell(c[i] ?? null)).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
