/**
 * Building blocks of every file schema (bench, plans, profiles, DUT models):
 * objects that refuse unknown keys with a did-you-mean, and quantity fields
 * that speak the one grammar of si.ts. A misspelt key must never run a whole
 * sweep with a default in its place.
 */
import { z } from 'zod';
import {
  excerpt,
  parseQuantity,
  parseSiNumber,
  parseTime,
  QUANTITY_FORMS,
  TIME_FORMS,
  type Parsed,
  type QuantityKind,
} from './si.ts';

/** Edit distance (insert, delete, substitute, swap neighbours) — Damerau–Levenshtein, optimal string alignment. */
export function editDistance(a: string, b: string): number {
  const rows = a.length + 1;
  const cols = b.length + 1;
  const d: number[] = new Array<number>(rows * cols).fill(0);
  for (let i = 0; i < rows; i++) d[i * cols] = i;
  for (let j = 0; j < cols; j++) d[j] = j;
  for (let i = 1; i < rows; i++) {
    for (let j = 1; j < cols; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let best = Math.min(
        (d[(i - 1) * cols + j] as number) + 1,
        (d[i * cols + j - 1] as number) + 1,
        (d[(i - 1) * cols + j - 1] as number) + cost,
      );
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1])
        best = Math.min(best, (d[(i - 2) * cols + j - 2] as number) + 1);
      d[i * cols + j] = best;
    }
  }
  return d[rows * cols - 1] as number;
}

/** The known key closest to `key`, when it is close enough to be a slip of the keyboard. */
export function nearestKey(key: string, known: readonly string[]): string | null {
  let best: string | null = null;
  let bestDistance = Infinity;
  for (const candidate of known) {
    const distance = editDistance(key.toLowerCase(), candidate.toLowerCase());
    if (distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  const allowed = Math.max(2, Math.floor(key.length / 3));
  return best !== null && bestDistance <= allowed ? best : null;
}

/** "unknown key "x" (did you mean "y"?)" for each key, then the keys this object takes. */
export function unknownKeysMessage(keys: readonly string[], known: readonly string[]): string {
  const parts = keys.slice(0, 5).map((key) => {
    const near = nearestKey(key, known);
    return `unknown key ${excerpt(key)}${near === null ? '' : ` (did you mean "${near}"?)`}`;
  });
  if (keys.length > 5) parts.push(`and ${keys.length - 5} more unknown keys`);
  return `${parts.join('; ')}; this object takes: ${known.filter((k) => k !== '$schema').join(', ')}`;
}

/** z.strictObject whose unknown-key error names the nearest known key. */
export function strictObject<S extends z.core.$ZodLooseShape>(shape: S) {
  const known = Object.keys(shape);
  return z.strictObject(shape, {
    error: (issue) => (issue.code === 'unrecognized_keys' ? unknownKeysMessage(issue.keys, known) : undefined),
  });
}

/** Optional `"$schema"` key at the top of a file, so an editor can validate and complete it. */
export const schemaRef = z
  .string()
  .max(2000)
  .optional()
  .meta({ description: "URL or path of this file's JSON Schema, for editors; ignored by tunebench" });

function textOrNumber(forms: string) {
  return z.union([z.number(), z.string()], {
    error: (issue) =>
      issue.input === undefined ? `required: ${forms}` : `expected ${forms}, got ${excerpt(issue.input)}`,
  });
}

function fromParsed(parse: (text: string) => Parsed) {
  return (value: number | string, ctx: z.core.$RefinementCtx<number | string>): number => {
    if (typeof value === 'number') return value;
    const parsed = parse(value);
    if (!parsed.ok) {
      ctx.addIssue({ code: 'custom', message: parsed.error });
      return z.NEVER;
    }
    return parsed.value;
  };
}

/** A finite number in volts, amps or hertz, or a string with an SI prefix and optionally its unit. */
export function quantity(kind: QuantityKind, bound: (n: z.ZodNumber) => z.ZodNumber = (n) => n) {
  return textOrNumber(QUANTITY_FORMS[kind])
    .transform(fromParsed((text) => parseQuantity(text, kind)))
    .pipe(bound(z.number().finite()))
    .meta({ 'x-quantity': kind });
}

/** A number, or text with an SI prefix and optionally the unit V, A or Hz (for fields of no single quantity). */
export function anyQuantity() {
  const forms = 'a number, optionally with an SI prefix and unit (e.g. 0.25, "250m", "3.3V", "10MHz")';
  return textOrNumber(forms)
    .transform(
      fromParsed((text) => {
        const value = parseSiNumber(text);
        return value === null ? { ok: false, error: `expected ${forms}, got ${excerpt(text)}` } : { ok: true, value };
      }),
    )
    .pipe(z.number().finite());
}

/** A time in seconds: a number, or a string with its unit ("100ms", "90s", "15min", "8h"). */
export function time(bound: (n: z.ZodNumber) => z.ZodNumber = (n) => n) {
  return textOrNumber(TIME_FORMS)
    .transform(fromParsed(parseTime))
    .pipe(bound(z.number().finite().nonnegative('a time cannot be negative')))
    .meta({ 'x-quantity': 'time' });
}

/** Turns a zod error into one line per field: `limits.maxControlV: expected …`. */
export function describeIssues(error: z.ZodError): string {
  return error.issues
    .slice(0, 20)
    .map((issue) => `${issue.path.length > 0 ? issue.path.join('.') : '(root)'}: ${issue.message}`)
    .concat(error.issues.length > 20 ? [`… and ${error.issues.length - 20} more problems`] : [])
    .join('\n');
}
