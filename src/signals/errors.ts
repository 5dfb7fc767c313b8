import { DomainError } from '../common/errors.js';

export type SignalErrorKind = 'shape' | 'non-finite' | 'limit' | 'sampling-rate' | 'channels' | 'format';

/**
 * A problem with an uploaded signal, located by an RFC 6901 JSON pointer into the request body
 * (for JSON input) or a descriptive location such as `/query/channels` (for binary input). A size
 * limit is `limit-exceeded`, anything else `invalid-signal`, wherever it is found (upload or worker).
 */
export class SignalInputError extends DomainError {
  override readonly name = 'SignalInputError';
  constructor(
    readonly kind: SignalErrorKind,
    message: string,
    pointer: string | null = null,
    extensions?: Record<string, unknown>,
  ) {
    super(kind === 'limit' ? 'limit-exceeded' : 'invalid-signal', message, { pointer, ...(extensions ? { extensions } : {}) });
  }
}
