import { createHash, randomBytes } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdir, readdir, readFile, rename, rm, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { pipeline } from 'node:stream/promises';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { checkSamplingRate } from '../../signals/validate.js';
import { ingestFile } from '../../stores/ingest.js';
import type { Reservation } from '../../stores/store.js';
import { uploadAreaOf } from '../../stores/upload-area.js';
import type { AppDeps } from '../app.js';
import { tenantOf } from '../auth.js';
import { describeIngest } from '../imports.js';
import { ProblemError } from '../problem.js';
import { isStream, receiveToFile } from '../receive.js';
import { EventListSchema, problemResponse, SignalInfoSchema } from '../schemas.js';
import { zodValidator } from '../validation.js';

const MAX_PARTS = 10_000;

const UploadStart = z
  .strictObject({
    format: z.enum(['float32', 'edf']),
    samplingRate: z.number().positive().optional().describe('float32: Hz (required); edf: keep the signals of this rate'),
    channels: z.array(z.string().min(1)).min(1).max(1024).optional().describe('float32: names (required); edf: labels to keep'),
    epochCount: z.number().int().min(1).default(1).describe('float32 only'),
    unit: z.string().min(1).max(32).optional().describe('float32 only: nV, uV (µV), mV or V, stored as uV; default uV'),
    voltage: z.boolean().optional().describe('float32 only: false when the samples are not a voltage (the unit is kept as given)'),
    nonFinite: z.enum(['reject', 'keep']).optional().describe('float32 only'),
    events: EventListSchema.optional().describe('float32 only: events, as in a JSON upload; EDF+ files bring theirs as annotations'),
    sha256: z
      .string()
      .regex(/^[0-9a-f]{64}$/)
      .optional()
      .describe('SHA-256 of the whole file (all parts in order); checked when the upload completes'),
  })
  .meta({ id: 'UploadStart', description: 'Starts a resumable upload of a large file in numbered parts.' });

const UploadState = z
  .object({
    id: z.string(),
    format: z.enum(['float32', 'edf']),
    parts: z.array(z.object({ part: z.number().int(), bytes: z.number().int(), sha256: z.string() })),
    bytes: z.number().int(),
    createdAt: z.string(),
  })
  .meta({ id: 'Upload' });

const UploadParams = z.object({ id: z.string().regex(/^upl_[0-9a-f]{32}$/, 'an upload id is upl_ followed by 32 hex digits') });
const PartParams = UploadParams.extend({ part: z.coerce.number().int().min(1).max(MAX_PARTS) });

interface Stored {
  id: string;
  tenant: string;
  start: z.infer<typeof UploadStart>;
  createdAt: string;
}

/**
 * Resumable uploads for recordings too large for one request: POST /v1/uploads, PUT numbered
 * parts (any order, a part may be sent again), then POST …/complete, which joins the parts,
 * checks the SHA-256 the client announced and stores the signal. Parts live on the API's disk
 * under the store's temp directory until then.
 */
export const uploadRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    app.addContentTypeParser('application/octet-stream', (_request, payload, done) => done(null, payload));

    const area = uploadAreaOf(deps.store);
    const root = () => area.root();
    async function load(id: string, tenant: string): Promise<{ dir: string; stored: Stored }> {
      const dir = join(await root(), id);
      const text = await readFile(join(dir, 'upload.json'), 'utf8').catch(() => null);
      const stored = text ? (JSON.parse(text) as Stored) : null;
      if (!stored || stored.tenant !== tenant) throw new ProblemError('upload-not-found', `no upload with id "${id}"`);
      return { dir, stored };
    }
    async function parts(dir: string) {
      const names = (await readdir(dir)).filter((n) => /^\d+\.part$/.test(n));
      const list = await Promise.all(
        names.map(async (n) => {
          const [sha256, size] = await Promise.all([readFile(join(dir, `${n}.sha256`), 'utf8').catch(() => ''), stat(join(dir, n)).then((s) => s.size)]);
          return { part: Number(n.slice(0, -5)), bytes: size, sha256 };
        }),
      );
      return list.sort((a, b) => a.part - b.part);
    }
    const view = async (dir: string, stored: Stored) => {
      const list = await parts(dir);
      return { id: stored.id, format: stored.start.format, parts: list, bytes: list.reduce((s, p) => s + p.bytes, 0), createdAt: stored.createdAt };
    };

    app.post(
      '/v1/uploads',
      {
        config: { access: 'submit' },
        schema: { summary: 'Start a resumable upload', tags: ['signals'], body: UploadStart, response: { 201: UploadState, 422: problemResponse('invalid description') } },
      },
      async (request, reply) => {
        const start = request.body;
        // Refuses a float32 upload without samplingRate or channels, or with an absurd rate, now, not at completion.
        describeIngest(start, '');
        if (start.samplingRate !== undefined) checkSamplingRate(start.samplingRate, deps.config.signalLimits, '/samplingRate');
        const id = `upl_${randomBytes(16).toString('hex')}`;
        const dir = join(await root(), id);
        await mkdir(dir, { recursive: true });
        const stored: Stored = { id, tenant: tenantOf(request), start, createdAt: new Date().toISOString() };
        await writeFile(join(dir, 'upload.json'), JSON.stringify(stored));
        return reply
          .code(201)
          .header('location', `/v1/uploads/${id}`)
          .send(await view(dir, stored));
      },
    );

    app.put(
      '/v1/uploads/:id/parts/:part',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Send one numbered part (1, 2, …) of the file; sending a part again replaces it',
          tags: ['signals'],
          params: PartParams,
          response: { 200: z.object({ part: z.number().int(), bytes: z.number().int(), sha256: z.string() }), 404: problemResponse('unknown upload'), 413: problemResponse('part too large') },
        },
        validatorCompiler: zodValidator({ params: PartParams }),
      },
      async (request) => {
        const { id, part } = request.params as z.infer<typeof PartParams>;
        const { dir } = await load(id, tenantOf(request));
        if (!isStream(request.body)) throw new ProblemError('unsupported-media-type', 'send the part as application/octet-stream');
        const { bodyLimitBytes, maxStoreBytes } = deps.config;
        const declared = request.headers['content-length'] === undefined ? Number.NaN : Number(request.headers['content-length']);
        // A declared length is reserved before a byte is read, so a part that cannot fit is refused (507) at once.
        let reservation: Reservation | null = declared >= 0 && declared <= bodyLimitBytes ? await area.reservePart(declared, maxStoreBytes) : null;
        try {
          const received = await receiveToFile(request.body, dir, bodyLimitBytes, request.headers['content-length'], '', true);
          try {
            if (reservation?.bytes !== received.bytes) {
              reservation?.release();
              reservation = await area.reservePart(received.bytes, maxStoreBytes);
            }
            await writeFile(join(dir, `${part}.part.sha256`), received.sha256);
            await rename(received.path, join(dir, `${part}.part`));
          } catch (error) {
            await received.remove();
            throw error;
          }
          area.keepPart(id, part, reservation);
          return { part, bytes: received.bytes, sha256: received.sha256 };
        } catch (error) {
          reservation?.release();
          throw error;
        }
      },
    );

    app.get(
      '/v1/uploads/:id',
      {
        schema: { summary: 'Parts received so far (to resume an interrupted upload)', tags: ['signals'], params: UploadParams, response: { 200: UploadState, 404: problemResponse('unknown upload') } },
      },
      async (request) => {
        const { dir, stored } = await load(request.params.id, tenantOf(request));
        return view(dir, stored);
      },
    );

    app.delete(
      '/v1/uploads/:id',
      {
        config: { access: 'submit' },
        schema: { summary: 'Abandon an upload and its parts', tags: ['signals'], params: UploadParams, response: { 200: z.object({ id: z.string(), deleted: z.literal(true) }) } },
      },
      async (request) => {
        await load(request.params.id, tenantOf(request));
        await area.remove(request.params.id);
        return { id: request.params.id, deleted: true as const };
      },
    );

    app.post(
      '/v1/uploads/:id/complete',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Join the parts in order, check the SHA-256 and store the signal',
          tags: ['signals'],
          params: UploadParams,
          body: z
            .strictObject({
              sha256: z
                .string()
                .regex(/^[0-9a-f]{64}$/)
                .optional(),
              parts: z.number().int().min(1).max(MAX_PARTS).optional().describe('the number of parts sent; checked'),
            })
            .optional(),
          response: { 201: SignalInfoSchema, 404: problemResponse('unknown upload'), 422: problemResponse('missing parts, a hash mismatch or an unusable file') },
        },
      },
      async (request, reply) => {
        const { dir, stored } = await load(request.params.id, tenantOf(request));
        const list = await parts(dir);
        const expectedCount = request.body?.parts ?? list.length;
        if (list.length === 0) throw new ProblemError('invalid-signal', 'no part has been received', '/parts');
        const missing = Array.from({ length: expectedCount }, (_, i) => i + 1).filter((n) => !list.some((p) => p.part === n));
        if (missing.length > 0 || list.length !== expectedCount) {
          throw new ProblemError(
            'invalid-signal',
            `parts must be numbered 1…${expectedCount} without gaps; missing ${missing.slice(0, 10).join(', ') || 'none'}, received ${list
              .map((p) => p.part)
              .slice(0, 10)
              .join(', ')}`,
            '/parts',
          );
        }
        const joined = join(dir, 'joined.raw');
        const hash = createHash('sha256');
        const names = list.map((p) => join(dir, `${p.part}.part`));
        // One pass over the parts, in order: hashed and written as they are read.
        await pipeline(async function* () {
          for (const name of names) {
            for await (const chunk of createReadStream(name)) {
              hash.update(chunk as Buffer);
              yield chunk;
            }
          }
        }, createWriteStream(joined));
        const actual = hash.digest('hex');
        const expected = request.body?.sha256 ?? stored.start.sha256;
        if (expected && expected !== actual) {
          await rm(joined, { force: true });
          throw new ProblemError(
            'hash-mismatch',
            `the joined parts have SHA-256 ${actual}, not the ${expected} announced; resend the parts that differ (GET the upload lists each part's hash)`,
            '/sha256',
          );
        }
        // The parts stop counting while their signal is stored: it is the same data, which is counted once.
        area.release(stored.id);
        try {
          const meta = await ingestFile(deps.store, joined, describeIngest(stored.start, ''), { tenant: stored.tenant, limits: deps.config.signalLimits, maxStoreBytes: deps.config.maxStoreBytes });
          // Study manifests may name the upload instead of the signal it became.
          await deps.store.putDocument('upload-signals', stored.id, JSON.stringify({ tenant: stored.tenant, signal: meta.id }));
          await area.remove(stored.id);
          request.log.info({ uploadId: stored.id, signalId: meta.id, bytes: meta.bytes, parts: list.length }, 'upload completed');
          return reply.code(201).header('location', `/v1/signals/${meta.id}`).send(meta);
        } catch (error) {
          await rm(joined, { force: true });
          await area.holdOnDisk(stored.id);
          throw error;
        }
      },
    );
  };
