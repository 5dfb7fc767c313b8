import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import type { JobView } from '../../jobs/spec.js';
import { decodeJsonSignal } from '../../signals/decode-json.js';
import { SignalInputError } from '../../signals/errors.js';
import type { SignalLimits } from '../../signals/limits.js';
import type { Signal } from '../../signals/signal.js';
import type { AppDeps } from '../app.js';
import { ProblemError } from '../problem.js';
import { FeatureRecordSchema, IdParams, JobRequestEnvelope, JobRequestSchema, JobViewSchema, problemResponse } from '../schemas.js';
import { getRecipe, getSignalMeta, pinRecipe, planJob, storeSignal } from '../services.js';
import { zodValidator } from '../validation.js';

/** Decodes an inline signal, with pointers relative to the whole job body. */
function decodeInline(signal: unknown, limits: SignalLimits): Signal {
  try {
    return decodeJsonSignal(signal as Parameters<typeof decodeJsonSignal>[0], limits);
  } catch (error) {
    if (error instanceof SignalInputError) throw new SignalInputError(error.code, error.message, `/signal${error.pointer ?? ''}`);
    throw error;
  }
}

function present(job: JobView) {
  const { recordKey: _key, ...rest } = job;
  return { ...rest, links: { self: `/v1/jobs/${job.id}`, record: `/v1/jobs/${job.id}/record` } };
}

export const jobRoutes = (deps: AppDeps): FastifyPluginAsyncZod => async (app) => {
  const { store, queue, config } = deps;

  async function requireJob(id: string): Promise<JobView> {
    const job = /^job_[0-9a-f]{32}$/.test(id) ? await queue.get(id) : null;
    if (!job) throw new ProblemError('job-not-found', `no job with id "${id}"`);
    return job;
  }

  app.post(
    '/v1/jobs',
    {
      config: { recipePointer: '/recipe' },
      schema: {
        summary: 'Submit an analysis',
        description:
          'The signal is a stored signal id or an inline upload; the recipe is a pinned recipe id or an inline recipe. The recipe is checked against the signal before anything is queued. An identical job that already succeeded answers 200 with its finished state and is not computed again.',
        tags: ['jobs'],
        body: JobRequestSchema,
        response: {
          200: JobViewSchema.describe('an identical job already exists'),
          202: JobViewSchema.describe('queued'),
          400: problemResponse('malformed request'),
          404: problemResponse('unknown signal or recipe id'),
          413: problemResponse('body too large'),
          422: problemResponse('the recipe is invalid or does not fit the signal'),
          503: problemResponse('the queue is unavailable; retry after Retry-After seconds'),
        },
      },
      validatorCompiler: zodValidator({ body: JobRequestEnvelope }),
    },
    async (request, reply) => {
      const body = request.body as { signal: unknown; recipe: unknown };
      const meta = typeof body.signal === 'string' ? await getSignalMeta(store, body.signal, '/signal') : await storeSignal(store, decodeInline(body.signal, config.signalLimits));
      const pinned = typeof body.recipe === 'string' ? await getRecipe(store, body.recipe, '/recipe') : await pinRecipe(store, body.recipe);
      const { jobId, spec } = planJob(config, meta, pinned);
      let submitted;
      try {
        submitted = await queue.submit(spec, jobId);
      } catch (error) {
        request.log.warn({ err: error, jobId }, 'queue unavailable');
        throw new ProblemError('queue-unavailable', 'the job queue cannot be reached; nothing was queued', null, { 'retry-after': '5' });
      }
      request.log.info({ jobId, created: submitted.created, signalId: meta.id, recipeId: pinned.id }, 'job submitted');
      const status = !submitted.created && submitted.job.state === 'succeeded' ? 200 : 202;
      return reply.code(status).header('location', `/v1/jobs/${jobId}`).send(present(submitted.job));
    },
  );

  app.get(
    '/v1/jobs/:id',
    {
      schema: { summary: 'Job state and progress', tags: ['jobs'], params: IdParams, response: { 200: JobViewSchema, 404: problemResponse('unknown job') } },
    },
    async (request) => present(await requireJob(request.params.id)),
  );

  app.delete(
    '/v1/jobs/:id',
    {
      schema: {
        summary: 'Cancel a job that has not finished',
        tags: ['jobs'],
        params: IdParams,
        response: { 200: JobViewSchema, 404: problemResponse('unknown job'), 409: problemResponse('the job already finished') },
      },
    },
    async (request) => {
      const job = await requireJob(request.params.id);
      if (job.state === 'succeeded' || job.state === 'failed') {
        throw new ProblemError('job-finished', `job ${job.id} already ${job.state}; only queued or running jobs can be canceled`);
      }
      return present((await queue.cancel(job.id)) ?? job);
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
      const job = await requireJob(request.params.id);
      if (job.state !== 'succeeded') {
        throw new ProblemError('record-not-ready', `job ${job.id} is ${job.state}${job.problem ? `: ${job.problem.detail}` : ''}; the record exists once it has succeeded`);
      }
      const text = await store.getDocument('records', job.recordKey);
      if (text === null) throw new ProblemError('internal', `the record of job ${job.id} is missing from the store`);
      return reply.type('application/json').send(text as never);
    },
  );
};
