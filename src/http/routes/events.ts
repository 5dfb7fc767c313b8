import type { FastifyReply, FastifyRequest } from 'fastify';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { isFinished, type JobView } from '../../jobs/spec.js';
import type { AppDeps } from '../app.js';
import { tenantOf } from '../auth.js';
import { ProblemError } from '../problem.js';
import { IdParams, problemResponse } from '../schemas.js';
import { presentJob } from './present.js';

const POLL_MS = 200;
const KEEPALIVE_MS = 15_000;
const JOB_ID = /^job_[0-9a-f]{32}$/;
/** A page of a dashboard; one stream instead of one per job keeps browsers under their per-host connection limit. */
const MAX_STREAMED_JOBS = 200;

/** The documented 200 of an event stream; `ending` says what else it sends and when it ends. */
function eventStream(ending: string) {
  return {
    description: `A stream of \`event: state\` messages (the WHATWG HTML "server-sent events" format) whose \`data\` is a job as GET /v1/jobs/{id} answers it, sent on every change of state or progress; ${ending}. Comment lines keep idle proxies from closing it.`,
    content: { 'text/event-stream': { schema: z.string().describe('lines "id: <n>", "event: state", "data: <Job as JSON>", then a blank line; Job is #/components/schemas/Job') } },
  };
}

/**
 * Server-sent events for dashboards that prefer pushing to polling. The stream sends `state` on
 * every change of a job's state or progress (data: the job, as GET /v1/jobs/:id answers) and ends
 * once every job it watches has finished; a comment line keeps idle proxies from closing it.
 */
export const eventRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    const readAs =
      (tenant: string) =>
      async (id: string): Promise<JobView | null> => {
        const job = JOB_ID.test(id) ? await deps.queue.get(id).catch(() => null) : null;
        return job && job.tenant === tenant ? job : null;
      };

    app.get(
      '/v1/jobs/:id/events',
      {
        schema: {
          summary: 'Job state and progress as server-sent events (text/event-stream)',
          tags: ['jobs'],
          params: IdParams,
          response: {
            200: eventStream('it ends after the finished state'),
            404: problemResponse('unknown job'),
          },
        },
      },
      async (request, reply) => {
        const read = readAs(tenantOf(request));
        const first = await read(request.params.id);
        if (!first) throw new ProblemError('job-not-found', `no job with id "${request.params.id}"`);
        await streamJobs(request, reply, [first], read);
      },
    );

    app.get(
      '/v1/jobs/events',
      {
        schema: {
          summary: 'State and progress of several jobs as one stream of server-sent events (text/event-stream)',
          description: `One \`state\` event per change of any listed job; the stream ends when all have finished. Unknown ids are left out (listed in the first \`unknown\` event). At most ${MAX_STREAMED_JOBS} ids.`,
          tags: ['jobs'],
          querystring: z.strictObject({
            ids: z
              .string()
              .min(1)
              .transform((s) => [...new Set(s.split(',').map((id) => id.trim()))])
              .pipe(z.array(z.string().min(1).max(200)).max(MAX_STREAMED_JOBS))
              .describe('comma-separated job ids'),
          }),
          response: {
            200: eventStream('first, if any id is unknown, one `event: unknown` message whose `data` is `{"ids": [...]}`; it ends once every listed job has finished'),
            400: problemResponse('no ids, or too many'),
          },
        },
      },
      async (request, reply) => {
        const read = readAs(tenantOf(request));
        const ids = request.query.ids;
        const first = await Promise.all(ids.map(read));
        const known = first.filter((j): j is JobView => j !== null);
        const unknown = ids.filter((_, i) => first[i] === null);
        await streamJobs(request, reply, known, read, unknown);
      },
    );
  };

/** Writes the jobs' states, then every change, until all have finished or the client leaves. */
async function streamJobs(request: FastifyRequest, reply: FastifyReply, first: JobView[], read: (id: string) => Promise<JobView | null>, unknown: string[] = []): Promise<void> {
  reply.hijack();
  const raw = reply.raw;
  raw.writeHead(200, {
    'content-type': 'text/event-stream; charset=utf-8',
    'cache-control': 'no-store',
    connection: 'keep-alive',
    'x-request-id': String(request.id),
    'x-accel-buffering': 'no',
    ...corsHeaders(reply),
  });
  let sequence = 0;
  if (unknown.length > 0) raw.write(`id: ${++sequence}\nevent: unknown\ndata: ${JSON.stringify({ ids: unknown })}\n\n`);
  const last = new Map<string, string>();
  const send = (job: JobView): boolean => {
    const text = JSON.stringify(presentJob(job));
    if (last.get(job.id) === text) return false;
    last.set(job.id, text);
    raw.write(`id: ${++sequence}\nevent: state\ndata: ${text}\n\n`);
    return true;
  };
  let open = first.filter((job) => (send(job), !isFinished(job.state))).map((job) => job.id);
  let closed = false;
  let lastWrite = Date.now();
  request.raw.on('close', () => (closed = true));
  while (!closed && open.length > 0) {
    await new Promise((r) => setTimeout(r, POLL_MS));
    const jobs = await Promise.all(open.map(read));
    let wrote = false;
    for (const job of jobs) if (job && send(job)) wrote = true;
    if (wrote) lastWrite = Date.now();
    else if (Date.now() - lastWrite > KEEPALIVE_MS) {
      raw.write(': keep-alive\n\n');
      lastWrite = Date.now();
    }
    // A job that disappears (removed) stops being watched, as does one that finished.
    open = jobs.filter((job): job is JobView => job !== null && !isFinished(job.state)).map((job) => job.id);
  }
  raw.end();
}

/** A hijacked reply skips fastify's onSend hooks; carry over the CORS headers the cors plugin set. */
function corsHeaders(reply: FastifyReply): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [name, value] of Object.entries(reply.getHeaders())) {
    if (name.startsWith('access-control-') || name === 'vary') out[name] = String(value);
  }
  return out;
}
