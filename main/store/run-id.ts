/**
 * Run ids: `YYYYMMDD-HHMMSS-<dut slug>` from the run's UTC start time, e.g.
 * `20261202-014512-sensor-osc-a`. Every id that comes from outside (CLI, IPC,
 * a folder name) passes `runIdSchema`, so no id can name a path outside the
 * runs folder: no separators, no `..`, no control characters, never empty,
 * and it must start with a letter or digit (so never `.trash`).
 */
import { hasUnsafeChars } from '../../app/contract/excerpt.ts';
import { z } from 'zod';

const RUN_ID_PATTERN = /^[A-Za-z0-9][A-Za-z0-9_.-]{0,127}$/;

export const runIdSchema = z
  .string({ error: 'run id: expected a string' })
  .refine((id) => RUN_ID_PATTERN.test(id) && !id.includes('..'), {
    message:
      'run id: expected letters, digits, "-", "_" or "." (1–128 characters, starting with a letter or digit, no "..")',
  });

/** Throws a RangeError naming the problem when `id` is not a safe run id. */
export function assertRunId(id: unknown): string {
  const result = runIdSchema.safeParse(id);
  if (!result.success)
    throw new RangeError(`${result.error.issues[0]?.message ?? 'bad run id'}, got ${JSON.stringify(id)}`);
  return result.data;
}

/** A DUT id as the operator typed it: any text without control characters. */
export const dutIdSchema = z
  .string({ error: 'dut id: expected a string' })
  .trim()
  .min(1, 'dut id: must not be empty')
  .max(100, 'dut id: at most 100 characters')
  .refine((text) => !hasUnsafeChars(text), 'dut id: must not contain control or bidi-override characters');

/** Lower-case slug of a DUT id for the run id; `dut` when nothing is left. */
export function dutSlug(dutId: string): string {
  const slug = dutId
    .normalize('NFKD')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40)
    .replace(/-+$/, '');
  return slug === '' ? 'dut' : slug;
}

/** `YYYYMMDD-HHMMSS-slug` from an ISO-8601 time (UTC digits, so ids do not depend on the time zone). */
export function makeRunId(startedAtIso: string, dutId: string): string {
  const ms = Date.parse(startedAtIso);
  if (!Number.isFinite(ms))
    throw new RangeError(`startedAt: expected an ISO-8601 time, got ${JSON.stringify(startedAtIso)}`);
  const iso = new Date(ms).toISOString(); // 2026-12-02T01:45:12.000Z
  const stamp = `${iso.slice(0, 4)}${iso.slice(5, 7)}${iso.slice(8, 10)}-${iso.slice(11, 13)}${iso.slice(14, 16)}${iso.slice(17, 19)}`;
  return `${stamp}-${dutSlug(dutId)}`;
}
