import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { isFinished, type JobView } from '../../jobs/spec.js';
import type { AppDeps } from '../app.js';
import { tenantOf } from '../auth.js';
import { ProblemError } from '../problem.js';
import { z } from 'zod';
import { IdParams, problemResponse } from '../schemas.js';

const POLL_MS = 200;
const KEEPALIVE_MS = 15_000;

/**
 * Server-sent events for dashboards that prefer pushing to polling. The stream sends `state` on
 * every change of state or progress (data: the job, as GET /v1/jobs/:id answers) and ends after
 * the finished state; a comment line keeps idle proxies from closing it.
 */
export const eventRoutes = (deps: AppDeps): FastifyPluginAsyncZod => async (app) => {
  app.get(
    '/v1/jobs/:id/events',
    {
      schema: {
        summary: 'Job state and progress as server-sent events (text/event-stream)',
        tags: ['jobs'],
        params: IdParams,
        response: {
          200: {
            description:
              'A stream of `event: state` messages (RFC: the WHATWG HTML "server-sent events" format) whose `data` is the job as GET /v1/jobs/{id} answers it, sent on every change of state or progress; it ends after the finished state. Comment lines keep idle proxies from closing it.',
            content: { 'text/event-stream': { schema: z.string().describe('lines "id: <n>", "event: state", "data: <Job as JSON>", then a blank line; Job is #/components/schemas/Job') } },
          },
          404: problemResponse('unknown job'),
        },
      },
    },
    async (request, reply) => {
      const tenant = tenantOf(request);
      const read = async (): Promise<JobView | null> => {
        const job = await deps.queue.get(request.params.id).catch(() => null);
        return job && job.tenant === tenant ? job : null;
      };
      const first = /^job_[0-9a-f]{32}$/.test(request.params.id) ? await read() : null;
      if (!first) throw new ProblemError('job-not-found', `no job with id "${request.params.id}"`);
      reply.hijack();
      const raw = reply.raw;
      raw.writeHead(200, {
        'content-type': 'text/event-stream; charset=utf-8',
        'cache-control': 'no-store',
        connection: 'keep-alive',
        'x-request-id': String(request.id),
        'x-accel-buffering': 'no',
      });
      let last = '';
      let sequence = 0;
      const send = (job: JobView) => {
        const { recordKey: _key, ...view } = job;
        const text = JSON.stringify({ ...view, links: { self: `/v1/jobs/${job.id}`, record: `/v1/jobs/${job.id}/record` } });
        if (text === last) return;
        last = text;
        raw.write(`id: ${++sequence}\nevent: state\ndata: ${text}\n\n`);
      };
      send(first);
      if (isFinished(first.state)) {
        raw.end();
        return;
      }
      let closed = false;
      let lastWrite = Date.now();
      request.raw.on('close', () => (closed = true));
      while (!closed) {
        await new Promise((r) => setTimeout(r, POLL_MS));
        const job = await read();
        if (!job) break;
        const before = sequence;
        send(job);
        if (sequence !== before) lastWrite = Date.now();
        else if (Date.now() - lastWrite > KEEPALIVE_MS) {
          raw.write(': keep-alive\n\n');
          lastWrite = Date.now();
        }
        if (isFinished(job.state)) break;
      }
      raw.end();
    },
  );
};
