import { randomUUID } from 'node:crypto';
import { createServer } from 'node:http';
import swagger from '@fastify/swagger';
import Fastify, { type FastifyBaseLogger, type FastifyInstance } from 'fastify';
import { jsonSchemaTransform, jsonSchemaTransformObject, serializerCompiler, validatorCompiler, type ZodTypeProvider } from 'fastify-type-provider-zod';
import type { Logger } from 'pino';
import type { Config } from '../config.js';
import { ENGINE_VERSION } from '../engine/version.js';
import type { JobQueue } from '../jobs/queue.js';
import type { Store } from '../stores/store.js';
import { documentRoute, finishDocument } from './contract.js';
import { errorHandler } from './error-handler.js';
import { buildClientErrorHandler, buildNotFoundHandler, createRouteTable, frameworkErrors, SECURITY_HEADERS } from './early-errors.js';
import cors from '@fastify/cors';
import rateLimit from '@fastify/rate-limit';
import { registerAuth } from './auth.js';
import { createMetrics, type Metrics } from './metrics.js';
import { eventRoutes } from './routes/events.js';
import { jobRoutes } from './routes/jobs.js';
import { uploadRoutes } from './routes/uploads.js';
import { metaRoutes } from './routes/meta.js';
import { pageRoutes } from './routes/page.js';
import { plotRoutes } from './routes/plots.js';
import { recipeRoutes } from './routes/recipes.js';
import { signalRoutes } from './routes/signals.js';
import { studyRoutes } from './routes/studies.js';
import { tableRoutes } from './routes/tables.js';

export interface AppDeps {
  config: Readonly<Config>;
  store: Store;
  queue: JobQueue;
  logger: Logger;
  /** set by buildApp */
  metrics?: Metrics;
  /** embedded mode: whether the worker-thread pool can take work */
  poolReady?: () => boolean;
}

const REQUEST_ID = /^[A-Za-z0-9._:-]{1,128}$/;

export const API_DESCRIPTION = [
  'rhythmetric computes spectral features of EEG and other electrophysiology signals: upload a signal, pin a recipe, submit a job, fetch a versioned feature record.',
  '',
  '**Research software, not a medical device.** It is not intended for diagnosis or treatment; any clinical use follows local regulations and licensed practice.',
  '',
  "Authentication: `Authorization: Bearer <key>`; keys have the role `read` (records, job state), `submit` (uploads, jobs) or `admin` (deletion, every tenant's jobs). Without configured keys the service runs in an announced open mode.",
  '',
  'Errors are RFC 9457 `application/problem+json` with a stable `type`, a `detail` in words and a JSON `pointer` to the offending input.',
].join('\n');

/** Builds the app without listening, so tests drive it with `inject()`. */
export async function buildApp(deps: AppDeps): Promise<FastifyInstance> {
  const routes = createRouteTable();
  const app = Fastify({
    frameworkErrors,
    clientErrorHandler: buildClientErrorHandler(routes, deps.logger),
    loggerInstance: deps.logger as unknown as FastifyBaseLogger,
    bodyLimit: deps.config.bodyLimitBytes,
    // A client that trickles its body is cut off instead of holding a connection for ever. Node
    // checks request deadlines only on connectionsCheckingInterval, which exists only at creation.
    serverFactory: (handler) =>
      createServer(
        {
          requestTimeout: deps.config.requestTimeoutMs,
          ...(deps.config.requestTimeoutMs > 0 ? { connectionsCheckingInterval: Math.max(100, Math.min(30_000, Math.floor(deps.config.requestTimeoutMs / 4))) } : {}),
        },
        handler,
      ),
    genReqId: (request) => {
      const given = request.headers['x-request-id'];
      return typeof given === 'string' && REQUEST_ID.test(given) ? given : randomUUID();
    },
  }).withTypeProvider<ZodTypeProvider>();
  app.setValidatorCompiler(validatorCompiler);
  app.setSerializerCompiler(serializerCompiler);
  app.setErrorHandler(errorHandler);
  app.setNotFoundHandler(buildNotFoundHandler(routes));
  app.addHook('onRoute', (route) => {
    routes.add(route.method, route.url);
    documentRoute(route);
  });
  // A JSON body sent as text/plain is refused as 415 naming the accepted types, not parsed as a
  // string and then refused as a malformed recipe or signal.
  app.removeContentTypeParser('text/plain');
  app.addHook('onSend', async (request, reply) => {
    reply.header('x-request-id', request.id);
    // The page's files carry their own, wider content policy (routes/page.ts).
    for (const [name, value] of Object.entries(SECURITY_HEADERS)) if (name !== 'content-security-policy' || !reply.hasHeader(name)) reply.header(name, value);
    if (!reply.hasHeader('cache-control')) reply.header('cache-control', 'no-store');
  });
  if (deps.config.corsOrigins.length > 0) {
    await app.register(cors, {
      origin: deps.config.corsOrigins.includes('*') ? true : deps.config.corsOrigins,
      methods: ['GET', 'POST', 'PUT', 'DELETE'],
      allowedHeaders: ['authorization', 'content-type', 'x-request-id', 'if-none-match'],
      // What a dashboard on another origin reads: ids for support, caching, download names and the
      // layout of a binary attachment.
      exposedHeaders: ['x-request-id', 'location', 'retry-after', 'etag', 'content-disposition', 'x-rhythmetric-shape', 'x-rhythmetric-dtype'],
      maxAge: 600,
    });
  }
  registerAuth(app, { keys: deps.config.apiKeys, metricsTokenSha256: deps.config.metricsTokenSha256, failuresPerMinute: deps.config.authFailuresPerMinute });
  if (deps.config.rateLimitPerMinute > 0) {
    await app.register(rateLimit, {
      max: deps.config.rateLimitPerMinute,
      timeWindow: 60_000,
      // Per key when keys are configured, per address in open mode; health probes are not limited.
      keyGenerator: (request) => (request.principal && request.principal.key !== 'open-mode' ? `key:${request.principal.key}` : `ip:${request.ip}`),
      allowList: (request) => request.url === '/healthz' || request.url === '/readyz',
      errorResponseBuilder: (_request, context) =>
        Object.assign(new Error(`more than ${context.max} requests in ${context.after}; retry later`), { statusCode: 429, headers: { 'retry-after': String(Math.ceil(context.ttl / 1000)) } }),
    });
  }
  deps.metrics = createMetrics(app, deps.queue, deps.store);
  app.addHook('onClose', async () => deps.metrics?.close());
  await app.register(swagger, {
    openapi: {
      openapi: '3.1.0',
      info: { title: 'rhythmetric', version: ENGINE_VERSION, description: API_DESCRIPTION, license: { name: 'Apache-2.0', identifier: 'Apache-2.0' } },
      // Relative: the document is served by the service it describes, wherever that runs.
      servers: [{ url: '/', description: 'the service that serves this document' }],
      components: {
        securitySchemes: {
          bearer: {
            type: 'http',
            scheme: 'bearer',
            description: 'An API key with the role read, submit or admin, as "Authorization: Bearer <key>". Without configured keys the service runs in an announced open mode.',
          },
        },
      },
      security: [{ bearer: [] }],
      tags: [
        { name: 'signals', description: 'Upload and describe signals' },
        { name: 'recipes', description: 'Pin analysis recipes' },
        { name: 'jobs', description: 'Submit analyses and fetch feature records' },
        { name: 'plots', description: 'Records drawn as SVG' },
        { name: 'studies', description: 'Recordings with their metadata, grouped in studies; one recipe run over a whole study' },
        { name: 'operations', description: 'Health, readiness and documentation' },
      ],
    },
    transform: jsonSchemaTransform,
    transformObject: (input) => finishDocument(jsonSchemaTransformObject(input)),
  });
  await app.register(metaRoutes(deps));
  await app.register(signalRoutes(deps));
  await app.register(recipeRoutes(deps));
  await app.register(jobRoutes(deps));
  await app.register(tableRoutes(deps));
  await app.register(eventRoutes(deps));
  await app.register(uploadRoutes(deps));
  await app.register(plotRoutes(deps));
  await app.register(studyRoutes(deps));
  await app.register(pageRoutes());
  await app.ready();
  return app;
}
