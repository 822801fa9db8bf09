/**
 * Shape of one `tunebench` sub-command. Each lives in its own module
 * (cmd-<name>.ts) and is registered, with its one-line summary, in
 * ./commands.ts.
 *
 * Exit codes (CONTRACTS.md): 0 done; 1 the work failed; 2 bad input, with a
 * message naming the field and the expected form. Never a stack trace for a
 * user error: throw UsageError and the dispatcher prints its message.
 */
import type { Writable } from 'node:stream';

export interface CliIo {
  stdout: Pick<Writable, 'write'> & { isTTY?: boolean };
  stderr: Pick<Writable, 'write'> & { isTTY?: boolean };
  env: Record<string, string | undefined>;
  /** Aborted on SIGINT/SIGTERM (a clean stop for long procedures). */
  signal?: AbortSignal;
}

export interface CliCommand {
  name: string;
  /** Full usage text for `tunebench <name> --help`. */
  usage: string;
  run(argv: string[], io: CliIo): Promise<number>;
}

/** A user error: bad flag, file or config. Exit code 2, message only. */
export class UsageError extends Error {
  override name = 'UsageError';
}

/** The work failed (instrument fault, whole range stalled…). Exit code 1. */
export class WorkFailedError extends Error {
  override name = 'WorkFailedError';
}
