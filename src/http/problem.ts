import { DomainError, type ProblemCode } from '../common/errors.js';

/** A {@link DomainError} thrown by the HTTP layer, with positional arguments for brevity in routes. */
export class ProblemError extends DomainError {
  override readonly name = 'ProblemError';
  constructor(code: ProblemCode, detail: string, pointer: string | null = null, headers: Record<string, string> = {}, extensions: Record<string, unknown> = {}) {
    super(code, detail, { pointer, headers, extensions });
  }
}
