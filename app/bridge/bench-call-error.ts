/** A BenchApi call that failed; `field` names the offending input when a schema rejected it. */
export class BenchCallError extends Error {
  readonly method: string;
  readonly field: string | undefined;
  /** True when the call failed because the link to main dropped, not because main refused it. */
  readonly linkLost: boolean;

  constructor(method: string, message: string, options: { field?: string; linkLost?: boolean } = {}) {
    // Main may already have named the field in its message; name it once.
    super(options.field && !message.startsWith(`${options.field}:`) ? `${options.field}: ${message}` : message);
    this.name = 'BenchCallError';
    this.method = method;
    this.field = options.field;
    this.linkLost = options.linkLost ?? false;
  }
}

/** One line for the screen, whatever was thrown. */
export function errorText(error: unknown): string {
  if (error instanceof Error) return error.message;
  return String(error);
}
