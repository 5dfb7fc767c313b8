/**
 * The one registry of problem codes. Each becomes the RFC 9457 `type` `/problems/<code>`, which the
 * service itself serves as documentation (GET /problems/<code>). A test checks that every code is
 * documented in docs/problems.md and that the HTTP layer emits no code missing here.
 */
export const PROBLEMS = {
  'invalid-request': { status: 400, title: 'The request is malformed', about: 'The body or query does not match the schema; `pointer` names the first offending field.' },
  'invalid-signal': {
    status: 422,
    title: 'The signal cannot be used',
    about: 'Ragged rows, too few samples, duplicate channel names, a bad sampling rate or non-finite samples; `pointer` says where.',
  },
  'invalid-recipe': { status: 422, title: 'The recipe is invalid', about: 'An unknown or misspelt setting, a value out of range or a contradiction between settings; `pointer` names the field.' },
  'recipe-unfit': {
    status: 422,
    title: 'The recipe does not fit the signal',
    about: 'Segments longer than the epoch, bands above Nyquist or narrower than the resolution, fftLength shorter than a segment.',
  },
  'non-finite': {
    status: 422,
    title: 'The signal holds non-finite samples',
    about: 'An epoch contains NaN or ±Inf; the recipe can set "nonFinite": "skip-epoch" (leave those epochs out) or "bad-span" (leave out the Welch segments or cut epochs that overlap a gap).',
  },
  'no-usable-epochs': { status: 422, title: 'No epoch is left to analyze', about: 'Every epoch was left out (for example, all hold non-finite samples).' },
  'limit-exceeded': { status: 422, title: 'A size limit of this server is exceeded', about: 'Too many channels, epochs, samples or too long an FFT; limits are configuration.' },
  'payload-too-large': {
    status: 413,
    title: 'The body is too large',
    about: 'The request body exceeds BODY_LIMIT_BYTES; large recordings go in parts through the resumable upload (POST /v1/uploads).',
  },
  'unsupported-media-type': {
    status: 415,
    title: 'The content type is not supported',
    about: 'The route does not read this content type; `accepted` lists the ones it does (application/json, and application/octet-stream for binary uploads).',
  },
  'upload-not-found': { status: 404, title: 'Upload not found', about: 'No resumable upload with this id (it may have completed or been abandoned).' },
  'hash-mismatch': { status: 422, title: 'The content hash does not match', about: 'The joined parts do not have the SHA-256 announced; nothing was stored.' },
  'source-refused': {
    status: 422,
    title: 'The source is not allowed',
    about: 'File imports need DATA_ROOT and a path inside it; URL imports need an allow-listed host that is not a private address (unless FETCH_ALLOW_PRIVATE).',
  },
  'source-not-found': { status: 404, title: 'The source does not exist', about: 'No such file under DATA_ROOT.' },
  'source-failed': { status: 502, title: 'The source could not be read', about: 'The remote server answered an error, timed out or closed the connection.' },
  'signal-not-found': { status: 404, title: 'Signal not found', about: 'No signal with this id is stored.' },
  'recipe-not-found': { status: 404, title: 'Recipe not found', about: 'No pinned recipe with this id.' },
  'job-not-found': { status: 404, title: 'Job not found', about: 'No job with this id.' },
  'job-finished': { status: 409, title: 'The job has already finished', about: 'Only queued or running jobs can be canceled.' },
  'study-not-found': { status: 404, title: 'Study not found', about: "No study with this id (another tenant's study answers the same)." },
  'entry-not-found': { status: 404, title: 'Study entry not found', about: 'The study has no entry with this id.' },
  'run-not-found': { status: 404, title: 'Study run not found', about: 'The study has no run with this id.' },
  'run-finished': { status: 409, title: 'The run has already finished', about: 'Only a run with queued or running entries can be canceled.' },
  'invalid-manifest': {
    status: 422,
    title: 'The entries or manifest are refused',
    about: 'An unknown signal or upload, a duplicate entry, a bad metadata key, a missing column or a value of the wrong type; `row` and `column` (and `pointer`) say where. Nothing was added.',
  },
  'attachment-not-found': { status: 404, title: 'Attachment not found', about: 'The record lists no binary attachment of that name.' },
  'unknown-plot-kind': { status: 404, title: 'No such plot kind', about: 'The plot route names a kind that does not exist; `allowed` lists the kinds.' },
  'plot-not-applicable': {
    status: 422,
    title: 'The plot does not fit the record',
    about: "The record's method has no plot of this kind (for example a time–frequency plot of a Welch record); `allowed` lists the kinds it has.",
  },
  'unknown-channel': { status: 400, title: 'Unknown channel', about: "A channel named in the query is not in the record; `channels` lists the record's channels." },
  'table-level-unavailable': {
    status: 422,
    title: 'The record cannot give this table level',
    about:
      'Each kind of record gives some levels (spectra: bands, ratios, features, spectra, quality; time–frequency: summary; connectivity: pair-bands, pair-spectra); `levels` lists those this record gives.',
  },
  'not-acceptable': {
    status: 406,
    title: 'No acceptable representation',
    about: 'The Accept header allows none of the formats this route gives; `formats` lists them (a `format` query parameter also chooses).',
  },
  'record-not-ready': { status: 409, title: 'The record is not ready', about: 'The job has not succeeded (yet); poll the job.' },
  unauthenticated: { status: 401, title: 'Authentication required', about: 'Send a valid API key as "Authorization: Bearer <key>".' },
  forbidden: { status: 403, title: 'Not allowed for this key', about: "The key's role (read, submit, admin) does not cover this route." },
  'storage-full': {
    status: 507,
    title: 'The store is full',
    about: 'Storing this signal, or keeping this part of a resumable upload, would exceed MAX_STORE_BYTES; nothing was stored and nothing else was removed.',
  },
  'not-found': { status: 404, title: 'Not found', about: 'No route matches.' },
  'method-not-allowed': { status: 405, title: 'Method not allowed', about: 'The route exists but not with this method; the Allow header lists the methods it has.' },
  'request-timeout': { status: 408, title: 'The request took too long', about: 'The request did not arrive within REQUEST_TIMEOUT_MS; the connection is closed.' },
  'uri-too-long': { status: 414, title: 'The URL is too long', about: 'A path segment or the whole URL is longer than this server reads; ids are short, and long selections go in a JSON body.' },
  'headers-too-large': { status: 431, title: 'The request headers are too large', about: 'The request line and headers together exceed what this server reads (16 KiB by default).' },
  'rate-limited': { status: 429, title: 'Too many requests', about: 'Slow down; Retry-After says when.' },
  'queue-unavailable': {
    status: 503,
    title: 'The job queue is unavailable',
    about: 'Redis (the queue, and the store in distributed mode) cannot be reached; nothing was changed; Retry-After says when to try again.',
  },
  'worker-crashed': { status: 500, title: 'The computation failed', about: 'A worker failed for a reason outside the input after every retry.' },
  internal: { status: 500, title: 'Internal error', about: 'An unexpected fault; the request id in the body helps the operator find it in the logs.' },
} as const satisfies Record<string, { status: number; title: string; about: string }>;

export type ProblemCode = keyof typeof PROBLEMS;

export function problemType(code: ProblemCode): string {
  return `/problems/${code}`;
}

/** Options of a {@link DomainError}. */
export interface DomainErrorOptions {
  /** RFC 6901 JSON pointer of the offending input, relative to where the thrower sees it */
  pointer?: string | null;
  /** further problem members (RFC 9457 extensions), e.g. `{ allowed: [...] }` */
  extensions?: Record<string, unknown>;
  /** extra response headers (e.g. Retry-After) */
  headers?: Record<string, string>;
  cause?: unknown;
}

/**
 * The one error type of the domain: a registered problem code, a detail in words and, where there
 * is one, the JSON pointer of the input at fault. Every layer above the numerical core throws it;
 * HTTP and the queues translate it to RFC 9457 the same way. A caller that knows where the thrower's
 * input sat in a larger document prefixes the pointer with {@link DomainError.under}.
 */
export class DomainError extends Error {
  override readonly name: string = 'DomainError';
  readonly pointer: string | null;
  readonly extensions: Record<string, unknown>;
  readonly headers: Record<string, string>;
  constructor(
    readonly code: ProblemCode,
    readonly detail: string,
    options: DomainErrorOptions = {},
  ) {
    super(detail, options.cause === undefined ? undefined : { cause: options.cause });
    this.pointer = options.pointer ?? null;
    this.extensions = options.extensions ?? {};
    this.headers = options.headers ?? {};
  }

  get status(): number {
    return PROBLEMS[this.code].status;
  }

  /** The same error located inside a larger document: `prefix` + this pointer. */
  under(prefix: string): DomainError {
    if (this.pointer === null || prefix === '') return this;
    const pointer = this.pointer === '/' ? prefix : prefix + this.pointer;
    return new DomainError(this.code, this.detail, { pointer, extensions: this.extensions, headers: this.headers, cause: this.cause });
  }
}

/** RFC 9457 problem details as the service sends them and as a failed job keeps them. */
export interface Problem {
  type: string;
  title: string;
  status: number;
  detail: string;
  /** RFC 6901 JSON pointer of the offending input */
  pointer?: string;
  [extension: string]: unknown;
}

/** A problem ready to answer: body, HTTP status and response headers. */
export interface Translated {
  problem: Problem;
  status: number;
  headers: Record<string, string>;
}

function unexpected(): DomainError {
  return new DomainError('internal', 'an unexpected error occurred; quote the requestId to the operator');
}

/**
 * The one translation of an error into a problem, used by the HTTP error handler and by both
 * queues. A {@link DomainError} carries everything; any other error is first handed to `classify`
 * (the caller's knowledge of its own foreign errors: fastify's, Redis's, a crashed thread's) and
 * otherwise becomes `internal`, with no internals in the detail.
 */
export function toProblem(error: unknown, classify: (error: unknown) => DomainError | null = () => null): Translated {
  const domain = error instanceof DomainError ? error : (classify(error) ?? unexpected());
  const entry = PROBLEMS[domain.code];
  const problem: Problem = {
    ...domain.extensions,
    type: problemType(domain.code),
    title: entry.title,
    status: entry.status,
    detail: domain.detail,
    ...(domain.pointer ? { pointer: domain.pointer } : {}),
  };
  return { problem, status: entry.status, headers: { ...domain.headers } };
}

/**
 * Runs `work` (synchronous or not) and locates any domain error it throws under `prefix`, e.g.
 * `/recipe` for a recipe that sat there in the request.
 */
export function locatedUnder<T>(prefix: string, work: () => T): T {
  const relocate = (error: unknown): never => {
    throw error instanceof DomainError ? error.under(prefix) : error;
  };
  try {
    const result = work();
    return (result instanceof Promise ? result.catch(relocate) : result) as T;
  } catch (error) {
    return relocate(error);
  }
}
