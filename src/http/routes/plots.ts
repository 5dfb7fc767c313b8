import { createHash } from 'node:crypto';
import type { FastifyReply, FastifyRequest } from 'fastify';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { DomainError } from '../../common/errors.js';
import type { FeatureRecord } from '../../engine/record.js';
import { comparePlot, groupSpectraPlot } from '../../plots/compare.js';
import { runKey, type Run } from '../../studies/runs.js';
import { createStudyStore } from '../../studies/study-store.js';
import { checkApplicable, plotKind, PLOT_KIND_NAMES, PLOT_KINDS, type PlotAttachments, type PlotOptions } from '../../plots/index.js';
import type { Store } from '../../stores/store.js';
import type { AppDeps } from '../app.js';
import { tenantOf } from '../auth.js';
import { requireStoredRecord } from '../job-access.js';
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
  value: z.enum(['absolute', 'relative']).default('absolute').describe("bands: absolute power (unit²) or the fraction of the total over the recipe's frequency range"),
  epochs: z.enum(['true', 'false']).default('true').describe('psd: draw per-epoch spectra faintly behind the mean, when the record has them (perEpoch)'),
});
type PlotQueryValue = z.output<typeof PlotQuery>;

const CompareQuery = PlotQuery.omit({ channels: true, value: true, epochs: true }).extend({
  jobs: z
    .string()
    .regex(/^[^,]+(,[^,]+){1,5}$/, 'two to six comma-separated job ids')
    .describe('comma-separated ids of two to six succeeded spectral jobs (welch, multitaper, periodogram)'),
  channel: z.string().min(1).max(200).describe('the channel compared'),
  labels: z.string().max(2000).optional().describe('comma-separated legend labels, one per job; default the job ids'),
});

/** The answers every plot route gives besides its problems: the SVG, or 304 for a matching ETag. */
function svgResponses<T extends Record<number, unknown>>(problems: T) {
  return {
    200: { description: 'the plot', content: { 'image/svg+xml': { schema: z.string() } } },
    304: z.null().describe('the plot has not changed (If-None-Match); no body'),
    ...problems,
  };
}

/** SVG text and problem JSON strings go out as they are. */
const sendAsIs = () => (data: unknown) => (typeof data === 'string' ? data : JSON.stringify(data));

/** Query → plot options; the pointers of the plot functions are relative to these options. */
export function plotOptionsOf(query: PlotQueryValue): PlotOptions {
  const options: PlotOptions = { width: query.width, height: query.height, scale: query.scale, value: query.value, epochs: query.epochs === 'true' };
  if (query.channels)
    options.channels = query.channels
      .split(',')
      .map((c) => c.trim())
      .filter((c) => c.length > 0);
  if (query.frequencyRange) {
    const [low, high] = query.frequencyRange.split(',').map(Number) as [number, number];
    if (!(low < high)) throw new DomainError('invalid-request', `frequencyRange ${low},${high}: low must be below high`, { pointer: '/frequencyRange' });
    options.frequencyRange = [low, high];
  }
  return options;
}

/** Reads the named attachments of a record as typed arrays (little-endian float64, or uint8). */
export async function readAttachments(store: Store, recordKey: string, record: FeatureRecord, names: string[]): Promise<PlotAttachments> {
  const out: PlotAttachments = {};
  for (const name of names) {
    const entry = record.attachments?.find((a) => a.name === name);
    const bytes = await store.getAttachment(`${recordKey}.${name}`);
    if (!entry || !bytes) throw new ProblemError('internal', `attachment "${name}" of the record is missing from the store`);
    if (entry.dtype === 'uint8') {
      out[name] = new Uint8Array(bytes);
    } else {
      const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
      const values = new Float64Array(bytes.byteLength / 8);
      for (let i = 0; i < values.length; i++) values[i] = view.getFloat64(i * 8, true);
      out[name] = values;
    }
  }
  return out;
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

const RunPlotQuery = PlotQuery.omit({ channels: true, value: true, epochs: true }).extend({
  channel: z.string().min(1).max(200).describe('the channel drawn'),
  by: z
    .string()
    .regex(/^[a-z][a-z0-9_]{0,63}$/i)
    .default('condition')
    .describe('the metadata key whose values group the entries'),
});

export const plotRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    const { store, queue } = deps;
    const studies = createStudyStore(store);

    app.get(
      '/v1/jobs/:id/plots/:kind',
      {
        schema: {
          summary: "A plot of a succeeded job's record, as SVG",
          description: `Kinds: ${kindList}. The same record and options give the same bytes; the ETag is the SHA-256 of the SVG and If-None-Match answers 304. Options a kind does not use are ignored.`,
          tags: ['plots'],
          params: z.object({
            id: z.string().min(1).max(200),
            kind: z
              .string()
              .min(1)
              .max(64)
              .describe(`one of ${PLOT_KIND_NAMES.join(', ')}`),
          }),
          querystring: PlotQuery,
          response: svgResponses({
            400: problemResponse('a malformed option or a channel the record does not have'),
            404: problemResponse('unknown job or plot kind'),
            409: problemResponse('the job has not succeeded'),
            422: problemResponse("the kind does not fit the record's method"),
          }),
        },
        serializerCompiler: sendAsIs,
      },
      async (request, reply) => {
        const kind = plotKind(request.params.kind, '/params/kind');
        const options = underQuery(() => plotOptionsOf(request.query));
        const { record, recordKey } = await requireStoredRecord(queue, store, request.params.id, tenantOf(request), 'its plots exist');
        checkApplicable(kind, record, '/params/kind');
        const names = underQuery(() => kind.attachments?.(record, options) ?? []);
        const attachments = await readAttachments(store, recordKey, record, names);
        return sendSvg(
          request,
          reply,
          underQuery(() => kind.render(record, options, attachments)),
        );
      },
    );

    app.get(
      '/v1/plots/compare',
      {
        schema: {
          summary: "Several jobs' PSDs of one channel overlaid, as SVG",
          description:
            'For example two conditions of one subject: `?jobs=job_a,job_b&channel=Oz&labels=eyes%20closed,eyes%20open`. Every job must have succeeded with a spectral method. The same records and options give the same bytes; ETag and If-None-Match as for job plots.',
          tags: ['plots'],
          querystring: CompareQuery,
          response: svgResponses({
            400: problemResponse('a malformed option or a channel a record does not have'),
            404: problemResponse('an unknown job'),
            409: problemResponse('a job has not succeeded'),
            422: problemResponse('a job is not spectral, or the spectra are in different units'),
          }),
        },
        serializerCompiler: sendAsIs,
      },
      async (request, reply) => {
        const { jobs, channel, labels, ...rest } = request.query;
        const ids = jobs.split(',').map((j) => j.trim());
        const names = labels?.split(',').map((l) => l.trim()) ?? ids;
        if (names.length !== ids.length) throw new DomainError('invalid-request', `${names.length} label(s) for ${ids.length} jobs; give one label per job`, { pointer: '/query/labels' });
        const options = underQuery(() => plotOptionsOf({ ...rest, value: 'absolute', epochs: 'false' }));
        const tenant = tenantOf(request);
        const psd = plotKind('psd');
        const records: { label: string; record: FeatureRecord }[] = [];
        for (const [i, id] of ids.entries()) {
          const { record } = await requireStoredRecord(queue, store, id, tenant, 'its plots exist');
          checkApplicable(psd, record, '/query/jobs');
          records.push({ label: names[i]!, record });
        }
        return sendSvg(
          request,
          reply,
          underQuery(() => comparePlot(records, { ...options, channel })),
        );
      },
    );

    app.get(
      '/v1/studies/:id/runs/:runId/plots/psd',
      {
        schema: {
          summary: "A study run's mean PSD of one channel per condition (or another metadata key), with its spread, as SVG",
          description:
            'Groups the run\'s succeeded entries by the value of the metadata key `by` and draws, per group, the geometric mean PSD of the channel with ± 1 standard deviation of log power across the entries shaded. Entries without the key form the group "(none)". ETag and If-None-Match as for job plots.',
          tags: ['plots'],
          params: z.object({ id: z.string().min(1).max(200), runId: z.string().min(1).max(200) }),
          querystring: RunPlotQuery,
          response: svgResponses({
            400: problemResponse('a malformed option, an unknown metadata key or a channel the records do not have'),
            404: problemResponse('unknown study or run'),
            409: problemResponse('no entry of the run has succeeded yet'),
            422: problemResponse("the run's recipe is not spectral"),
          }),
        },
        serializerCompiler: sendAsIs,
      },
      async (request, reply) => {
        const { channel, by, ...rest } = request.query;
        const options = underQuery(() => plotOptionsOf({ ...rest, value: 'absolute', epochs: 'false' }));
        const tenant = tenantOf(request);
        const { id, runId } = request.params;
        await studies.require(tenant, id);
        const text = await store.getDocument('runs', runKey(tenant, id, runId));
        if (text === null) throw new DomainError('run-not-found', `study ${id} has no run with id "${runId}"`);
        const run = JSON.parse(text) as Run;
        const psd = plotKind('psd');
        if (!(psd.methods as readonly string[]).includes(run.recipe.method)) {
          throw new DomainError('plot-not-applicable', `run ${runId} used ${run.recipe.method}; a PSD per condition needs a spectral recipe (${psd.methods.join(', ')})`, { pointer: '/params/runId' });
        }
        const items = run.items.filter((i) => i.status === 'succeeded');
        if (!items.some((i) => i.metadata[by] !== undefined)) {
          const keys = [...new Set(run.items.flatMap((i) => Object.keys(i.metadata)))].sort();
          throw new DomainError('invalid-request', `no entry of run ${runId} has the metadata key "${by}"; the keys are ${keys.join(', ')}`, { pointer: '/query/by', extensions: { allowed: keys } });
        }
        const groups = new Map<string, FeatureRecord[]>();
        for (const item of items) {
          const record = await store.getDocument('records', item.recordKey);
          if (record === null) continue;
          const label = item.metadata[by] === undefined ? '(none)' : String(item.metadata[by]);
          groups.set(label, [...(groups.get(label) ?? []), JSON.parse(record) as FeatureRecord]);
        }
        if (groups.size === 0) throw new DomainError('record-not-ready', `run ${runId} has no succeeded entry with a stored record yet; poll the run`);
        const ordered = [...groups.entries()].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).map(([label, records]) => ({ label, records }));
        return sendSvg(
          request,
          reply,
          underQuery(() => groupSpectraPlot(ordered, { ...options, channel, groupedBy: by })),
        );
      },
    );
  };
