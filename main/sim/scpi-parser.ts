/**
 * Splits a SCPI program message (one line) into program units, and matches
 * headers against command patterns written in the usual notation:
 * long form with the short form in capitals, [optional] nodes, `#` for a
 * numeric suffix — e.g. `[SOURce#]:VOLTage[:LEVel][:IMMediate][:AMPLitude]`.
 * Matching is case-insensitive and takes the long or the short form only.
 */

export interface ProgramUnit {
  /** Header as written, without the trailing `?`. */
  header: string;
  query: boolean;
  common: boolean;
  /** Leading `:` — the path starts at the root. */
  rooted: boolean;
  params: string[];
}

export type SplitResult = { ok: true; units: ProgramUnit[] } | { ok: false; detail: string };

const HEADER = /^(\*[A-Za-z]+|:?[A-Za-z][A-Za-z0-9_]*(?::[A-Za-z][A-Za-z0-9_]*)*)(\?)?$/;

/** Splits `text` at `sep` outside double or single quotes. */
function splitOutsideQuotes(text: string, sep: string): string[] | null {
  const parts: string[] = [];
  let quote: string | null = null;
  let start = 0;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i] as string;
    if (quote) {
      if (ch === quote) quote = null;
    } else if (ch === '"' || ch === "'") {
      quote = ch;
    } else if (ch === sep) {
      parts.push(text.slice(start, i));
      start = i + 1;
    }
  }
  if (quote) return null;
  parts.push(text.slice(start));
  return parts;
}

export function splitProgramMessage(line: string): SplitResult {
  const pieces = splitOutsideQuotes(line, ';');
  if (!pieces) return { ok: false, detail: 'unterminated string' };
  const units: ProgramUnit[] = [];
  for (const raw of pieces) {
    const text = raw.trim();
    if (text === '') continue;
    const space = text.search(/\s/);
    const headerText = space < 0 ? text : text.slice(0, space);
    const rest = space < 0 ? '' : text.slice(space).trim();
    const match = HEADER.exec(headerText);
    if (!match) return { ok: false, detail: `bad header "${headerText}"` };
    const header = match[1] as string;
    const params = rest === '' ? [] : splitOutsideQuotes(rest, ',');
    if (!params) return { ok: false, detail: 'unterminated string' };
    units.push({
      header: header.startsWith(':') ? header.slice(1) : header,
      query: match[2] === '?',
      common: header.startsWith('*'),
      rooted: header.startsWith(':'),
      params: params.map((p) => p.trim()),
    });
  }
  return { ok: true, units };
}

interface PatternNode {
  long: string;
  short: string;
  optional: boolean;
  suffix: boolean;
}

export interface CompiledPattern {
  text: string;
  nodes: PatternNode[];
}

export function compilePattern(text: string): CompiledPattern {
  const nodes: PatternNode[] = [];
  const re = /(\[)?:?(\*?[A-Za-z]+)(#)?\]?/g;
  for (const m of text.matchAll(re)) {
    const name = m[2] as string;
    nodes.push({
      long: name.toUpperCase(),
      short: name.replace(/[a-z]/g, ''),
      optional: m[1] === '[',
      suffix: m[3] === '#',
    });
  }
  if (nodes.length === 0) throw new Error(`compilePattern: empty pattern "${text}"`);
  return { text, nodes };
}

/** Numeric suffixes by node short name (e.g. { SOUR: 2 }); absent when not written. */
export type Suffixes = Record<string, number>;

function matchFrom(nodes: PatternNode[], i: number, mnems: string[], j: number, out: Suffixes): boolean {
  if (i === nodes.length) return j === mnems.length;
  const node = nodes[i] as PatternNode;
  if (j < mnems.length) {
    const m = /^(\*?[A-Za-z_]+?)(\d+)?$/.exec(mnems[j] as string);
    if (m) {
      const word = (m[1] as string).toUpperCase();
      const digits = m[2];
      if ((word === node.long || word === node.short) && (digits === undefined || node.suffix)) {
        const saved = out[node.short];
        if (digits !== undefined) out[node.short] = Number(digits);
        if (matchFrom(nodes, i + 1, mnems, j + 1, out)) return true;
        if (saved === undefined) delete out[node.short];
        else out[node.short] = saved;
      }
    }
  }
  return node.optional && matchFrom(nodes, i + 1, mnems, j, out);
}

/** Matches header mnemonics (already split at `:`) against a pattern; returns suffixes or null. */
export function matchPattern(pattern: CompiledPattern, mnemonics: string[]): Suffixes | null {
  const out: Suffixes = {};
  return matchFrom(pattern.nodes, 0, mnemonics, 0, out) ? out : null;
}
