/**
 * Number formatting for people: SI prefixes (kHz, MHz, mV), significant
 * digits, value ± uncertainty. Pure; shared by the CLI, the datasheet
 * exporters and the renderer. Code keeps SI base units; only this edge
 * formats.
 */
import { SI_PREFIXES } from '../contract/si-prefixes.ts';

// The one prefix table, with the unprefixed unit in its place (descending scale).
const PREFIXES: readonly (readonly [number, string])[] = [
  ...SI_PREFIXES.map((p): readonly [number, string] => [p.scale, p.symbol]),
  [1, ''] as const,
].sort((a, b) => b[0] - a[0]);

/** The prefix scale and symbol for a value (engineering notation, 1 ≤ |x| < 1000). */
export function siPrefixFor(value: number): { scale: number; symbol: string } {
  const a = Math.abs(value);
  if (!Number.isFinite(a) || a === 0) return { scale: 1, symbol: '' };
  for (const [scale, symbol] of PREFIXES) {
    if (a >= scale * (1 - 1e-12)) return { scale, symbol };
  }
  return { scale: 1e-12, symbol: 'p' };
}

/** Significant-digit formatting without exponent for 1e-3 ≤ |x| < 1e6. */
export function formatNumber(value: number, significant = 4): string {
  if (Number.isNaN(value)) return '—';
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞';
  if (value === 0) return '0';
  const a = Math.abs(value);
  if (a >= 1e6 || a < 1e-3) return minus(value.toExponential(significant - 1));
  const digits = Math.max(0, significant - 1 - Math.floor(Math.log10(a)));
  return minus(value.toFixed(Math.min(digits, 12)));
}

function minus(text: string): string {
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}

/** "12.35 MHz", "250.0 mV", "—" for NaN/null. Unit empty → prefix only ("4.7 k"). */
export function formatSi(value: number | null | undefined, unit: string, significant = 4): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  if (value === 0) return unit ? `0 ${unit}` : '0';
  // Round first: 999.99 shown with 4 digits is "1.000 k", not "1000.0".
  const rounded = Number(value.toPrecision(significant));
  const { scale, symbol } = siPrefixFor(rounded);
  const text = formatNumber(rounded / scale, significant);
  return unit || symbol ? `${text} ${symbol}${unit}` : text;
}

/**
 * "12.3456 ± 0.0021 MHz": the prefix follows the value, the decimals follow
 * the uncertainty shown to two significant digits (common practice, GUM §7.2.6).
 */
export function formatSiWithUncertainty(
  value: number | null | undefined,
  uncertainty: number | null | undefined,
  unit: string,
): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  if (
    uncertainty === null ||
    uncertainty === undefined ||
    !Number.isFinite(uncertainty) ||
    uncertainty <= Math.abs(value) * 1e-9 // negligible: would only print noise digits
  ) {
    return formatSi(value, unit);
  }
  const { scale, symbol } = siPrefixFor(value === 0 ? uncertainty : value);
  const u = uncertainty / scale;
  const decimals = Math.max(0, Math.min(12, 1 - Math.floor(Math.log10(u))));
  return `${minus((value / scale).toFixed(decimals))} ± ${u.toFixed(decimals)} ${symbol}${unit}`.trimEnd();
}

/** Plain value with a unit that takes no prefix (ppm/°C, %, ppm/h). */
export function formatPlain(value: number | null | undefined, unit: string, significant = 3): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  return unit ? `${formatNumber(value, significant)} ${unit}` : formatNumber(value, significant);
}

/** Durations for people: "45 s", "48.0 min", "2.50 h" (seconds below 100 s, minutes below 100 min). */
export function formatDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || Number.isNaN(seconds)) return '—';
  if (Math.abs(seconds) < 100) return formatSi(seconds, 's', 3);
  if (Math.abs(seconds) < 6000) return `${formatNumber(seconds / 60, 3)} min`;
  return `${formatNumber(seconds / 3600, 3)} h`;
}

/** formatSi for a value that may be missing: an em dash for null, undefined, NaN or ±∞ (screens and plot labels). */
export function formatSiOrDash(value: number | null | undefined, unit: string, digits = 4): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : formatSi(value, unit, digits);
}
