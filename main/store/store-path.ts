/**
 * Paths on the store's file system (the machine's own: node:path). Code
 * above the store builds folder and file paths through here, so procedures
 * import no Node built-in themselves, and run-id.ts stays free of Node for
 * the web edition's page (which has its own store and never loads this).
 */
import { join } from 'node:path';
import { assertRunId } from './run-id.ts';

export { join as joinPath, resolve as resolvePath } from 'node:path';

/** The folder of run `id` inside `runsDir`, after validating the id. */
export function runFolder(runsDir: string, id: unknown): string {
  return join(runsDir, assertRunId(id));
}
