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
