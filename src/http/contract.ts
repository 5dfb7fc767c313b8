import type { RouteOptions } from 'fastify';
import { problemResponse } from './schemas.js';

/** Operation ids of the documented routes: stable names for generated clients. */
const OPERATION_IDS: Record<string, string> = {
  'GET /healthz': 'getHealth',
  'GET /readyz': 'getReadiness',
  'GET /metrics': 'getMetrics',
  'GET /problems/:code': 'getProblemType',
  'POST /v1/signals': 'uploadSignal',
  'POST /v1/signals/import': 'importSignal',
  'GET /v1/signals/:id': 'getSignal',
  'DELETE /v1/signals/:id': 'deleteSignal',
  'POST /v1/recipes': 'pinRecipe',
  'GET /v1/recipes/:id': 'getRecipe',
  'POST /v1/jobs': 'submitJob',
  'GET /v1/jobs': 'listJobs',
  'GET /v1/jobs/:id': 'getJob',
  'DELETE /v1/jobs/:id': 'cancelJob',
  'GET /v1/jobs/:id/record': 'getJobRecord',
  'GET /v1/jobs/:id/attachments/:name': 'getJobAttachment',
  'GET /v1/jobs/:id/table': 'getJobTable',
  'GET /v1/jobs/:id/events': 'streamJobEvents',
  'GET /v1/jobs/events': 'streamJobsEvents',
  'GET /v1/jobs/:id/plots/:kind': 'getJobPlot',
  'GET /v1/plots/compare': 'getComparePlot',
  'POST /v1/studies': 'createStudy',
  'GET /v1/studies': 'listStudies',
  'GET /v1/studies/:id': 'getStudy',
  'DELETE /v1/studies/:id': 'deleteStudy',
  'POST /v1/studies/:id/entries': 'addStudyEntries',
  'GET /v1/studies/:id/entries': 'listStudyEntries',
  'DELETE /v1/studies/:id/entries/:entryId': 'removeStudyEntry',
  'POST /v1/studies/:id/runs': 'startStudyRun',
  'GET /v1/studies/:id/runs': 'listStudyRuns',
  'GET /v1/studies/:id/runs/:runId': 'getStudyRun',
  'DELETE /v1/studies/:id/runs/:runId': 'cancelStudyRun',
  'GET /v1/studies/:id/runs/:runId/table': 'getStudyRunTable',
  'GET /v1/studies/:id/runs/:runId/plots/psd': 'getStudyRunPsdPlot',
  'POST /v1/uploads': 'startUpload',
  'PUT /v1/uploads/:id/parts/:part': 'putUploadPart',
  'GET /v1/uploads/:id': 'getUpload',
  'DELETE /v1/uploads/:id': 'abandonUpload',
  'POST /v1/uploads/:id/complete': 'completeUpload',
};

/** Probes that the rate limit lets through (see app.ts). */
const NOT_RATE_LIMITED = new Set(['/healthz', '/readyz']);

type Responses = Record<string | number, unknown>;

/**
 * Completes a route's documentation with what every route of its kind can answer, so that the
 * document lists every status the wire shows: the operation id; no security on public routes;
 * 401/403 where a key is needed; 429 where the rate limit applies; 413/415 where a body is read;
 * 400 where input is validated; 404 where a path names a resource.
 */
export function documentRoute(route: RouteOptions): void {
  const schema = route.schema as (Record<string, unknown> & { hide?: boolean; response?: Responses }) | undefined;
  const method = [route.method].flat()[0]!.toUpperCase();
  if (!schema || schema.hide || method === 'HEAD') return;
  const operationId = OPERATION_IDS[`${method} ${route.url}`];
  if (operationId && schema.operationId === undefined) schema.operationId = operationId;
  const access = (route.config as { access?: string } | undefined)?.access ?? 'read';
  if (access === 'public') schema.security = [];
  const response: Responses = (schema.response ??= {});
  const add = (status: number, description: string) => {
    if (response[status] === undefined) response[status] = problemResponse(description);
  };
  const readsBody = method === 'POST' || method === 'PUT';
  if (readsBody || schema.params || schema.querystring) add(400, 'malformed request (pointer names the field)');
  if (access !== 'public') {
    add(401, 'no valid API key (Authorization: Bearer <key>)');
    add(403, "the key's role does not cover this route");
  }
  if (!NOT_RATE_LIMITED.has(route.url)) add(429, 'too many requests; Retry-After says when to try again');
  if (readsBody) {
    add(413, 'body too large; large recordings go through the resumable upload (POST /v1/uploads)');
    add(415, 'unsupported content type; `accepted` lists the ones this route reads');
  }
  if (route.url.includes('/:')) add(404, 'no such resource');
}

type Document = {
  paths?: Record<string, Record<string, { responses?: Record<string, { headers?: Record<string, unknown> }> }>>;
  components?: { schemas?: Record<string, unknown>; headers?: Record<string, unknown> };
};

const header = (description: string) => ({ description, schema: { type: 'string' } });

const TABLE_HEADERS = {
  'content-disposition': header('attachment; filename="<stem>.csv" or ".parquet"'),
  vary: header('accept: the format may follow the Accept header'),
};
const PLOT_HEADERS = {
  etag: header('the SHA-256 of the SVG, quoted; send it back as If-None-Match'),
  'cache-control': header('private, no-cache'),
};

/** Headers of particular answers (the zod transform does not carry response headers). */
const RESPONSE_HEADERS: Record<string, Record<string, Record<string, unknown>>> = {
  '/v1/jobs/{id}/attachments/{name} get 200': {
    'x-rhythmetric-shape': header('comma-separated dimensions, e.g. "200,40" for times × frequencies'),
    'x-rhythmetric-dtype': header('float64 or uint8, little-endian'),
    etag: header('the SHA-256 the record lists for the attachment, quoted'),
  },
  '/v1/jobs/{id}/table get 200': TABLE_HEADERS,
  '/v1/studies/{id}/runs/{runId}/table get 200': TABLE_HEADERS,
  '/v1/jobs/{id}/plots/{kind} get 200': PLOT_HEADERS,
  '/v1/jobs/{id}/plots/{kind} get 304': PLOT_HEADERS,
  '/v1/plots/compare get 200': PLOT_HEADERS,
  '/v1/plots/compare get 304': PLOT_HEADERS,
  '/v1/studies/{id}/runs/{runId}/plots/psd get 200': PLOT_HEADERS,
  '/v1/studies/{id}/runs/{runId}/plots/psd get 304': PLOT_HEADERS,
};

/**
 * Finishes the generated document: the request id header on every answer, Retry-After where a
 * retry is asked for, Location on creations, the headers of particular answers, and no component
 * schema that nothing refers to (the zod transform registers input and output twins).
 */
export function finishDocument<T>(document: T): T {
  const doc = document as Document;
  doc.components ??= {};
  doc.components.headers = {
    RequestId: header('the request id (echoed when the client sent a well-formed x-request-id); problem bodies repeat it as requestId'),
    RetryAfter: { description: 'seconds to wait before trying again', schema: { type: 'integer', minimum: 0 } },
    Location: header('where the created or queued resource can be read'),
  };
  for (const [path, operations] of Object.entries(doc.paths ?? {})) {
    for (const [method, operation] of Object.entries(operations)) {
      for (const [status, response] of Object.entries(operation.responses ?? {})) {
        const headers: Record<string, unknown> = { 'x-request-id': { $ref: '#/components/headers/RequestId' } };
        if (status === '429' || status === '503') headers['retry-after'] = { $ref: '#/components/headers/RetryAfter' };
        if (status === '201' || status === '202') headers.location = { $ref: '#/components/headers/Location' };
        Object.assign(headers, RESPONSE_HEADERS[`${path} ${method} ${status}`] ?? {});
        response.headers = { ...response.headers, ...headers };
      }
    }
  }
  const schemas = doc.components.schemas ?? {};
  for (let removed = true; removed; ) {
    removed = false;
    const text = JSON.stringify({ ...doc, components: { ...doc.components, schemas: {} } }) + JSON.stringify(schemas);
    for (const name of Object.keys(schemas)) {
      const ref = `"#/components/schemas/${name}"`;
      if (text.split(ref).length - 1 === 0) {
        delete schemas[name];
        removed = true;
      }
    }
  }
  return document;
}
