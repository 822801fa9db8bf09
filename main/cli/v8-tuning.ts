/**
 * The launcher (main/bin/cli-bundle.mjs, START_FLAGS) starts the prebuilt
 * CLI with V8 set for a short command: the young generation kept at its
 * first size and no optimising compiler. A command with big work ahead (a
 * long recording, a large file to analyse) puts V8's own settings back, which
 * such work runs faster with. Harmless when the launcher did not set them
 * (tests, the sources through tsx).
 */
import { setFlagsFromString } from 'node:v8';

/**
 * Rows of input above which `analyze` tunes V8 for big work. Measured on a
 * 2-core machine: up to 20,000 rows the analysis still ran faster without
 * the optimising compiler; at 1,000,000 it needs it.
 */
export const BIG_INPUT_ROWS = 20_000;

/** V8's own settings (BIG_WORK_FLAGS in main/bin/cli-bundle.mjs). */
export function tuneForBigWork(): void {
  setFlagsFromString('--semi-space-growth-factor=2 --max-opt=999');
}
