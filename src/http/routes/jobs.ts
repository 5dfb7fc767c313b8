import type { FastifyRequest } from 'fastify';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { decodeCursor, encodeCursor, type JobListFilter } from '../../jobs/list.js';
import { isFinished, JOB_STATES, type JobView } from '../../jobs/spec.js';
import { settledJob } from '../../jobs/wait.js';
import { METHODS } from '../../recipes/schema.js';
import { decodeJsonSignal } from '../../signals/decode-json.js';
import type { SignalView } from '../../signals/view.js';
import type { AppDeps } from '../app.js';
import { ProblemError } from '../problem.js';
import { requireJob as findJob, unavailable } from '../job-access.js';
import { importSignal } from '../imports.js';
import { locatedUnder } from '../../common/errors.js';
import { getRecipe, pinRecipe, planJob } from '../../jobs/plan.js';
import { warnDeprecated } from '../deprecations.js';
import { indexedRecordKey, indexJob } from '../../jobs/retention.js';
import { getSignalMeta, storeSignal } from '../../stores/signals.js';
import type { SignalMeta } from '../../stores/store.js';
import type { Signal } from '../../signals/signal.js';
import { FeatureRecordSchema, IdParams, JobRequestEnvelope, JobRequestSchema, JobViewSchema, problemResponse, type JobRequest } from '../schemas.js';
import { zodValidator } from '../validation.js';
import { presentJob } from './present.js';
import { tenantOf } from '../auth.js';
import { z } from 'zod';

/** The same list URL with the cursor replaced. */
function nextPageUrl(url: string, cursor: string): string {
  const parsed = new URL(url, 'http://localhost');
  parsed.searchParams.set('cursor', cursor);
  return `${parsed.pathname}${parsed.search}`;
}

/** An ISO 8601 instant, normalized to the form job times are stored in so that they compare as strings. */
const Instant = z.iso
  .datetime({ offset: true })
  .transform((s) => new Date(s).toISOString())
  .describe('ISO 8601 date-time, e.g. 2026-12-01T00:00:00Z');

const JobListQuery = z.strictObject({
  limit: z.coerce.number().int().min(1).max(1000).default(100),
  cursor: z.string().min(1).max(512).optional().describe('nextCursor of the previous page'),
  state: z
    .string()
    .transform((s) => s.split(',').map((part) => part.trim()))
    .pipe(z.array(z.enum(JOB_STATES)))
    .optional()
    .describe('one state or several, comma-separated (queued,running)'),
  method: z.enum(METHODS).optional(),
  study: z.string().min(1).max(256).optional().describe('jobs whose "study" label is this'),
  createdAfter: Instant.optional().describe('only jobs created strictly after this ISO 8601 date-time'),
  createdBefore: Instant.optional().describe('only jobs created strictly before this ISO 8601 date-time'),
  signal: z.string().optional().describe('only jobs on this signal'),
  tenant: z.literal('all').optional().describe('admin only: every tenant'),
});

export const jobRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    const { store, queue, config } = deps;

    const requireJob = (id: string, tenant: string): Promise<JobView> => findJob(queue, id, tenant);

    const SubmitQuery = z.strictObject({
      wait: z.coerce
        .number()
        .min(0)
        .max(config.maxWaitSeconds, `at most ${config.maxWaitSeconds} seconds on this server (MAX_WAIT_SECONDS)`)
        .optional()
        .describe(
          `seconds (decimals allowed, at most MAX_WAIT_SECONDS, ${config.maxWaitSeconds} by default) to hold the request for the job to finish: a job that finishes in time is answered 200 with its final state (resultHash, or the failed job's problem); otherwise 202 as without it`,
        ),
    });

    /**
     * The record key of the request's job once it has succeeded. While the queue is down, a record
     * that is already stored (or, with STORE=redis, cached by this API) is still served.
     */
    async function succeededRecordKey(request: FastifyRequest<{ Params: { id: string } }>, notReady: string): Promise<string> {
      const tenant = tenantOf(request);
      try {
        const job = await requireJob(request.params.id, tenant);
        if (job.state !== 'succeeded') throw new ProblemError('record-not-ready', `job ${job.id} is ${job.state}${job.problem ? `: ${job.problem.detail}` : ''}; ${notReady}`);
        return job.recordKey;
      } catch (error) {
        const fallback = error instanceof ProblemError && error.code === 'queue-unavailable' ? await indexedRecordKey(store, request.params.id, tenant) : null;
        if (!fallback) throw error;
        request.log.info({ jobId: request.params.id }, 'record served from the store while the queue is unavailable');
        return fallback;
      }
    }

    /**
     * The job once it finishes within `waitMs`, else its latest state. Stops waiting when the client
     * goes away. The job is queued whatever happens here, so a queue fault answers the state known.
     */
    async function finishedWithin(jobId: string, known: JobView, waitMs: number, request: FastifyRequest, response: NodeJS.EventEmitter): Promise<JobView> {
      if (isFinished(known.state)) return known;
      const gone = new AbortController();
      const abandon = () => gone.abort();
      response.once('close', abandon);
      try {
        return (await settledJob(queue, jobId, waitMs, gone.signal)) ?? known;
      } catch (error) {
        request.log.warn({ err: error, jobId }, 'waiting for the job failed; answering its last known state');
        return known;
      } finally {
        response.off('close', abandon);
      }
    }

    app.post(
      '/v1/jobs',
      {
        config: {
          access: 'submit',
          unionForms: {
            '/signal':
              'a stored signal id (string), a reference {signal, start?, end?, channels?, badSpans?}, an import {file or url, format?, …} or an upload {samplingRate, channels, data or epochs}',
            '/recipe': 'a pinned recipe id (string) or a recipe object with a "method"',
          },
        },
        schema: {
          summary: 'Submit an analysis',
          description:
            'The signal is a stored signal id or an inline upload; the recipe is a pinned recipe id or an inline recipe. The recipe is checked against the signal before anything is queued. An identical job that already succeeded answers 200 with its finished state and is not computed again. With `?wait=<seconds>` the request is held until the job finishes, so a client need not poll: 200 with the finished job when it finishes in time, else 202.',
          tags: ['jobs'],
          querystring: SubmitQuery,
          body: JobRequestSchema,
          response: {
            200: JobViewSchema.describe('finished: an identical job had already succeeded, or the job finished within ?wait'),
            202: JobViewSchema.describe('queued or running (also when ?wait passed before the job finished)'),
            400: problemResponse('malformed request or query parameter (e.g. wait beyond MAX_WAIT_SECONDS)'),
            404: problemResponse('unknown signal or recipe id'),
            413: problemResponse('body too large'),
            422: problemResponse('the recipe is invalid or does not fit the signal'),
            503: problemResponse('the queue is unavailable; retry after Retry-After seconds'),
          },
        },
        validatorCompiler: zodValidator({ body: JobRequestEnvelope, querystring: SubmitQuery }, { parsedBody: true }),
      },
      async (request, reply) => {
        const { signal, recipe, labels } = request.body as unknown as JobRequest;
        const tenant = tenantOf(request);
        let view: SignalView | null = null;
        let meta: SignalMeta;
        let uploaded: Signal | undefined;
        switch (signal.kind) {
          case 'stored':
            meta = await getSignalMeta(store, signal.id, tenant, '/signal');
            break;
          case 'view':
            meta = await getSignalMeta(store, signal.id, tenant, '/signal/signal');
            view = signal.view;
            break;
          case 'import':
            meta = await importSignal(config, store, signal.source, tenant, '/signal');
            break;
          case 'upload':
            meta = await locatedUnder('/signal', async () => {
              const decoded = decodeJsonSignal(signal.upload as Parameters<typeof decodeJsonSignal>[0], config.signalLimits);
              const stored = await storeSignal(store, decoded, tenant, config.maxStoreBytes);
              // The samples just stored: the same content hash makes them the values the store gives back, so
              // the job's thread need not read them.
              uploaded = decoded;
              return stored;
            });
            break;
        }
        const pinned = typeof recipe === 'string' ? await getRecipe(store, recipe, '/recipe') : await locatedUnder('/recipe', () => pinRecipe(store, recipe));
        if (typeof recipe !== 'string') warnDeprecated(reply, recipe, '/recipe');
        const { jobId, spec } = planJob(config.recipeLimits, meta, pinned, view, labels);
        let submitted;
        try {
          submitted = await queue.submit(spec, jobId, uploaded ? { signal: uploaded } : {});
        } catch (error) {
          request.log.warn({ err: error, jobId }, 'queue unavailable');
          throw unavailable(error, 'nothing was queued');
        }
        deps.metrics?.jobSubmitted(spec.recipe.method, submitted.created);
        if (submitted.created) await indexJob(store, queue, jobId, spec);
        request.log.info({ jobId, created: submitted.created, signalId: meta.id, recipeId: pinned.id }, 'job submitted');
        const waitMs = (request.query.wait ?? 0) * 1000;
        const job = waitMs > 0 ? await finishedWithin(jobId, submitted.job, waitMs, request, reply.raw) : submitted.job;
        // 200 for a job that had already succeeded (an identical earlier submission), or one that
        // finished within the asked wait; a job created by this request is otherwise accepted (202),
        // however quickly a worker happens to finish it.
        const status = (!submitted.created && submitted.job.state === 'succeeded') || (waitMs > 0 && isFinished(job.state)) ? 200 : 202;
        return reply.code(status).header('location', `/v1/jobs/${jobId}`).send(presentJob(job));
      },
    );

    app.get(
      '/v1/jobs/:id',
      {
        schema: { summary: 'Job state and progress', tags: ['jobs'], params: IdParams, response: { 200: JobViewSchema, 404: problemResponse('unknown job') } },
      },
      async (request) => presentJob(await requireJob(request.params.id, tenantOf(request))),
    );

    app.get(
      '/v1/jobs',
      {
        schema: {
          summary: "List jobs, newest first (the caller's tenant; admin keys may ask for every tenant)",
          description:
            'Cursor paging: pass `nextCursor` of one page as `cursor` to get the next; the cursor is opaque. Filters combine with AND. Each job carries its method and labels, so a dashboard needs no lookup per job.',
          tags: ['jobs'],
          querystring: JobListQuery,
          response: {
            200: z.object({
              jobs: z.array(JobViewSchema),
              nextCursor: z.string().nullable().describe('pass as `cursor` for the next page; null on the last page'),
              links: z.object({ next: z.string().nullable() }),
            }),
            400: problemResponse('a malformed filter or cursor'),
            403: problemResponse('tenant=all needs an admin key'),
            503: problemResponse('the queue is unavailable; retry after Retry-After seconds'),
          },
        },
      },
      async (request) => {
        const query = request.query;
        const all = query.tenant === 'all';
        if (all && request.principal?.role !== 'admin') throw new ProblemError('forbidden', "listing every tenant's jobs needs an admin key");
        const after = query.cursor === undefined ? undefined : (decodeCursor(query.cursor) ?? undefined);
        if (query.cursor !== undefined && !after) {
          throw new ProblemError('invalid-request', 'query parameter /query/cursor: not a cursor this service issued; pass nextCursor from a previous page unchanged', '/query/cursor');
        }
        const filter: JobListFilter = {
          tenant: all ? null : tenantOf(request),
          limit: query.limit + 1,
          ...(query.signal !== undefined ? { signal: query.signal } : {}),
          ...(query.state !== undefined ? { states: query.state } : {}),
          ...(query.method !== undefined ? { method: query.method } : {}),
          ...(query.study !== undefined ? { study: query.study } : {}),
          ...(query.createdAfter !== undefined ? { createdAfter: query.createdAfter } : {}),
          ...(query.createdBefore !== undefined ? { createdBefore: query.createdBefore } : {}),
          ...(after ? { after } : {}),
        };
        let jobs: JobView[];
        try {
          jobs = await queue.list(filter);
        } catch (error) {
          throw unavailable(error);
        }
        const page = jobs.slice(0, query.limit);
        const last = page.at(-1);
        const nextCursor = jobs.length > query.limit && last ? encodeCursor(last) : null;
        return { jobs: page.map(presentJob), nextCursor, links: { next: nextCursor === null ? null : nextPageUrl(request.url, nextCursor) } };
      },
    );

    app.delete(
      '/v1/jobs/:id',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Cancel a job that has not finished',
          tags: ['jobs'],
          params: IdParams,
          response: { 200: JobViewSchema, 404: problemResponse('unknown job'), 409: problemResponse('the job already finished') },
        },
      },
      async (request) => {
        const job = await requireJob(request.params.id, tenantOf(request));
        if (job.state === 'succeeded' || job.state === 'failed') {
          throw new ProblemError('job-finished', `job ${job.id} already ${job.state}; only queued or running jobs can be canceled`);
        }
        return presentJob((await queue.cancel(job.id)) ?? job);
      },
    );

    app.get(
      '/v1/jobs/:id/attachments/:name',
      {
        schema: {
          summary: "One binary matrix of a time–frequency record (e.g. one channel's power), as listed in result.timeFrequency.attachments",
          description: 'Little-endian float64 (or uint8 for masks), row-major with the shape in the x-rhythmetric-shape header (e.g. "200,40" for times × frequencies).',
          tags: ['jobs'],
          params: z.object({ id: z.string().min(1).max(200), name: z.string().regex(/^[a-z0-9-]{1,64}$/) }),
          response: {
            200: {
              description: 'the matrix as raw bytes (its headers are documented in the OpenAPI document)',
              content: { 'application/octet-stream': { schema: z.string().meta({ format: 'binary' }) } },
            },
            404: problemResponse('unknown job or attachment'),
            409: problemResponse('the job has not succeeded'),
          },
        },
      },
      async (request, reply) => {
        const jobId = request.params.id;
        const recordKey = await succeededRecordKey(request, 'attachments exist once it has succeeded');
        const text = await store.getDocument('records', recordKey);
        const listed = text ? ((JSON.parse(text) as { attachments?: { name: string; shape: number[]; dtype: string; sha256: string }[] }).attachments ?? []) : [];
        const entry = listed.find((a) => a.name === request.params.name);
        const bytes = entry ? await store.getAttachment(`${recordKey}.${entry.name}`) : null;
        if (!entry || !bytes)
          throw new ProblemError('attachment-not-found', `job ${jobId} has no attachment "${request.params.name}"; the record lists ${listed.map((a) => a.name).join(', ') || 'none'}`);
        return reply
          .type('application/octet-stream')
          .header('x-rhythmetric-shape', entry.shape.join(','))
          .header('x-rhythmetric-dtype', entry.dtype)
          .header('etag', `"${entry.sha256}"`)
          .send(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) as never);
      },
    );

    app.get(
      '/v1/jobs/:id/record',
      {
        schema: {
          summary: 'The feature record of a succeeded job',
          tags: ['jobs'],
          params: IdParams,
          response: { 200: FeatureRecordSchema, 404: problemResponse('unknown job'), 409: problemResponse('the job has not succeeded') },
        },
        // Records are stored as JSON text and sent as they are: no re-serialization of large spectra.
        serializerCompiler: () => (data) => (typeof data === 'string' ? data : JSON.stringify(data)),
      },
      async (request, reply) => {
        const recordKey = await succeededRecordKey(request, 'the record exists once it has succeeded');
        const text = await store.getDocument('records', recordKey);
        if (text === null) throw new ProblemError('internal', `the record of job ${request.params.id} is missing from the store`);
        return reply.type('application/json').send(text as never);
      },
    );
  };
