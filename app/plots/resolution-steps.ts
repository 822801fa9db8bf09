/**
 * Tick steps for a value axis whose data resolve `resolution` (a counter's
 * 1/gate, a thermometer's 0.01 °C): the usual 1-2-2.5-5 steps per decade,
 * none finer than the resolution, and none whose labels would need a digit
 * below the resolution's decade (25 Hz steps write "13.825 kHz", a 1 Hz
 * digit, that a 10 Hz counter never read). Ticks 2 Hz apart on readings that
 * come in 10 Hz counts would draw a scale the data cannot show. Pure; given to
 * uPlot as an axis' `incrs`.
 */

/** Decades of steps offered above the resolution's own (uPlot's default list spans 32). */
const DECADES = 32;
const MULTIPLIERS = [1, 2, 2.5, 5] as const;

/** Ascending tick steps no finer than `resolution`; null when there is no resolution to honour. */
export function resolutionSteps(resolution: number | null | undefined): number[] | null {
  if (resolution === null || resolution === undefined || !Number.isFinite(resolution) || resolution <= 0) return null;
  const decade = Math.floor(Math.log10(resolution) + 1e-9);
  const steps: number[] = [];
  for (let exp = decade; exp < decade + DECADES; exp += 1) {
    for (const m of MULTIPLIERS) {
      // 2.5 × 10^decade ends one digit below the decade; from the next decade up it is a whole number of them.
      if (m === 2.5 && exp === decade) continue;
      // Written through the exponent so 2e-2 stays 0.02, not 0.020000000000000004.
      const step = Number(`${m}e${exp}`);
      if (step >= resolution * (1 - 1e-9)) steps.push(step);
    }
  }
  return steps;
}
