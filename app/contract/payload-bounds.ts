import { sanitiseText } from './excerpt.ts';

/**
 * Bounds on the shape of a call's payload, checked before any schema sees it:
 * nesting depth, array length and the number of values in all. No BenchApi
 * call needs more than a handful of levels (a plan inside the parameter list);
 * a 6000-deep array once blew the stack of the schema's error path. The walk
 * uses its own stack, so the check itself cannot overflow.
 */

/** Deepest nesting any call needs is about 5 (params → plan → settle → value). */
export const MAX_PAYLOAD_DEPTH = 16;
/** Longest array: an explicit point list of a sweep. */
export const MAX_PAYLOAD_ARRAY = 100_000;
/** Values (of any kind) in one payload. */
export const MAX_PAYLOAD_VALUES = 200_000;

export type BoundsResult = { ok: true } | { ok: false; message: string; field: string };

/** Checks `value` against the bounds; the refusal names the path where it stopped (e.g. `params.0.points`). */
export function checkPayloadBounds(value: unknown, root = 'params'): BoundsResult {
  const stack: { value: unknown; depth: number; path: string }[] = [{ value, depth: 0, path: root }];
  let count = 0;
  while (stack.length > 0) {
    const item = stack.pop() as { value: unknown; depth: number; path: string };
    count += 1;
    if (count > MAX_PAYLOAD_VALUES)
      return {
        ok: false,
        field: root,
        message: `${root}: too many values (at most ${MAX_PAYLOAD_VALUES} in one call)`,
      };
    const current = item.value;
    if (current === null || typeof current !== 'object') continue;
    if (ArrayBuffer.isView(current)) continue;
    if (item.depth >= MAX_PAYLOAD_DEPTH) {
      return {
        ok: false,
        field: item.path,
        message: `${item.path}: nested too deeply (at most ${MAX_PAYLOAD_DEPTH} levels)`,
      };
    }
    if (Array.isArray(current)) {
      if (current.length > MAX_PAYLOAD_ARRAY) {
        return {
          ok: false,
          field: item.path,
          message: `${item.path}: array too long (${current.length} items; at most ${MAX_PAYLOAD_ARRAY})`,
        };
      }
      for (let i = 0; i < current.length; i += 1)
        stack.push({ value: current[i], depth: item.depth + 1, path: `${item.path}.${i}` });
      continue;
    }
    const keys = Object.keys(current);
    if (keys.length > MAX_PAYLOAD_ARRAY)
      return { ok: false, field: item.path, message: `${item.path}: too many keys (at most ${MAX_PAYLOAD_ARRAY})` };
    for (const key of keys) {
      stack.push({
        value: (current as Record<string, unknown>)[key],
        depth: item.depth + 1,
        path: `${item.path}.${sanitiseText(key, 40)}`,
      });
    }
  }
  return { ok: true };
}
