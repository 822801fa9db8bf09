/**
 * Two cursors on a chart, placed by clicking readings: their differences
 * (Δx, Δy) and the slope between them — ΔV, Δf and Hz/V on a sweep, a drift
 * rate in Hz/s on a drift log.
 */
import { formatFigure } from '../analysis/format-figure.ts';
import { readoutText, type Readout } from './readout.ts';

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

/** What the two-cursor read-out says: each cursor, then ΔV/Δf (or Δx/Δy) and the slope, to the digits the series support. */
export interface CursorTexts {
  a: string | null;
  b: string | null;
  deltas: string | null;
}

/** 1σ of a value quantised to `r` (rectangular, r/√12, GUM §4.3.7); 0 when the series has no resolution. */
const quantum = (r: Readout): number => (r.resolution && r.resolution > 0 ? r.resolution / Math.sqrt(12) : 0);

export function cursorTexts(marks: readonly CursorMark[], x: Readout, y: Readout): CursorTexts {
  const [a, b] = marks;
  const at = (m: CursorMark | undefined): string | null =>
    m ? `${readoutText(x, m.x)}, ${readoutText(y, m.y)}` : null;
  if (!a || !b) return { a: at(a), b: at(b), deltas: null };
  const d = cursorDeltas(a, b);
  const dxName = x.unit === 'V' ? 'V' : x.clock ? 't' : 'x';
  const dyName = y.unit === 'Hz' ? 'f' : 'y';
  // A difference of two readings on one grid sits on that grid: same resolution.
  const dxText = readoutText(x, d.dx);
  let slope = '— (same x)';
  if (d.slope !== null) {
    // Each difference carries two quantisations (√2 · r/√12); the slope's 1σ follows from both (GUM §5.1.2).
    const sdy = Math.SQRT2 * quantum(y);
    const sdx = Math.SQRT2 * quantum(x);
    const u = Math.sqrt(sdy * sdy + d.slope * d.slope * sdx * sdx) / Math.abs(d.dx);
    const unit = `${y.unit}/${x.unit}`;
    slope = u > 0 ? formatFigure(d.slope, unit, { uncertainty: u }) : formatFigure(d.slope, unit, { digits: 4 });
  }
  return {
    a: at(a),
    b: at(b),
    deltas: `Δ${dxName} ${dxText} · Δ${dyName} ${readoutText(y, d.dy)} · slope ${slope}`,
  };
}
