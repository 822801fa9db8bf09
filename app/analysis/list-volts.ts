/**
 * A list of voltages for a warning: the first few and how many in all, so a
 * sweep of a million points whose every other step falls back gives one
 * readable line, not megabytes (issue 15 item 9). The full list stays in the
 * result's own field.
 */
export function listVolts(values: readonly number[], max = 8): string {
  const shown = values.slice(0, max).join(', ');
  return values.length > max ? `${shown} … (${values.length} voltages)` : shown;
}
