/**
 * The launcher (main/bin/cli-bundle.mjs) starts the prebuilt CLI with V8's
 * young generation kept at its first size, so a short command stays in the
 * memory it has already touched. A command with big work ahead (a long
 * recording, a large file to analyse) puts V8's own growth back, which
 * allocation-heavy work runs faster with. Harmless when the launcher did
 * not set it (tests, the sources through tsx).
 */
import { setFlagsFromString } from 'node:v8';

/** Rows of input above which `analyze` lets the young generation grow. */
export const BIG_INPUT_ROWS = 20_000;

/** V8's default (the same string as GROWING_FLAGS in main/bin/cli-bundle.mjs). */
export function letYoungGenerationGrow(): void {
  setFlagsFromString('--semi-space-growth-factor=2');
}
