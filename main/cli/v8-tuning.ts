/**
 * The launcher (main/bin/cli-bundle.mjs, START_FLAGS) starts the prebuilt
 * CLI with V8 set for a short command: the young generation kept at its
 * first size. A command with big work ahead (a long recording, a large file
 * to analyse) puts V8's own setting back, which allocation-heavy work runs
 * faster with (a 1,000,000-point analysis took some 15 % more CPU time
 * without it, measured under load). Harmless when the launcher did not set it
 * (tests, the sources through tsx).
 */
import { setFlagsFromString } from 'node:v8';

/**
 * Size of a plain CSV above which `analyze` tunes V8 for big work before it
 * reads the file (about 50,000 rows; parsing a big file is much of the work).
 */
export const BIG_INPUT_BYTES = 1 << 20;

/** V8's own setting (BIG_WORK_FLAGS in main/bin/cli-bundle.mjs). */
export function tuneForBigWork(): void {
  setFlagsFromString('--semi-space-growth-factor=2');
}
