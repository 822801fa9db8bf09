/** File names of a run folder and run.json parsing, shared by the page's writer, store and zip. */
import type { RunMeta } from '../../contract/bench-api.ts';
import { runMetaSchema } from '../../contract/run-meta-schema.ts';

export const PAGE_FILES = { meta: 'run.json', samples: 'samples.csv', events: 'events.jsonl' } as const;
/** Deleted runs wait here until restored (as `<runs>/.trash/<id>` on the desktop). */
export const TRASH_DIR = '.trash';

/** run.json text → RunMeta; the error names the run and the field. */
export function parseStoredMeta(text: string, source: string): RunMeta {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    throw new Error(`${source}/run.json: not valid JSON (${(error as Error).message})`);
  }
  const result = runMetaSchema.safeParse(raw);
  if (!result.success) {
    const issue = result.error.issues[0];
    throw new Error(`${source}/run.json: ${issue ? `${issue.path.join('.') || '(top level)'}: ${issue.message}` : ''}`);
  }
  return result.data;
}
