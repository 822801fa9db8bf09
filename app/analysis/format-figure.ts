/**
 * The one formatter for figures shown to people — CLI text, the app's screens
 * and every export (Markdown, CSV notes, HTML, print). A figure carries its
 * uncertainty and only the digits it supports:
 *
 * - with an uncertainty u: "18.4427 ± 0.0058 kHz" — u to two significant
 *   digits, the value to the same decimal place (GUM §7.2.6, common practice);
 * - else with a resolution r (e.g. a counter's 1/gate): the value rounded to
 *   r's decade, "18.44 kHz" for 18442.67 Hz at 10 Hz resolution;
 * - a value whose magnitude is at or below `floor` (the numerical floor:
 *   rounding noise of an exact fit) prints as 0;
 * - else `digits` significant digits (default 4).
 *
 * SI prefixes follow the value for units that take them (Hz, V, s, A, Hz/V,
 * Hz/°C); `plain` units (%, ppm/°C, ppm/h, ppm/V, none) never take one.
 * Pure; no locale: "." decimals and "−" (U+2212) minus everywhere.
 *
 * API (app/analysis/index.ts): formatFigure, formatSignificance, isSignificant,
 * belowFloor. See app/analysis/README.md.
 */
import { formatNumber, siPrefixFor } from './format-si.ts';

export interface FigureOptions {
  /** 1σ standard uncertainty, same unit as the value. */
  uncertainty?: number | null;
  /** Smallest step the measurement resolves (used when no uncertainty is given). */
  resolution?: number | null;
  /** |value| ≤ floor prints as 0 (the numerical floor). */
  floor?: number | null;
  /** Significant digits without uncertainty or resolution. Default 4. */
  digits?: number;
  /** Never use an SI prefix (default: prefixes for units other than %, ppm…, and dimensionless). */
  plain?: boolean;
  /** With an uncertainty, write |value| < 1e-3 or ≥ 1e6 as "(5.40 ± 0.30)e-4" (dimensionless figures such as σy). */
  exponent?: boolean;
}

const PLAIN_UNIT = /^(%|ppm.*|dB|°|°C|min|h)?$/;

function minus(text: string): string {
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}

function withUnit(text: string, symbol: string, unit: string): string {
  const u = `${symbol}${unit}`;
  return u ? `${text} ${u}` : text;
}

/** True when |value| ≤ relative·scale: what an exact computation leaves as rounding noise. */
export function belowFloor(value: number, scale: number, relative = 1e-9): boolean {
  return Math.abs(value) <= relative * Math.abs(scale);
}

export function formatFigure(value: number | null | undefined, unit: string, options: FigureOptions = {}): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  if (!Number.isFinite(value)) return withUnit(value > 0 ? '∞' : '−∞', '', unit);
  const plain = options.plain ?? PLAIN_UNIT.test(unit);
  const floor = options.floor ?? 0;
  if (floor > 0 && Math.abs(value) <= floor) return withUnit('0', '', unit);
  const u = options.uncertainty;
  // An uncertainty at the numerical floor of the value (exact data) supports no extra digits.
  if (u !== null && u !== undefined && Number.isFinite(u) && u > 0 && !belowFloor(u, value, 1e-9)) {
    const size = Math.max(Math.abs(value), u);
    if (options.exponent && plain && (size < 1e-3 || size >= 1e6)) {
      // The mantissa takes the decimals u supports; the exponent is the value's (as formatNumber writes "5.40e-4").
      const e = Math.floor(Math.log10(size));
      const mantissa = formatFigure(value / 10 ** e, '', { uncertainty: u / 10 ** e, plain: true });
      return withUnit(`(${mantissa})e${e}`, '', unit);
    }
    const { scale, symbol } = plain ? { scale: 1, symbol: '' } : siPrefixFor(Math.max(Math.abs(value), u));
    const us = u / scale;
    const decimals = 1 - Math.floor(Math.log10(us));
    if (decimals < 0) {
      // u ≥ 100 in this prefix: round both to u's two significant digits, no decimals.
      const step = Math.pow(10, -decimals);
      return withUnit(
        `${minus(String(Math.round(value / scale / step) * step))} ± ${Math.round(us / step) * step}`,
        symbol,
        unit,
      );
    }
    return withUnit(
      `${minus((value / scale).toFixed(Math.min(decimals, 15)))} ± ${us.toFixed(Math.min(decimals, 15))}`,
      symbol,
      unit,
    );
  }
  const r = options.resolution;
  if (r !== null && r !== undefined && Number.isFinite(r) && r > 0) {
    const { scale, symbol } = plain ? { scale: 1, symbol: '' } : siPrefixFor(value);
    const decimals = Math.max(0, -Math.floor(Math.log10(r / scale) + 1e-12));
    return withUnit(minus(((Math.round(value / r) * r) / scale).toFixed(Math.min(decimals, 15))), symbol, unit);
  }
  const digits = options.digits ?? 4;
  if (value === 0) return withUnit('0', '', unit);
  const rounded = Number(value.toPrecision(digits));
  if (plain) return withUnit(formatNumber(rounded, digits), '', unit);
  const { scale, symbol } = siPrefixFor(rounded);
  return withUnit(formatNumber(rounded / scale, digits), symbol, unit);
}

/** |value| ≥ 2σ: the figure is distinguishable from zero (common practice, ≈ 95 %). */
export function isSignificant(value: number | null | undefined, sd: number | null | undefined): boolean {
  if (value === null || value === undefined || !Number.isFinite(value)) return false;
  if (sd === null || sd === undefined || !Number.isFinite(sd)) return true;
  return Math.abs(value) >= 2 * sd;
}

/**
 * A rate or coefficient with its significance: "−3.2 ± 1.1 ppm/h" when |value| ≥ 2σ,
 * else "not significant over <span> (±σ)" — never a bare number that is noise.
 */
export function formatSignificance(
  value: number | null | undefined,
  sd: number | null | undefined,
  unit: string,
  span: string,
): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  if (isSignificant(value, sd)) return formatFigure(value, unit, { uncertainty: sd });
  return `not significant over ${span} (±${formatFigure(sd ?? NaN, unit, { digits: 2 })})`;
}
