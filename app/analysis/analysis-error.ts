/**
 * An analysis that cannot give an answer from the data it was given. `workFailed`
 * separates "the measurement shows a failure" (e.g. stall over the whole range:
 * exit 1 on the CLI) from "the data is unusable" (exit 2).
 */
export class AnalysisError extends Error {
  override name = 'AnalysisError';
  constructor(
    message: string,
    readonly workFailed = false,
  ) {
    super(message);
  }
}
