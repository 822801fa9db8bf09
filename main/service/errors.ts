/**
 * Errors the BenchApi service throws on purpose. Their message goes to the
 * renderer as is (the wire's `error.message`), with `field` when one input
 * was at fault; anything else is reported by message only, never a stack.
 */
export class BenchApiError extends Error {
  override name = 'BenchApiError';
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}
