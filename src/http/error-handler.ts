import type { FastifyError, FastifyReply, FastifyRequest } from 'fastify';
import { hasZodFastifySchemaValidationErrors } from 'fastify-type-provider-zod';
import { DomainError, toProblem, type ProblemCode, type Translated } from '../common/errors.js';
import { explainIssue, type SchemaIssue } from '../common/issue-text.js';
import { pointerOf } from '../recipes/errors.js';

declare module 'fastify' {
  interface FastifyContextConfig {
    /** problem code for schema violations of this route's body (default invalid-request) */
    bodyProblem?: ProblemCode;
    /** the accepted forms of a union in this route's body, by JSON pointer, for details */
    unionForms?: Record<string, string>;
  }
}

const LOCATION_PREFIX: Record<string, string> = { body: '', querystring: '/query', params: '/params', headers: '/headers' };

/** The issue as zod reported it, from fastify-type-provider-zod's validation entry. */
function zodIssue(entry: { keyword: string; instancePath: string; message?: string | undefined; params: Record<string, unknown> }): SchemaIssue {
  const path = entry.instancePath.split('/').filter((p) => p !== '');
  return { ...entry.params, code: entry.keyword, path, ...(entry.message !== undefined ? { message: entry.message } : {}) } as SchemaIssue;
}

/** Where a body too large for one request can go instead. */
export const RESUMABLE_HINT = 'send large recordings in parts through the resumable upload (POST /v1/uploads, then PUT /v1/uploads/{id}/parts/{n})';

/** The content types the route's context has parsers for, among those the service uses. */
function acceptedTypes(request: FastifyRequest): string[] {
  return ['application/json', 'application/octet-stream'].filter((type) => request.server.hasContentTypeParser(type));
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

/**
 * What the HTTP layer knows of errors that are not domain errors: fastify's own, schema
 * violations, Redis outages. Null leaves the error to be answered as `internal`.
 */
export function classifyHttpError(error: unknown, request: FastifyRequest): DomainError | null {
  if (!(error instanceof Error)) return null;
  if (hasZodFastifySchemaValidationErrors(error)) {
    const context = (error as FastifyError).validationContext ?? 'body';
    const root = context === 'querystring' ? request.query : context === 'params' ? request.params : context === 'headers' ? request.headers : request.body;
    const issue = zodIssue(error.validation[0]!);
    const config = request.routeOptions.config;
    const { path, text } = explainIssue(issue, root, config.unionForms?.[pointerOf(issue.path ?? [])]);
    const pointer = (LOCATION_PREFIX[context] ?? '') + pointerOf(path);
    const code = context === 'body' ? (config.bodyProblem ?? 'invalid-request') : 'invalid-request';
    return new DomainError(code, `${context === 'querystring' ? 'query parameter' : 'field'} ${pointer || '/'}: ${text}`, { pointer: pointer || '/' });
  }
  const fastifyCode = (error as FastifyError).code;
  switch (fastifyCode) {
    case 'FST_ERR_CTP_BODY_TOO_LARGE':
      return new DomainError('payload-too-large', `the body exceeds this server's limit of ${request.routeOptions.bodyLimit ?? request.server.initialConfig.bodyLimit} bytes; ${RESUMABLE_HINT}`);
    case 'FST_ERR_CTP_INVALID_MEDIA_TYPE': {
      const accepted = acceptedTypes(request);
      const sent = request.headers['content-type'] ?? '';
      return new DomainError('unsupported-media-type', `content type "${sent}" is not read here; send ${accepted.join(' or ')}`, { pointer: '/headers/content-type', extensions: { accepted } });
    }
    case 'FST_ERR_CTP_EMPTY_JSON_BODY':
      return new DomainError('invalid-request', 'the JSON body is empty', { pointer: '/' });
    case 'FST_ERR_CTP_INVALID_JSON_BODY':
    case 'FST_ERR_CTP_INVALID_CONTENT_LENGTH':
      return new DomainError('invalid-request', `the body is not valid JSON: ${error.message}`, { pointer: '/' });
    default:
      break;
  }
  if (isConnectionFault(error)) {
    return new DomainError('queue-unavailable', `Redis cannot be reached (${error.message}); nothing was changed, try again shortly`, { headers: { 'retry-after': '5' } });
  }
  if (error instanceof SyntaxError) return new DomainError('invalid-request', `the body is not valid JSON: ${error.message}`, { pointer: '/' });
  const status = (error as FastifyError).statusCode;
  const headers = (error as { headers?: Record<string, string> }).headers ?? {};
  if (status === 429) return new DomainError('rate-limited', error.message, { headers });
  if (status === 413) return new DomainError('payload-too-large', `${error.message}; ${RESUMABLE_HINT}`);
  if (status === 415) return new DomainError('unsupported-media-type', error.message);
  if (status !== undefined && status >= 400 && status < 500) return new DomainError('invalid-request', error.message);
  return null;
}

/** Sends a problem as application/problem+json; every error answer of the service goes through here. */
export function sendProblem(reply: FastifyReply, translated: Translated): void {
  const body = { ...translated.problem, requestId: String(reply.request.id) };
  void reply.code(translated.status).headers(translated.headers).type('application/problem+json').send(JSON.stringify(body));
}

export function errorHandler(error: FastifyError, request: FastifyRequest, reply: FastifyReply): void {
  const translated = toProblem(error, (e) => classifyHttpError(e, request));
  if (translated.status >= 500) request.log.error({ err: error }, 'request failed');
  else request.log.info({ problem: translated.problem.type, pointer: translated.problem.pointer }, 'request refused');
  sendProblem(reply, translated);
}
