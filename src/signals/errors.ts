/**
 * A problem with an uploaded signal, located by an RFC 6901 JSON pointer into the request body
 * (for JSON input) or a descriptive location such as `/query/channels` (for binary input).
 * The HTTP layer turns it into a problem+json 4xx; the signals layer stays free of HTTP.
 */
export class SignalInputError extends Error {
  override readonly name = 'SignalInputError';
  constructor(
    readonly code: 'shape' | 'non-finite' | 'limit' | 'sampling-rate' | 'channels' | 'format',
    message: string,
    readonly pointer: string | null = null,
  ) {
    super(message);
  }
}
