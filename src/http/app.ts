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
import { errorHandler, notFoundHandler } from './error-handler.js';
import cors from '@fastify/cors';
import rateLimit from '@fastify/rate-limit';
import { registerAuth } from './auth.js';
import { createMetrics, type Metrics } from './metrics.js';
import { eventRoutes } from './routes/events.js';
import { jobRoutes } from './routes/jobs.js';
import { uploadRoutes } from './routes/uploads.js';
import { metaRoutes } from './routes/meta.js';
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
  'Authentication: `Authorization: Bearer <key>`; keys have the role `read` (records, job state), `submit` (uploads, jobs) or `admin` (deletion, every tenant\'s jobs). Without configured keys the service runs in an announced open mode.',
  '',
  'Errors are RFC 9457 `application/problem+json` with a stable `type`, a `detail` in words and a JSON `pointer` to the offending input.',
].join('\n');

/** Builds the app without listening, so tests drive it with `inject()`. */
export async function buildApp(deps: AppDeps): Promise<FastifyInstance> {
  const app = Fastify({
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
  app.setNotFoundHandler(notFoundHandler);
  app.addHook('onSend', async (request, reply) => {
    reply.header('x-request-id', request.id);
    reply.header('x-content-type-options', 'nosniff');
    reply.header('x-frame-options', 'DENY');
    reply.header('referrer-policy', 'no-referrer');
    reply.header('content-security-policy', "default-src 'none'; frame-ancestors 'none'");
    reply.header('cross-origin-resource-policy', 'same-site');
    if (!reply.hasHeader('cache-control')) reply.header('cache-control', 'no-store');
  });
  if (deps.config.corsOrigins.length > 0) {
    await app.register(cors, {
      origin: deps.config.corsOrigins.includes('*') ? true : deps.config.corsOrigins,
      methods: ['GET', 'POST', 'PUT', 'DELETE'],
      allowedHeaders: ['authorization', 'content-type', 'x-request-id'],
      exposedHeaders: ['x-request-id', 'location', 'retry-after'],
      maxAge: 600,
    });
  }
  registerAuth(app, deps.config.apiKeys);
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
      tags: [
        { name: 'signals', description: 'Upload and describe signals' },
        { name: 'recipes', description: 'Pin analysis recipes' },
        { name: 'jobs', description: 'Submit analyses and fetch feature records' },
        { name: 'studies', description: 'Recordings with their metadata, grouped in studies; one recipe run over a whole study' },
        { name: 'operations', description: 'Health, readiness and documentation' },
      ],
    },
    transform: jsonSchemaTransform,
    transformObject: jsonSchemaTransformObject,
  });
  await app.register(metaRoutes(deps));
  await app.register(signalRoutes(deps));
  await app.register(recipeRoutes(deps));
  await app.register(jobRoutes(deps));
  await app.register(tableRoutes(deps));
  await app.register(eventRoutes(deps));
  await app.register(uploadRoutes(deps));
  await app.register(studyRoutes(deps));
  await app.ready();
  return app;
}
