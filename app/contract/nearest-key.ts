/**
 * Did-you-mean for a misspelt key or flag. Its own module, free of zod, so
 * the CLI's flag parser (loaded by every command, `--help` too) evaluates no
 * schema code to offer it.
 */

/** Edit distance (insert, delete, substitute, swap neighbours) — Damerau–Levenshtein, optimal string alignment. */
export function editDistance(a: string, b: string): number {
  const rows = a.length + 1;
  const cols = b.length + 1;
  const d: number[] = new Array<number>(rows * cols).fill(0);
  for (let i = 0; i < rows; i++) d[i * cols] = i;
  for (let j = 0; j < cols; j++) d[j] = j;
  for (let i = 1; i < rows; i++) {
    for (let j = 1; j < cols; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let best = Math.min(
        (d[(i - 1) * cols + j] as number) + 1,
        (d[i * cols + j - 1] as number) + 1,
        (d[(i - 1) * cols + j - 1] as number) + cost,
      );
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1])
        best = Math.min(best, (d[(i - 2) * cols + j - 2] as number) + 1);
      d[i * cols + j] = best;
    }
  }
  return d[rows * cols - 1] as number;
}

/** The known key closest to `key`, when it is close enough to be a slip of the keyboard. */
export function nearestKey(key: string, known: readonly string[]): string | null {
  let best: string | null = null;
  let bestDistance = Infinity;
  for (const candidate of known) {
    const distance = editDistance(key.toLowerCase(), candidate.toLowerCase());
    if (distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  const allowed = Math.max(2, Math.floor(key.length / 3));
  return best !== null && bestDistance <= allowed ? best : null;
}
