/**
 * The sweep plot holds one display row per reading, each either rising or
 * falling. The cursor readout shows both directions at a setpoint: this finds
 * the other direction's reading at the same control voltage.
 */
export function sameSetpointValue(x: readonly number[], other: readonly (number | null)[], k: number): number | null {
  const v = x[k];
  if (v === undefined) return null;
  for (let j = k; j >= 0 && x[j] === v; j -= 1)
    if (other[j] !== null && other[j] !== undefined) return other[j] as number;
  for (let j = k + 1; j < x.length && x[j] === v; j += 1)
    if (other[j] !== null && other[j] !== undefined) return other[j] as number;
  return null;
}
