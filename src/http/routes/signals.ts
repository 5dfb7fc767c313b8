import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { decodeBinarySignal } from '../../signals/decode-binary.js';
import { decodeJsonSignal } from '../../signals/decode-json.js';
import { edfToSignal } from '../../signals/edf-to-signal.js';
import { BinaryUploadQuery, EdfUploadQuery, IdParams, UploadQueryDoc, problemResponse, SignalInfoSchema, SignalUploadEnvelope, SignalUploadSchema } from '../schemas.js';
import { getSignalMeta, storeSignal } from '../services.js';
import { validationError, zodValidator } from '../validation.js';
import { tenantOf } from '../auth.js';
import { z } from 'zod';
import type { AppDeps } from '../app.js';

export const signalRoutes = (deps: AppDeps): FastifyPluginAsyncZod => async (app) => {
  app.addContentTypeParser('application/octet-stream', { parseAs: 'buffer', bodyLimit: deps.config.bodyLimitBytes }, (_request, body, done) => done(null, body));

  app.post(
    '/v1/signals',
    {
      config: { bodyProblem: 'invalid-signal', access: 'submit' },
      schema: {
        summary: 'Upload a signal',
        description:
          'JSON (`data`: channel × sample, or `epochs`: epoch × channel × sample), a binary body (`application/octet-stream`: little-endian float32 laid out [epoch][channel][sample], described by the query), or an EDF/EDF+ file (`application/octet-stream` with `?format=edf`; voltages are stored in µV, EDF+ annotations become events). The id follows from the content hash: the same content gives the same id.',
        tags: ['signals'],
        body: SignalUploadSchema,
        querystring: UploadQueryDoc,
        response: {
          201: SignalInfoSchema.describe('stored (or already stored) signal'),
          400: problemResponse('malformed request'),
          413: problemResponse('body too large'),
          415: problemResponse('unsupported content type'),
          422: problemResponse('the signal cannot be used (pointer says where)'),
        },
      },
      validatorCompiler: zodValidator({ body: SignalUploadEnvelope }),
    },
    async (request, reply) => {
      const limits = deps.config.signalLimits;
      let signal;
      if (Buffer.isBuffer(request.body) && (request.query as { format?: string }).format === 'edf') {
        const parsed = EdfUploadQuery.safeParse(request.query);
        if (!parsed.success) throw validationError(parsed.error, 'querystring');
        signal = edfToSignal(request.body, { ...(parsed.data.channels ? { channels: parsed.data.channels } : {}), ...(parsed.data.samplingRate ? { samplingRate: parsed.data.samplingRate } : {}) }, limits);
      } else if (Buffer.isBuffer(request.body)) {
        const parsed = BinaryUploadQuery.safeParse(request.query);
        if (!parsed.success) throw validationError(parsed.error, 'querystring');
        signal = decodeBinarySignal(request.body, parsed.data, limits);
      } else {
        signal = decodeJsonSignal(request.body as Parameters<typeof decodeJsonSignal>[0], limits);
      }
      const meta = await storeSignal(deps.store, signal, tenantOf(request), deps.config.maxStoreBytes);
      request.log.info({ signalId: meta.id, bytes: meta.bytes }, 'signal stored');
      return reply.code(201).header('location', `/v1/signals/${meta.id}`).send(meta);
    },
  );

  app.get(
    '/v1/signals/:id',
    {
      schema: {
        summary: 'Describe a stored signal',
        tags: ['signals'],
        params: IdParams,
        response: { 200: SignalInfoSchema, 404: problemResponse('unknown signal') },
      },
    },
    async (request) => getSignalMeta(deps.store, request.params.id, tenantOf(request)),
  );

  app.delete(
    '/v1/signals/:id',
    {
      config: { access: 'admin' },
      schema: {
        summary: 'Delete a signal, the jobs that use it and their records',
        tags: ['signals'],
        params: IdParams,
        response: { 200: z.object({ id: z.string(), deleted: z.literal(true), jobsDeleted: z.number().int() }), 404: problemResponse('unknown signal') },
      },
    },
    async (request) => {
      const meta = await getSignalMeta(deps.store, request.params.id, tenantOf(request));
      const jobs = await deps.queue.list({ tenant: meta.tenant, signal: meta.id, limit: 100_000 });
      for (const job of jobs) {
        await deps.queue.remove(job.id);
        await deps.store.deleteDocument('records', job.recordKey);
      }
      await deps.store.deleteSignal(meta.id);
      request.log.info({ signalId: meta.id, jobsDeleted: jobs.length }, 'signal deleted');
      return { id: meta.id, deleted: true as const, jobsDeleted: jobs.length };
    },
  );
};

