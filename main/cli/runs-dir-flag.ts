/**
 * The runs folder a command works in: `--runs`, else TUNEBENCH_RUNS, else
 * the user data folder. Its own module so the commands that only read runs
 * (analyze, datasheet) load none of the bench set-up in run-setup.ts.
 */
import { homedir } from 'node:os';
import { resolveRunsDir } from '../store/runs-dir.ts';
import type { CliIo } from './types.ts';

export function runsDirFrom(flag: string | undefined, io: CliIo): string {
  return resolveRunsDir(flag, io.env, process.platform, homedir());
}
