import { DomainError } from '../common/errors.js';

/** A job that cannot be computed for a reason in its input; never retried. */
export class EngineInputError extends DomainError {
  override readonly name = 'EngineInputError';
  constructor(code: 'no-usable-epochs' | 'non-finite', message: string, pointer: string | null = null) {
    super(code, message, { pointer });
  }
}
