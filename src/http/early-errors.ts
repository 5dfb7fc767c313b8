import { randomUUID } from 'node:crypto';
import { STATUS_CODES } from 'node:http';
import type { Socket } from 'node:net';
import type { FastifyError, FastifyReply, FastifyRequest } from 'fastify';
import { DomainError, toProblem, type ProblemCode } from '../common/errors.js';
import { errorHandler, sendProblem } from './error-handler.js';

/** Headers every answer carries, errors included (also those written before fastify sees a request). */
export const SECURITY_HEADERS: Readonly<Record<string, string>> = Object.freeze({
  'x-content-type-options': 'nosniff',
  'x-frame-options': 'DENY',
  'referrer-policy': 'no-referrer',
  'content-security-policy': "default-src 'none'; frame-ancestors 'none'",
  'cross-origin-resource-policy': 'same-site',
});

/** The routes' methods by path pattern, to tell "no such path" (404) from "not with this method" (405). */
export interface RouteTable {
  add(method: string | string[], url: string): void;
  /** Methods some route answers at `path` (a concrete path, no query), sorted. */
  allowed(path: string): string[];
}

export function createRouteTable(): RouteTable {
  const routes: { pattern: RegExp; methods: Set<string> }[] = [];
  const byUrl = new Map<string, Set<string>>();
  return {
    add(method, url) {
      // A catch-all (e.g. the CORS preflight on '*') would make every path "exist".
      if (url === '*' || url === '/*') return;
      let methods = byUrl.get(url);
      if (!methods) {
        methods = new Set();
        byUrl.set(url, methods);
        const source = url
          .split('/')
          .map((part) => (part.startsWith(':') ? '[^/]+' : part === '*' ? '.*' : part.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')))
          .join('/');
        routes.push({ pattern: new RegExp(`^${source}/?$`), methods });
      }
      for (const m of [method].flat()) methods.add(m.toUpperCase());
    },
    allowed(path) {
      const found = new Set<string>();
      for (const route of routes) if (route.pattern.test(path)) for (const m of route.methods) found.add(m);
      return [...found].sort();
    },
  };
}

function pathOf(url: string): string {
  return url.split('?')[0] ?? '/';
}

/** 404 for a path no route has; 405 with `Allow` for a path whose routes lack the method. */
export function buildNotFoundHandler(table: RouteTable) {
  return function notFoundHandler(request: FastifyRequest, reply: FastifyReply): void {
    const path = pathOf(request.url);
    const allowed = table.allowed(path);
    if (allowed.length === 0) {
      sendProblem(reply, toProblem(new DomainError('not-found', `no route for ${request.method} ${path}`)));
      return;
    }
    const detail = `${path} does not answer ${request.method}; it answers ${allowed.join(', ')}`;
    sendProblem(reply, toProblem(new DomainError('method-not-allowed', detail, { headers: { allow: allowed.join(', ') }, extensions: { allowed } })));
  };
}

/** Fastify's errors from before routing (a path it cannot decode, an over-long path parameter). */
export function frameworkErrors(error: FastifyError, request: FastifyRequest, reply: FastifyReply): void {
  for (const [name, value] of Object.entries(SECURITY_HEADERS)) reply.header(name, value);
  reply.header('x-request-id', request.id);
  if (error.code === 'FST_ERR_BAD_URL') {
    const detail = 'the path holds a malformed percent-encoding (a "%" not followed by two hex digits, or bytes that are not UTF-8); encode "%" itself as %25';
    sendProblem(reply, toProblem(new DomainError('invalid-request', detail)));
  } else if (error.code === 'FST_ERR_MAX_PARAM_LENGTH') {
    sendProblem(reply, toProblem(new DomainError('uri-too-long', 'a path segment is longer than this server reads (100 characters); ids are far shorter, check the URL')));
  } else {
    errorHandler(error, request, reply);
  }
}

/** Node's parser codes for an unknown method and for an over-long request line or header block. */
const INVALID_METHOD = 'HPE_INVALID_METHOD';
const HEADER_OVERFLOW = 'HPE_HEADER_OVERFLOW';

function requestLineOf(raw: unknown): { complete: boolean; method: string; path: string } {
  const text = Buffer.isBuffer(raw) ? raw.toString('latin1', 0, Math.min(raw.length, 65_536)) : '';
  const end = text.indexOf('\r\n');
  const [method = '', target = ''] = (end < 0 ? text : text.slice(0, end)).split(' ');
  return { complete: end >= 0 && end <= 8192, method, path: pathOf(target) };
}

/**
 * Answers what Node's HTTP parser refuses before fastify sees a request (unknown methods, too long
 * a request line or header block, request timeouts, malformed HTTP) as problem+json with a request
 * id and the security headers, then closes the connection as Node does.
 */
export function buildClientErrorHandler(table: RouteTable, log: { info(obj: object, msg: string): void }) {
  return function clientErrorHandler(error: Error & { code?: string; rawPacket?: unknown }, socket: Socket): void {
    if (error.code === 'ECONNRESET' || socket.destroyed) return;
    let code: ProblemCode = 'invalid-request';
    let detail = `the request is not valid HTTP/1.1 (${error.code ?? error.message})`;
    const headers: Record<string, string> = {};
    const line = requestLineOf(error.rawPacket);
    if (error.code === 'ERR_HTTP_REQUEST_TIMEOUT') {
      code = 'request-timeout';
      detail = 'the request did not arrive in time; the connection is closed';
    } else if (error.code === HEADER_OVERFLOW) {
      code = line.complete ? 'headers-too-large' : 'uri-too-long';
      detail = line.complete ? 'the request headers exceed what this server reads' : 'the URL exceeds what this server reads; long selections go in a JSON body';
    } else if (error.code === INVALID_METHOD) {
      const allowed = line.path ? table.allowed(line.path) : [];
      code = 'method-not-allowed';
      detail = `method "${line.method.slice(0, 32)}" is not one this service answers${allowed.length > 0 ? `; ${line.path} answers ${allowed.join(', ')}` : ''}`;
      if (allowed.length > 0) headers.allow = allowed.join(', ');
    }
    const requestId = randomUUID();
    const { problem, status } = toProblem(new DomainError(code, detail));
    const body = JSON.stringify({ ...problem, requestId });
    const head = {
      'content-type': 'application/problem+json; charset=utf-8',
      'content-length': String(Buffer.byteLength(body)),
      'x-request-id': requestId,
      ...SECURITY_HEADERS,
      'cache-control': 'no-store',
      ...headers,
      connection: 'close',
    };
    log.info({ problem: code, requestId, parserCode: error.code }, 'request refused by the HTTP parser');
    if (socket.writable) {
      socket.write(
        `HTTP/1.1 ${status} ${STATUS_CODES[status] ?? ''}\r\n${Object.entries(head)
          .map(([k, v]) => `${k}: ${v}`)
          .join('\r\n')}\r\n\r\n${body}`,
      );
    }
    socket.destroy(error);
  };
}
