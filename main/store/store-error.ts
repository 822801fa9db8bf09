/** A store operation refused for a reason the user can act on. */
export type StoreErrorReason = 'not-found' | 'exists' | 'busy' | 'bad-input' | 'bad-state';

export class StoreError extends Error {
  override name = 'StoreError';
  constructor(
    message: string,
    readonly reason: StoreErrorReason,
  ) {
    super(message);
  }
}

/** A run file could not be written. The message names the file and the OS error (ENOSPC, EIO, EROFS…). */
export class DiskError extends Error {
  override name = 'DiskError';
  constructor(
    readonly path: string,
    /** The OS error code, when the system gave one. */
    readonly osCode: string | undefined,
    detail: string,
    options?: ErrorOptions,
  ) {
    super(`cannot write ${path}: ${detail}`, options);
    // Callers that branch on an fs error's code (ENOENT: the folder has gone) see the same code through it.
    if (osCode !== undefined) this.code = osCode;
  }

  readonly code: string | undefined;
}

/** The run folder disappeared while the run was recording (deleted, or its disk unmounted). */
export class RunFolderGoneError extends Error {
  override name = 'RunFolderGoneError';
  constructor(readonly dir: string) {
    super(`the run folder ${dir} has gone (deleted or unmounted while recording); the run was stopped there`);
  }
}

/** A fault of the run's own files that no retry will mend while the run goes on: it must stop the run. */
export function isRunFileFault(error: unknown): boolean {
  return error instanceof RunFolderGoneError || error instanceof DiskError;
}
