/** Small numeric helpers of the pushing procedure. */

/** start..stop by step, by index (no accumulated rounding), ascending or descending as given. */
export function supplyLevels(startV: number, stopV: number, stepV: number): Float64Array {
  const span = Math.abs(stopV - startV);
  const steps = Math.floor(span / stepV + 1e-9);
  const sign = stopV >= startV ? 1 : -1;
  const extra = span - steps * stepV > stepV * 1e-6 ? 1 : 0;
  const levels = new Float64Array(steps + 1 + extra);
  for (let i = 0; i <= steps; i++) levels[i] = startV + sign * i * stepV;
  if (extra === 1) levels[steps + 1] = stopV;
  return levels;
}

/** Least-squares slope of y on x over the finite y values; null with fewer than two or no x spread. */
export function linearSlope(xs: Float64Array, ys: Float64Array): { slope: number; meanY: number } | null {
  let n = 0;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < xs.length; i++) {
    const y = ys[i] as number;
    if (!Number.isFinite(y)) continue;
    n++;
    mx += xs[i] as number;
    my += y;
  }
  if (n < 2) return null;
  mx /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < xs.length; i++) {
    const y = ys[i] as number;
    if (!Number.isFinite(y)) continue;
    const dx = (xs[i] as number) - mx;
    sxx += dx * dx;
    sxy += dx * (y - my);
  }
  if (!(sxx > 0)) return null;
  return { slope: sxy / sxx, meanY: my };
}
