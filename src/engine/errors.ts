/** A job that cannot be computed for a reason in its input; never retried. */
export class EngineInputError extends Error {
  override readonly name = 'EngineInputError';
  constructor(
    readonly code: 'no-usable-epochs' | 'non-finite',
    message: string,
    readonly pointer: string | null = null,
  ) {
    super(message);
  }
}
