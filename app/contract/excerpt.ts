/**
 * Short, safe pictures of untrusted values for error messages. An error that
 * echoes what a caller, a file or an instrument sent shows at most a few dozen
 * characters of it, with control and bidi-override characters escaped, and
 * never walks a deep structure (a 6000-deep array must not cost a stack).
 */

/** C0/C1 controls, DEL, and the bidi overrides/isolates that can reorder a terminal line. */
const UNSAFE_CHARS = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

/** Escapes control and bidi characters as \uXXXX and cuts the text to `max` characters (… marks a cut). */
export function sanitiseText(text: string, max = 60): string {
  const cut = text.length > max ? text.slice(0, max) : text;
  const escaped = cut.replace(UNSAFE_CHARS, (ch) => `\\u${ch.charCodeAt(0).toString(16).padStart(4, '0')}`);
  return text.length > max ? `${escaped}…` : escaped;
}

/** DEL, C1 controls and bidi characters: valid raw in JSON, but they garble a terminal. */
const TERMINAL_UNSAFE_IN_JSON = /[\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;

/** JSON text with those characters written as \uXXXX escapes: the same JSON value, safe to print. */
export function terminalSafeJson(json: string): string {
  return json.replace(TERMINAL_UNSAFE_IN_JSON, (ch) => `\\u${ch.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/** True when `text` holds a control (other than those allowed) or bidi-override character. */
export function hasUnsafeChars(text: string, allowed = ''): boolean {
  for (const match of text.matchAll(UNSAFE_CHARS)) if (!allowed.includes(match[0])) return true;
  return false;
}

/**
 * A bounded description of any value: strings quoted and cut, numbers and
 * booleans as written, arrays and objects by their kind and size only.
 * Never recursive, never throws.
 */
export function excerptOf(value: unknown, max = 40): string {
  if (typeof value === 'string') return `"${sanitiseText(value, max)}"`;
  if (typeof value === 'number' || typeof value === 'boolean' || typeof value === 'bigint')
    return sanitiseText(String(value), max);
  if (value === null) return 'null';
  if (value === undefined) return 'nothing';
  if (Array.isArray(value)) return `an array of ${value.length}`;
  if (typeof value === 'object') return 'an object';
  return `a ${typeof value}`;
}
