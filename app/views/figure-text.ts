/**
 * What a key-figure panel shows, as data: label, value text, note and whether
 * the value is a finding (bold) or only "not significant" (never bold). Every
 * text comes from app/analysis/format-figure.ts, so the screens show each
 * figure with its uncertainty and only the digits it supports — the same as
 * the CLI and the exports. Pure, so tests read what a screen would show.
 */
import { formatFigure } from '../analysis/format-figure.ts';

export interface FigureText {
  label: string;
  value: string;
  note?: string;
  testId: string;
  /** False for a figure within 2σ of zero ("not significant …"): shown plain, never bold. */
  significant: boolean;
}

/** A control-voltage setpoint: a value the plan chose, shown to the millivolt it was set to (4 significant digits). */
export function setpointText(v: number | null | undefined): string {
  return formatFigure(v, 'V', { digits: 4 });
}

export function figure(label: string, value: string, testId: string, note?: string, significant = true): FigureText {
  return note === undefined ? { label, value, testId, significant } : { label, value, note, testId, significant };
}

/** One counter reading: digits down to the counter's resolution 1/gate when known, else 7 significant. */
export function readingText(value: number | null | undefined, resolutionHz: number | null | undefined): string {
  return formatFigure(value, 'Hz', resolutionHz && resolutionHz > 0 ? { resolution: resolutionHz } : { digits: 7 });
}
