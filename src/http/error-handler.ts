import type { FastifyError, FastifyReply, FastifyRequest } from 'fastify';
import { hasZodFastifySchemaValidationErrors } from 'fastify-type-provider-zod';
import { DomainError, type ProblemCode } from '../common/errors.js';
import { RecipeInputError } from '../recipes/errors.js';
import { SignalInputError } from '../signals/errors.js';
import { StorageFullError } from '../stores/store.js';
import { problemBody, ProblemError } from './problem.js';

declare module 'fastify' {
  interface FastifyContextConfig {
    /** problem code for schema violations of this route's body (default invalid-request) */
    bodyProblem?: ProblemCode;
    /** JSON pointer prefix of the recipe inside this route's body */
    recipePointer?: string;
    /** JSON pointer prefix of the signal inside this route's body */
    signalPointer?: string;
  }
}

interface Mapped {
  code: ProblemCode;
  detail: string;
  pointer: string | null;
  headers?: Record<string, string>;
  extra?: Record<string, unknown>;
}

const LOCATION_PREFIX: Record<string, string> = { body: '', querystring: '/query', params: '/params', headers: '/headers' };

function describeIssue(issue: { keyword: string; message?: string | undefined; params: Record<string, unknown> }): string {
  if (issue.keyword === 'unrecognized_keys') {
    const keys = (issue.params.keys as string[]).map((k) => `"${k}"`).join(', ');
    return `unknown field ${keys}; a misspelt setting is never replaced by a default`;
  }
  return issue.message ?? issue.keyword;
}

/** ioredis faults while Redis is down: a transient outage, answered 503 rather than 500. */
function isConnectionFault(error: Error): boolean {
  const code = (error as NodeJS.ErrnoException).code;
  return (
    error.name === 'MaxRetriesPerRequestError' ||
    /Connection is closed|Stream isn't writeable|Reached the max retries/.test(error.message) ||
    code === 'ECONNREFUSED' ||
    code === 'ECONNRESET' ||
    code === 'ETIMEDOUT'
  );
}

/** Maps every error to a problem code; unknown errors become `internal` with no internals exposed. */
export function mapError(error: FastifyError | Error, request: FastifyRequest): Mapped {
  if (error instanceof DomainError) return { code: error.code, detail: error.detail, pointer: error.pointer, headers: error.headers, extra: error.extensions };
  if (error instanceof ProblemError) return { code: error.code, detail: error.detail, pointer: error.pointer, headers: error.headers, extra: error.extra };
  if (error instanceof SignalInputError) {
    const prefix = error.pointer === null ? '' : (request.routeOptions.config.signalPointer ?? '');
    return { code: error.code === 'limit' ? 'limit-exceeded' : 'invalid-signal', detail: error.message, pointer: error.pointer === null ? null : prefix + error.pointer };
  }
  if (error instanceof StorageFullError) return { code: 'storage-full', detail: error.message, pointer: null };
  if (error instanceof RecipeInputError) {
    const code: ProblemCode = error.code === 'limit' ? 'limit-exceeded' : error.code === 'unfit-for-signal' ? 'recipe-unfit' : 'invalid-recipe';
    const prefix = request.routeOptions.config.recipePointer ?? '';
    return { code, detail: error.message, pointer: prefix + (error.pointer === '/' ? '' : error.pointer) || '/' };
  }
  if (hasZodFastifySchemaValidationErrors(error)) {
    const issue = error.validation[0]!;
    const context = (error as FastifyError).validationContext ?? 'body';
    const pointer = (LOCATION_PREFIX[context] ?? '') + (issue.instancePath === '/' ? '' : issue.instancePath);
    const code = context === 'body' ? (request.routeOptions.config.bodyProblem ?? 'invalid-request') : 'invalid-request';
    return { code, detail: `${context === 'querystring' ? 'query parameter' : 'field'} ${pointer || '/'}: ${describeIssue(issue)}`, pointer: pointer || '/' };
  }
  const fastifyCode = (error as FastifyError).code;
  switch (fastifyCode) {
    case 'FST_ERR_CTP_BODY_TOO_LARGE':
      return { code: 'payload-too-large', detail: `the body exceeds this server's limit of ${request.routeOptions.bodyLimit ?? request.server.initialConfig.bodyLimit} bytes`, pointer: null };
    case 'FST_ERR_CTP_INVALID_MEDIA_TYPE':
      return { code: 'unsupported-media-type', detail: `content type "${request.headers['content-type'] ?? ''}" is not accepted here; send application/json or application/octet-stream`, pointer: null };
    case 'FST_ERR_CTP_EMPTY_JSON_BODY':
      return { code: 'invalid-request', detail: 'the JSON body is empty', pointer: '/' };
    case 'FST_ERR_CTP_INVALID_JSON_BODY':
    case 'FST_ERR_CTP_INVALID_CONTENT_LENGTH':
      return { code: 'invalid-request', detail: `the body is not valid JSON: ${error.message}`, pointer: '/' };
    default:
      break;
  }
  if (isConnectionFault(error)) {
    return { code: 'queue-unavailable', detail: `Redis cannot be reached (${error.message}); nothing was changed, try again shortly`, pointer: null, headers: { 'retry-after': '5' } };
  }
  if (error instanceof SyntaxError) return { code: 'invalid-request', detail: `the body is not valid JSON: ${error.message}`, pointer: '/' };
  const status = (error as FastifyError).statusCode;
  if (status === 429) return { code: 'rate-limited', detail: error.message, pointer: null };
  if (status === 413) return { code: 'payload-too-large', detail: error.message, pointer: null };
  if (status === 415) return { code: 'unsupported-media-type', detail: error.message, pointer: null };
  if (status !== undefined && status >= 400 && status < 500) return { code: 'invalid-request', detail: error.message, pointer: null };
  return { code: 'internal', detail: 'an unexpected error occurred; quote the requestId to the operator', pointer: null };
}

export function errorHandler(error: FastifyError, request: FastifyRequest, reply: FastifyReply): void {
  const mapped = mapError(error, request);
  const body = problemBody(mapped.code, mapped.detail, mapped.pointer, String(request.id), mapped.extra);
  if (body.status >= 500) request.log.error({ err: error }, 'request failed');
  else request.log.info({ problem: mapped.code, pointer: mapped.pointer }, 'request refused');
  void reply
    .code(body.status)
    .headers(mapped.headers ?? {})
    .type('application/problem+json')
    .send(JSON.stringify(body));
}

export function notFoundHandler(request: FastifyRequest, reply: FastifyReply): void {
  const body = problemBody('not-found', `no route for ${request.method} ${request.url.split('?')[0]}`, null, String(request.id));
  void reply.code(404).type('application/problem+json').send(JSON.stringify(body));
}
