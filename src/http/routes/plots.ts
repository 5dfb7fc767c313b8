import { createHash } from 'node:crypto';
import type { FastifyReply, FastifyRequest } from 'fastify';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { DomainError } from '../../common/errors.js';
import type { FeatureRecord } from '../../engine/record.js';
import type { JobQueue } from '../../jobs/queue.js';
import { checkApplicable, plotKind, PLOT_KIND_NAMES, PLOT_KINDS, type PlotOptions } from '../../plots/index.js';
import type { Store } from '../../stores/store.js';
import type { AppDeps } from '../app.js';
import { tenantOf } from '../auth.js';
import { requireJob } from '../job-access.js';
import { ProblemError } from '../problem.js';
import { problemResponse } from '../schemas.js';

const kindList = PLOT_KIND_NAMES.map((k) => `\`${k}\` (${PLOT_KINDS[k].summary})`).join(', ');

export const PlotQuery = z.strictObject({
  channels: z.string().min(1).max(4000).optional().describe('comma-separated channel names, drawn in this order; default every channel'),
  width: z.coerce.number().int().min(200).max(4000).default(800).describe('px'),
  height: z.coerce.number().int().min(150).max(3000).default(480).describe('px'),
  scale: z.enum(['db', 'log10']).default('db').describe('psd: power in dB re 1 unit²/Hz on a linear axis, or unit²/Hz on a log10 axis'),
  frequencyRange: z
    .string()
    .regex(/^\d+(\.\d+)?,\d+(\.\d+)?$/, 'two numbers "low,high" in Hz')
    .optional()
    .describe('"low,high" Hz, both included; default the record\'s frequencies above 0 Hz'),
  epochs: z.enum(['true', 'false']).default('true').describe('psd: draw per-epoch spectra faintly behind the mean, when the record has them (perEpoch)'),
});
type PlotQueryValue = z.output<typeof PlotQuery>;

const svgResponse = (description: string) => ({ description, content: { 'image/svg+xml': { schema: z.string() } } });

/** Query → plot options; the pointers of the plot functions are relative to these options. */
export function plotOptionsOf(query: PlotQueryValue): PlotOptions {
  const options: PlotOptions = { width: query.width, height: query.height, scale: query.scale, epochs: query.epochs === 'true' };
  if (query.channels) options.channels = query.channels.split(',').map((c) => c.trim()).filter((c) => c.length > 0);
  if (query.frequencyRange) {
    const [low, high] = query.frequencyRange.split(',').map(Number) as [number, number];
    if (!(low < high)) throw new DomainError('invalid-request', `frequencyRange ${low},${high}: low must be below high`, { pointer: '/frequencyRange' });
    options.frequencyRange = [low, high];
  }
  return options;
}

/** The record of the tenant's succeeded job. */
export async function succeededRecord(queue: JobQueue, store: Store, id: string, tenant: string): Promise<{ record: FeatureRecord; recordKey: string }> {
  const job = await requireJob(queue, id, tenant);
  if (job.state !== 'succeeded') {
    throw new ProblemError('record-not-ready', `job ${job.id} is ${job.state}; its plots exist once it has succeeded`);
  }
  const text = await store.getDocument('records', job.recordKey);
  if (text === null) throw new ProblemError('internal', `the record of job ${id} is missing from the store`);
  return { record: JSON.parse(text) as FeatureRecord, recordKey: job.recordKey };
}

/** Sends SVG text with a strong ETag over its bytes; a matching If-None-Match answers 304. */
export function sendSvg(request: FastifyRequest, reply: FastifyReply, svg: string): FastifyReply {
  const etag = `"${createHash('sha256').update(svg).digest('hex')}"`;
  reply.header('etag', etag).header('cache-control', 'private, no-cache');
  const match = request.headers['if-none-match'];
  if (match && match.split(',').some((tag) => tag.trim().replace(/^W\//, '') === etag || tag.trim() === '*')) return reply.code(304).send();
  return reply.type('image/svg+xml; charset=utf-8').send(svg);
}

/** Problems thrown by the pure plot functions point into the query. */
export function underQuery<T>(draw: () => T): T {
  try {
    return draw();
  } catch (error) {
    throw error instanceof DomainError ? error.under('/query') : error;
  }
}

export const plotRoutes = (deps: AppDeps): FastifyPluginAsyncZod => async (app) => {
  const { store, queue } = deps;

  app.get(
    '/v1/jobs/:id/plots/:kind',
    {
      schema: {
        summary: 'A plot of a succeeded job\'s record, as SVG',
        description: `Kinds: ${kindList}. The same record and options give the same bytes; the ETag is the SHA-256 of the SVG and If-None-Match answers 304. Options a kind does not use are ignored.`,
        tags: ['plots'],
        params: z.object({ id: z.string().min(1).max(200), kind: z.string().min(1).max(64).describe(`one of ${PLOT_KIND_NAMES.join(', ')}`) }),
        querystring: PlotQuery,
        response: {
          200: svgResponse('the plot'),
          304: z.null().describe('the plot has not changed (If-None-Match); no body'),
          400: problemResponse('a malformed option or a channel the record does not have'),
          404: problemResponse('unknown job or plot kind'),
          409: problemResponse('the job has not succeeded'),
          422: problemResponse("the kind does not fit the record's method"),
        },
      },
      serializerCompiler: () => (data) => (typeof data === 'string' ? data : JSON.stringify(data)),
    },
    async (request, reply) => {
      const kind = plotKind(request.params.kind, '/params/kind');
      const options = underQuery(() => plotOptionsOf(request.query));
      const { record } = await succeededRecord(queue, store, request.params.id, tenantOf(request));
      checkApplicable(kind, record.recipe.method, '/params/kind');
      return sendSvg(request, reply, underQuery(() => kind.render(record, options)));
    },
  );
};
