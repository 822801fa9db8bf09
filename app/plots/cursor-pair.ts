/**
 * Two cursors on a chart, placed by clicking readings: their differences
 * (Δx, Δy) and the slope between them — ΔV, Δf and Hz/V on a sweep, a drift
 * rate in Hz/s on a drift log.
 */
export interface CursorMark {
  x: number;
  y: number;
}

export interface CursorDeltas {
  dx: number;
  dy: number;
  /** Δy/Δx; null when both cursors sit at the same x. */
  slope: number | null;
}

export function cursorDeltas(a: CursorMark, b: CursorMark): CursorDeltas {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  return { dx, dy, slope: dx === 0 ? null : dy / dx };
}

/** The reading a click lands on: the x at `idx` and the first series with a value there. */
export function markAt(
  data: readonly ArrayLike<number | null | undefined>[],
  idx: number | null | undefined,
): CursorMark | null {
  if (idx === null || idx === undefined) return null;
  const x = data[0]?.[idx];
  if (x === null || x === undefined || !Number.isFinite(x)) return null;
  for (let s = 1; s < data.length; s += 1) {
    const y = data[s]?.[idx];
    if (y !== null && y !== undefined && Number.isFinite(y)) return { x, y };
  }
  return null;
}
