import { PROBLEMS, problemType, type ProblemCode } from '../common/errors.js';

/** An error the HTTP layer answers as RFC 9457 problem+json. */
export class ProblemError extends Error {
  override readonly name = 'ProblemError';
  constructor(
    readonly code: ProblemCode,
    readonly detail: string,
    readonly pointer: string | null = null,
    readonly headers: Record<string, string> = {},
    readonly extra: Record<string, unknown> = {},
  ) {
    super(detail);
  }
}

export interface ProblemBody {
  type: string;
  title: string;
  status: number;
  detail: string;
  instance?: string;
  pointer?: string;
  requestId?: string;
  [extension: string]: unknown;
}

export function problemBody(code: ProblemCode, detail: string, pointer: string | null, requestId: string, extra: Record<string, unknown> = {}): ProblemBody {
  const entry = PROBLEMS[code];
  return {
    type: problemType(code),
    title: entry.title,
    status: entry.status,
    detail,
    ...(pointer ? { pointer } : {}),
    requestId,
    ...extra,
  };
}
