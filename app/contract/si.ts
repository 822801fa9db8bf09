/**
 * Parsing of numbers written with SI prefixes ("250m", "1.5k", "2.4M") and of
 * durations ("90s", "15m", "8h"), as the command line and plan files accept
 * them. Pure; shared by main and the renderer.
 */
import { SI_PREFIX_SCALE } from './si-prefixes.ts';


const SI_PATTERN = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([pnuµmkMG]?)([A-Za-z°]*)$/;

/**
 * Parses "250m", "1.5k", "2.4M", "0.25", "3.3V", "10MHz". A trailing unit
 * symbol is allowed and ignored. Returns null when the text is not a number.
 */
export function parseSiNumber(text: string): number | null {
  const match = SI_PATTERN.exec(text.trim());
  if (!match) return null;
  const [, mantissa, prefix = '', unit = ''] = match;
  // "5m" is 5 milli; but "5 MHz" keeps M = mega. A lone unit like "Hz" or
  // "V" with no prefix is fine.
  if (unit !== '' && !/^(V|Hz|A|s|C|°C|W)$/.test(unit)) return null;
  const value = Number(mantissa) * (SI_PREFIX_SCALE[prefix] ?? 1);
  return Number.isFinite(value) ? value : null;
}

const DURATION_PATTERN = /^(\d+(?:\.\d+)?)\s*(ms|s|m|min|h|d)?$/;
const DURATION_SCALE: Readonly<Record<string, number>> = { ms: 1e-3, s: 1, m: 60, min: 60, h: 3600, d: 86400 };

/** Parses "90s", "15m", "8h", "1.5h", "250ms" or a plain number of seconds. */
export function parseDurationS(text: string): number | null {
  const match = DURATION_PATTERN.exec(text.trim());
  if (!match) return null;
  const [, amount, unit = 's'] = match;
  const value = Number(amount) * (DURATION_SCALE[unit] ?? 1);
  return Number.isFinite(value) ? value : null;
}
