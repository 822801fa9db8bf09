/**
 * The one quantity grammar of tunebench, used by plan and bench files, the
 * command line and the app's fields alike. Pure; shared by main and the
 * renderer.
 *
 * - Voltage, current and frequency take an SI prefix and optionally their
 *   unit: "250m" or "250mV" is 0.25 V, "20mA" is 0.02 A, "10MHz" is 1e7 Hz.
 * - A time needs an explicit unit when it is not a bare number: "100ms",
 *   "90s", "15min", "8h", "2d"; a bare number is seconds. A bare "m" on a
 *   time is refused with both readings offered, because "100m" has meant
 *   100 minutes to some readers and 100 milliseconds to others.
 */
import { SI_PREFIX_SCALE } from './si-prefixes.ts';

export type Parsed = { ok: true; value: number } | { ok: false; error: string };

const NUMBER = String.raw`[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?`;
const SI_PATTERN = new RegExp(`^(${NUMBER})\\s*([pnuµmkMG]?)([A-Za-z°]*)$`);

/** Quantities that take SI prefixes, with the one unit symbol each may carry. */
export type QuantityKind = 'voltage' | 'current' | 'frequency';
const UNIT_OF: Readonly<Record<QuantityKind, string>> = { voltage: 'V', current: 'A', frequency: 'Hz' };
/** How each quantity may be written, for messages. */
export const QUANTITY_FORMS: Readonly<Record<QuantityKind, string>> = {
  voltage: 'a voltage such as 0.25, "250m" or "250mV"',
  current: 'a current such as 0.02, "20m" or "20mA"',
  frequency: 'a frequency such as 1000, "1k" or "10MHz"',
};

/** At most this many characters of what the user wrote are echoed in a message. */
export const EXCERPT_CHARS = 60;

/** `JSON.stringify(value)`, cut to EXCERPT_CHARS with "…" so an error never echoes a whole file. */
export function excerpt(value: unknown): string {
  let text: string;
  try {
    text =
      typeof value === 'string' && value.length > EXCERPT_CHARS * 4
        ? JSON.stringify(value.slice(0, EXCERPT_CHARS))
        : (JSON.stringify(value) ?? String(value));
  } catch {
    text = String(value);
  }
  if (Array.isArray(value) && value.length > 0 && text.length > EXCERPT_CHARS)
    return `an array of ${value.length} values`;
  return text.length > EXCERPT_CHARS ? `${text.slice(0, EXCERPT_CHARS)}…` : text;
}

/** Parses a voltage, current or frequency written with an optional SI prefix and its own unit. */
export function parseQuantity(text: string, kind: QuantityKind): Parsed {
  const match = SI_PATTERN.exec(text.trim());
  const unit = UNIT_OF[kind];
  if (match) {
    const [, mantissa = '', prefix = '', symbol = ''] = match;
    if (symbol === '' || symbol === unit) {
      const value = Number(mantissa) * (SI_PREFIX_SCALE[prefix] ?? 1);
      if (Number.isFinite(value)) return { ok: true, value };
    }
  }
  return { ok: false, error: `expected ${QUANTITY_FORMS[kind]}, got ${excerpt(text)}` };
}

/**
 * Parses "250m", "1.5k", "2.4M", "0.25", "3.3V", "10MHz" with any of the
 * units V, A, Hz, W (ignored). Returns null when the text is not such a
 * number. For fields with a known quantity use parseQuantity; for times,
 * parseTime.
 */
export function parseSiNumber(text: string): number | null {
  const match = SI_PATTERN.exec(text.trim());
  if (!match) return null;
  const [, mantissa = '', prefix = '', unit = ''] = match;
  if (unit !== '' && !/^(V|Hz|A|W)$/.test(unit)) return null;
  const value = Number(mantissa) * (SI_PREFIX_SCALE[prefix] ?? 1);
  return Number.isFinite(value) ? value : null;
}

const TIME_PATTERN = new RegExp(`^(${NUMBER})\\s*([A-Za-zµ]*)$`);
const TIME_SCALE: Readonly<Record<string, number>> = {
  ns: 1e-9,
  us: 1e-6,
  µs: 1e-6,
  ms: 1e-3,
  s: 1,
  min: 60,
  h: 3600,
  d: 86400,
};
export const TIME_FORMS = 'a time such as 0.5, "100ms", "90s", "15min" or "8h" (a bare number is seconds)';

/** Parses a time in seconds: a bare number, or a number with ns, us/µs, ms, s, min, h or d. */
export function parseTime(text: string): Parsed {
  const match = TIME_PATTERN.exec(text.trim());
  if (match) {
    const [, amount = '', unit = ''] = match;
    const n = Number(amount);
    if (unit === 'm') {
      return {
        ok: false,
        error: `${excerpt(text)} is ambiguous for a time: write "${amount}ms" (${n / 1000} s) or "${amount}min" (${n * 60} s)`,
      };
    }
    const scale = unit === '' ? 1 : TIME_SCALE[unit];
    if (scale !== undefined) {
      const value = n * scale;
      if (Number.isFinite(value)) return { ok: true, value };
    }
  }
  return { ok: false, error: `expected ${TIME_FORMS}, got ${excerpt(text)}` };
}

/** parseTime's value, or null when the text is not a time. */
export function parseDurationS(text: string): number | null {
  const parsed = parseTime(text);
  return parsed.ok ? parsed.value : null;
}
