import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { ingestFile, type IngestDescription } from '../../stores/ingest.js';
import type { Readable } from 'node:stream';
import { RESUMABLE_HINT } from '../error-handler.js';
import { ProblemError } from '../problem.js';
import { isStream, receiveToFile } from '../receive.js';
import { decodeJsonSignal } from '../../signals/decode-json.js';
import { importSignal } from '../imports.js';
import { deleteSignalCascade } from '../../jobs/retention.js';
import { BinaryUploadQuery, EdfUploadQuery, IdParams, ImportSourceSchema, UploadQueryDoc, problemResponse, SignalInfoSchema, SignalUploadEnvelope, SignalUploadSchema } from '../schemas.js';
import { getSignalMeta, storeSignal } from '../../stores/signals.js';
import { validationError, zodValidator } from '../validation.js';
import { tenantOf } from '../auth.js';
import { z } from 'zod';
import type { AppDeps } from '../app.js';

/** The query of a binary upload, parsed by its format. */
export function binaryDescription(query: unknown): IngestDescription {
  if ((query as { format?: string }).format === 'edf') {
    const parsed = EdfUploadQuery.safeParse(query);
    if (!parsed.success) throw validationError(parsed.error, 'querystring');
    return { format: 'edf', channels: parsed.data.channels, samplingRate: parsed.data.samplingRate };
  }
  const parsed = BinaryUploadQuery.safeParse(query);
  if (!parsed.success) throw validationError(parsed.error, 'querystring');
  return { ...parsed.data, format: 'float32' };
}

/** EDF and EDF+ files start with the version field: "0" and seven spaces (EDF specification, header byte 0). */
const EDF_VERSION = Buffer.from('0       ', 'latin1');

/** The first chunk of a body stream; the rest is drained, as the request is about to be refused. */
function firstChunk(stream: Readable): Promise<Buffer> {
  return new Promise((resolve) => {
    const done = (chunk: Buffer) => {
      stream.off('data', done);
      stream.off('end', none);
      stream.off('error', none);
      stream.resume();
      resolve(chunk);
    };
    const none = () => done(Buffer.alloc(0));
    stream.on('data', done);
    stream.once('end', none);
    stream.once('error', none);
  });
}

/**
 * The description of a binary body from its query, checked before the body is read; an EDF file
 * sent without `format=edf` gets that hint rather than a complaint about float32 parameters.
 */
async function describeBinary(query: unknown, body: Readable): Promise<IngestDescription> {
  try {
    return binaryDescription(query);
  } catch (error) {
    if ((query as { format?: string }).format === undefined && (await firstChunk(body)).subarray(0, EDF_VERSION.length).equals(EDF_VERSION)) {
      throw new ProblemError('invalid-request', 'the body looks like an EDF/EDF+ file (it starts with the EDF version field); add ?format=edf to the URL to read it as one', '/query/format');
    }
    throw error;
  }
}

export const signalRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    // Binary bodies are not buffered: the handler streams them to a file under the store's temp
    // directory and ingests that in bounded chunks, so a gigabyte upload never sits in memory.
    app.addContentTypeParser('application/octet-stream', (_request, payload, done) => done(null, payload));

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
        let meta;
        if (isStream(request.body)) {
          const description = await describeBinary(request.query, request.body);
          const raw = await receiveToFile(request.body, await deps.store.tempDir(), deps.config.bodyLimitBytes, request.headers['content-length'], RESUMABLE_HINT);
          try {
            meta = await ingestFile(deps.store, raw.path, description, { tenant: tenantOf(request), limits, maxStoreBytes: deps.config.maxStoreBytes });
          } finally {
            await raw.remove();
          }
        } else {
          const signal = decodeJsonSignal(request.body as Parameters<typeof decodeJsonSignal>[0], limits);
          meta = await storeSignal(deps.store, signal, tenantOf(request), deps.config.maxStoreBytes);
        }
        request.log.info({ signalId: meta.id, bytes: meta.bytes }, 'signal stored');
        return reply.code(201).header('location', `/v1/signals/${meta.id}`).send(meta);
      },
    );

    app.post(
      '/v1/signals/import',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Import a recording from a file under the data root or an allow-listed URL',
          tags: ['signals'],
          body: ImportSourceSchema,
          response: {
            201: SignalInfoSchema,
            404: problemResponse('no such file'),
            413: problemResponse('the file is too large'),
            422: problemResponse('the source is not allowed, or the file cannot be used'),
            502: problemResponse('the remote server failed'),
          },
        },
      },
      async (request, reply) => {
        const meta = await importSignal(deps.config, deps.store, request.body, tenantOf(request), '');
        request.log.info({ signalId: meta.id, bytes: meta.bytes, source: 'file' in request.body ? 'file' : 'url' }, 'signal imported');
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
        const jobsDeleted = await deleteSignalCascade(deps.store, deps.queue, meta);
        request.log.info({ signalId: meta.id, jobsDeleted }, 'signal deleted');
        return { id: meta.id, deleted: true as const, jobsDeleted };
      },
    );
  };
