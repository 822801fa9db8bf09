/**
 * Stall-edge refinement: after the coarse pass, bisect between the highest
 * stalled level that sits just below an oscillating one and that oscillating
 * level, until the bracket is no wider than `resolutionV`. Each bisection
 * point is a full point (settled, recorded, flagged `refined`).
 */
import type { Direction } from './sweep-points.ts';

export interface EdgeBracket {
  stalledV: number;
  oscillatingV: number;
  direction: Direction;
}

/**
 * Finds the bracket in one pass's results, given per-level flags in
 * ascending level order. Returns null when there is no stalled→oscillating
 * step (it never stalls, or never starts).
 */
export function findEdge(
  levels: Float64Array,
  stalled: Uint8Array,
  oscillating: Uint8Array,
  direction: Direction,
): EdgeBracket | null {
  for (let i = levels.length - 2; i >= 0; i--) {
    if (stalled[i] === 1 && oscillating[i + 1] === 1) {
      return { stalledV: levels[i] as number, oscillatingV: levels[i + 1] as number, direction };
    }
  }
  return null;
}

/** Number of bisection points needed to narrow `widthV` to `resolutionV`. */
export function bisectionSteps(widthV: number, resolutionV: number): number {
  if (!(resolutionV > 0) || !(widthV > resolutionV)) return 0;
  return Math.ceil(Math.log2(widthV / resolutionV));
}

/**
 * Runs the bisection; `probe(v)` measures a point and says whether the DUT
 * oscillated there (null when the readings failed — then the bisection stops,
 * rather than guess). Returns the final bracket.
 */
export async function bisectEdge(
  bracket: EdgeBracket,
  resolutionV: number,
  probe: (controlV: number) => Promise<boolean | null>,
): Promise<EdgeBracket> {
  let lo = bracket.stalledV;
  let hi = bracket.oscillatingV;
  const steps = bisectionSteps(hi - lo, resolutionV);
  for (let i = 0; i < steps; i++) {
    const mid = (lo + hi) / 2;
    const oscillates = await probe(mid);
    if (oscillates === null) break;
    if (oscillates) hi = mid;
    else lo = mid;
  }
  return { stalledV: lo, oscillatingV: hi, direction: bracket.direction };
}
