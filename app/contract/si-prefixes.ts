/**
 * The one table of SI prefixes tunebench writes and reads (the SI Brochure's
 * prefixes from pico to tera — from memory; the set a bench needs). Formatting
 * (app/analysis/format-si.ts) and parsing (./si.ts) both take it from here.
 */
export const SI_PREFIXES: readonly { readonly symbol: string; readonly scale: number }[] = [
  { symbol: 'T', scale: 1e12 },
  { symbol: 'G', scale: 1e9 },
  { symbol: 'M', scale: 1e6 },
  { symbol: 'k', scale: 1e3 },
  { symbol: 'm', scale: 1e-3 },
  { symbol: 'µ', scale: 1e-6 },
  { symbol: 'n', scale: 1e-9 },
  { symbol: 'p', scale: 1e-12 },
];

/** Scale of each prefix symbol; `u` is accepted for micro where µ is hard to type. */
export const SI_PREFIX_SCALE: Readonly<Record<string, number>> = Object.fromEntries([
  ...SI_PREFIXES.map((p) => [p.symbol, p.scale] as const),
  ['u', 1e-6],
]);
