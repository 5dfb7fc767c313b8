import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { PROBLEMS, type ProblemCode } from '../../common/errors.js';
import { ENGINE_VERSION } from '../../engine/version.js';
import type { AppDeps } from '../app.js';
import { ProblemError } from '../problem.js';
import { problemResponse } from '../schemas.js';

const Health = z.object({ status: z.enum(['ok', 'unavailable']), engineVersion: z.string(), mode: z.enum(['embedded', 'distributed']), checks: z.record(z.string(), z.boolean()).optional() });

export const metaRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    app.get('/healthz', { config: { access: 'public' }, schema: { summary: 'The process is alive', tags: ['operations'], response: { 200: Health } } }, async () => ({
      status: 'ok' as const,
      engineVersion: ENGINE_VERSION,
      mode: deps.queue.mode,
    }));

    app.get(
      '/readyz',
      { config: { access: 'public' }, schema: { summary: 'The store and the queue answer', tags: ['operations'], response: { 200: Health, 503: Health } } },
      async (_request, reply) => {
        const [store, queue] = await Promise.all([deps.store.ping().catch(() => false), deps.queue.ready().catch(() => false)]);
        const checks: Record<string, boolean> = { store, queue };
        if (deps.poolReady) checks.workerPool = deps.poolReady();
        const ok = Object.values(checks).every(Boolean);
        if (!ok) reply.header('retry-after', '5');
        return reply.code(ok ? 200 : 503).send({ status: ok ? 'ok' : 'unavailable', engineVersion: ENGINE_VERSION, mode: deps.queue.mode, checks });
      },
    );

    app.get(
      '/metrics',
      {
        config: { access: 'metrics' },
        schema: {
          summary: 'Prometheus metrics (text exposition format); needs an admin key or the metrics token',
          tags: ['operations'],
          response: { 200: { description: 'metrics in the Prometheus text exposition format 0.0.4', content: { 'text/plain': { schema: z.string() } } } },
        },
      },
      async (_request, reply) => {
        const registry = deps.metrics!.registry;
        return reply.type(registry.contentType).send(await registry.metrics());
      },
    );

    app.get('/openapi.json', { config: { access: 'public' }, schema: { hide: true } }, async (_request, reply) => reply.type('application/json').send(app.swagger()));

    app.get(
      '/problems/:code',
      {
        config: { access: 'public' },
        schema: {
          summary: 'Documentation of a problem type',
          tags: ['operations'],
          params: z.object({ code: z.string() }),
          response: { 200: z.object({ type: z.string(), title: z.string(), status: z.number(), about: z.string() }), 404: problemResponse('unknown problem type') },
        },
      },
      async (request) => {
        const code = request.params.code as ProblemCode;
        if (!Object.hasOwn(PROBLEMS, code)) throw new ProblemError('not-found', `no problem type "${request.params.code}"`);
        const entry = PROBLEMS[code];
        return { type: `/problems/${code}`, title: entry.title, status: entry.status, about: entry.about };
      },
    );
  };
