/**
 * JSON text from a user's file, parsed only when it is shaped like a
 * configuration file: bounded in size, nesting depth and array length.
 * Without these bounds a plan nested 10,000 deep overflowed the stack in
 * the schema check and a million-element array was echoed whole in an
 * error. Pure; used for bench, plan, profile and DUT files.
 */
import { MAX_PLAN_POINTS } from './plans.ts';

export const JSON_LIMITS = {
  /** Largest file, bytes (characters): a 100,000-point plan is about 1 MB. */
  maxChars: 8 * 1024 * 1024,
  /** Deepest nesting of objects and arrays; real files need 4. */
  maxDepth: 32,
  /** Longest array; the longest legitimate one is an explicit sweep point list. */
  maxArrayLength: MAX_PLAN_POINTS,
} as const;

export class JsonShapeError extends Error {
  override readonly name = 'JsonShapeError';
}

/** Depth of the deepest `{`/`[` outside strings, found by a scan that needs no recursion; stops past `limit`. */
function nestingBeyond(text: string, limit: number): number | null {
  let depth = 0;
  let inString = false;
  let line = 1;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10) line++;
    if (inString) {
      if (c === 92)
        i++; // backslash: skip the escaped character
      else if (c === 34) inString = false;
    } else if (c === 34) inString = true;
    else if (c === 123 || c === 91) {
      if (++depth > limit) return line;
    } else if (c === 125 || c === 93) depth--;
  }
  return null;
}

/** The path of the first array longer than `limit`, walked with an explicit stack. */
function longArray(value: unknown, limit: number): { path: string; length: number } | null {
  const stack: { value: unknown; path: string }[] = [{ value, path: '' }];
  while (stack.length > 0) {
    const item = stack.pop() as { value: unknown; path: string };
    if (Array.isArray(item.value)) {
      if (item.value.length > limit) return { path: item.path || '(root)', length: item.value.length };
      item.value.forEach((child, i) => stack.push({ value: child, path: `${item.path}[${i}]` }));
    } else if (item.value !== null && typeof item.value === 'object') {
      for (const [key, child] of Object.entries(item.value))
        stack.push({ value: child, path: item.path ? `${item.path}.${key}` : key });
    }
  }
  return null;
}

/** Parses `text` as JSON within JSON_LIMITS; JsonShapeError names what is out of bounds. */
export function parseBoundedJson(text: string, limits: typeof JSON_LIMITS = JSON_LIMITS): unknown {
  if (text.length > limits.maxChars)
    throw new JsonShapeError(
      `${text.length} characters is larger than a configuration file can be (at most ${limits.maxChars})`,
    );
  const deepLine = nestingBeyond(text, limits.maxDepth);
  if (deepLine !== null) throw new JsonShapeError(`nested more than ${limits.maxDepth} levels deep (line ${deepLine})`);
  let value: unknown;
  try {
    value = JSON.parse(text) as unknown;
  } catch (error) {
    throw new JsonShapeError(`not valid JSON (${(error as Error).message.slice(0, 200)})`);
  }
  const long = longArray(value, limits.maxArrayLength);
  if (long !== null)
    throw new JsonShapeError(
      `${long.path}: an array of ${long.length} values is longer than any field takes (at most ${limits.maxArrayLength})`,
    );
  return value;
}
