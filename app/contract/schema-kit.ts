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
import { nearestKey } from './nearest-key.ts';

export { editDistance, nearestKey } from './nearest-key.ts';

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
