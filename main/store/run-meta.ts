/**
 * run.json (CONTRACTS.md "Run folder"): schema `tunebench.run/1`. Read with a
 * schema so a hand-edited or foreign file gives an error naming the field;
 * unknown keys are kept (the contract lets later versions add fields).
 */
import { join } from 'node:path';
import { z } from 'zod';
import type { RunMeta } from '../../app/contract/bench-api.ts';
import { RUN_SCHEMA, runMetaSchema } from '../../app/contract/run-meta-schema.ts';
import { writeTextAtomic } from './atomic-json.ts';
import { isOutOfSpace, rewriteInPlace, runJsonText } from './run-json-space.ts';
import { type StoreFs } from './store-fs.ts';

export { RUN_SCHEMA, runMetaSchema };
export const RUN_JSON = 'run.json';
export const SAMPLES_CSV = 'samples.csv';
export const EVENTS_JSONL = 'events.jsonl';

/** A run.json that is missing or does not match the schema. */
export class RunFormatError extends Error {
  override name = 'RunFormatError';
}

function describeIssue(issue: z.core.$ZodIssue): string {
  const field = issue.path.length > 0 ? issue.path.join('.') : '(top level)';
  return `${field}: ${issue.message}`;
}

/** Parses run.json text; throws RunFormatError naming the file and field. */
export function parseRunMeta(text: string, source: string): RunMeta {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    throw new RunFormatError(`${source}: not valid JSON (${(error as Error).message})`);
  }
  const result = runMetaSchema.safeParse(raw);
  if (!result.success) {
    throw new RunFormatError(`${source}: ${result.error.issues.map(describeIssue).join('; ')}`);
  }
  return result.data;
}

export async function readRunMeta(fs: StoreFs, dir: string): Promise<RunMeta> {
  const path = join(dir, RUN_JSON);
  let text: string;
  try {
    text = await fs.readFile(path);
  } catch (error) {
    throw new RunFormatError(`${path}: cannot read (${(error as Error).message})`);
  }
  return parseRunMeta(text, path);
}

/**
 * Replaces run.json atomically; a running run's file keeps blocks in reserve (run-json-space.ts). Only when
 * the disk is too full for the atomic rewrite is the text written in place into those blocks.
 */
export async function writeRunMeta(fs: StoreFs, dir: string, meta: RunMeta): Promise<void> {
  const path = join(dir, RUN_JSON);
  try {
    await writeTextAtomic(fs, path, runJsonText(meta));
  } catch (error) {
    if (!isOutOfSpace(error)) throw error;
    const written = await rewriteInPlace(fs, path, meta).catch(() => false);
    if (!written) throw error;
  }
}
