/**
 * The launcher (main/bin/cli-bundle.mjs, START_FLAGS) starts the prebuilt
 * CLI with V8 set for a short command: the young generation kept at its
 * first size. A command with big work ahead (a long recording, a large file
 * to analyse) puts V8's own setting back, which allocation-heavy work runs
 * faster with (a 1,000,000-point analysis took some 15 % more CPU time
 * without it, measured under load). Harmless when the launcher did not set
 * it (tests, the sources through tsx).
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

/**
 * For a big analysis: V8 makes a long loop's optimised code (on-stack
 * replacement) at once on the main thread instead of in the background. The
 * analysis is a chain of loops over a million points, most run once; a loop
 * went on in the interpreter while its optimised code was made beside it,
 * and on a busy machine that took most of the loop (1e6 distinct voltages:
 * 2.7 → 2.5 s CPU at load 4). Of V8's compile settings only this one still
 * acts once V8 has started. The launcher's START_FLAGS set it back before
 * the code cache is written (V8 keys the cache to its flags).
 */
export function compileLongLoopsAtOnce(): void {
  setFlagsFromString('--no-concurrent-osr');
}
