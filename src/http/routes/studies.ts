import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { DomainError, toProblem } from '../../common/errors.js';
import { jobIdOf, recordKeyOf } from '../../jobs/spec.js';
import { readCsvManifest, readJsonEntries, STUDY_LIMITS } from '../../studies/entries.js';
import { createRunDriver, runState, selectEntries, type Run, type RunDriver, type RunFilter, type RunItem } from '../../studies/runs.js';
import { createStudyStore, newId, type Study, type StudyEntry } from '../../studies/study-store.js';
import type { AppDeps } from '../app.js';
import { tenantOf } from '../auth.js';
import { classifyHttpError } from '../error-handler.js';
import { IdParams, problemResponse, ProblemSchema, SignalReferenceSchema } from '../schemas.js';
import { getRecipe, pinRecipe, planJob } from '../../jobs/plan.js';
import { getSignalMeta } from '../../stores/signals.js';
import { zodValidator } from '../validation.js';
import { RecipeSchema } from '../../recipes/schema.js';
import type { FeatureRecord } from '../../engine/record.js';
import { createTableLayout, metadataColumns, tableLevels, tableRows } from '../../tables/rows.js';
import { chooseTableFormat, sendTable } from '../table-response.js';
import { TABLE_DESCRIPTION, TABLE_RESPONSE, TableQuery } from './tables.js';

const MetadataSchema = z
  .record(z.string().regex(/^[a-z][a-z0-9_]{0,63}$/i), z.union([z.string().max(STUDY_LIMITS.valueLength), z.number()]))
  .describe('subject (required), session, condition and any further keys: letters, digits and _, not a table column name; string or number values');

const EntryInputSchema = SignalReferenceSchema.extend({
  signal: z.string().optional().describe('id of a stored signal'),
  upload: z.string().optional().describe('id of a completed resumable upload (instead of signal)'),
  metadata: MetadataSchema,
}).meta({ id: 'NewStudyEntry', description: 'A stored signal (or a part of one) and its metadata.' });

const EntriesBody = z
  .strictObject({ entries: z.array(EntryInputSchema).min(1).max(STUDY_LIMITS.entries) })
  .describe(
    'JSON entries; or a CSV manifest (`Content-Type: text/csv`, RFC 4180, header row) with a `signal` or `upload` column, optional `start`, `end` (seconds) and `channels` (names separated by `;`), and one column per metadata key (a `subject` column is required; a header `age:number` makes a numeric column, other cells are text). The whole list is refused on the first fault, naming row and column; nothing is added then.',
  );

const EntrySchema = z
  .object({
    id: z.string(),
    signal: z.string(),
    sha256: z.string(),
    view: z.object({ start: z.number().optional(), end: z.number().optional(), channels: z.array(z.string()).optional(), badSpans: z.array(z.tuple([z.number(), z.number()])).optional() }).nullable(),
    metadata: z.record(z.string(), z.union([z.string(), z.number()])),
    addedAt: z.string(),
  })
  .meta({ id: 'StudyEntry' });

const StudySchema = z
  .object({
    id: z.string(),
    name: z.string(),
    description: z.string().nullable(),
    entryCount: z.number().int(),
    createdAt: z.string(),
    updatedAt: z.string(),
    links: z.object({ self: z.string(), entries: z.string(), runs: z.string() }),
  })
  .meta({ id: 'Study' });

const CountsSchema = z.object({
  total: z.number().int(),
  waiting: z.number().int().describe('not yet in the queue: a run keeps only a bounded window of its jobs queued'),
  queued: z.number().int(),
  running: z.number().int(),
  succeeded: z.number().int(),
  failed: z.number().int(),
  canceled: z.number().int(),
  reused: z.number().int().describe('entries whose record already existed or was already being computed, so nothing new was queued'),
});

const RunSchema = z
  .object({
    id: z.string(),
    study: z.string(),
    state: z.enum(['running', 'succeeded', 'failed', 'canceled']),
    recipe: z.object({ id: z.string(), hash: z.string(), method: z.string() }),
    filter: z.record(z.string(), z.unknown()).nullable(),
    retryOf: z.string().nullable(),
    progress: z.number().min(0).max(1),
    counts: CountsSchema,
    failed: z.array(z.object({ entryId: z.string(), signal: z.string(), metadata: z.record(z.string(), z.union([z.string(), z.number()])), job: z.string(), problem: ProblemSchema.nullable() })),
    createdAt: z.string(),
    canceledAt: z.string().nullable(),
    finishedAt: z.string().nullable(),
    links: z.object({ self: z.string(), table: z.string() }),
  })
  .meta({ id: 'StudyRun' });

const FilterSchema = z
  .record(
    z.string().regex(/^[a-z][a-z0-9_]{0,63}$/i),
    z.union([
      z.string(),
      z.number(),
      z
        .array(z.union([z.string(), z.number()]))
        .min(1)
        .max(1000),
    ]),
  )
  .describe('only entries whose metadata key equals the value (or one of a list), e.g. {"condition": "eyes-closed", "session": ["early", "late"]}');

const RunRequest = z
  .strictObject({
    recipe: z
      .union([z.string().describe('id of a pinned recipe'), RecipeSchema])
      .optional()
      .describe('required unless retryOf is given'),
    filter: FilterSchema.optional(),
    retryOf: z.string().optional().describe('id of a finished run of this study: run its failed and canceled entries again, with its recipe'),
  })
  .meta({ id: 'StudyRunRequest' });

const RunRequestEnvelope = RunRequest.extend({ recipe: z.union([z.string().min(1), z.record(z.string(), z.unknown())]).optional() });

const StudyParams = z.object({ id: z.string().min(1).max(200) });
const EntryParams = StudyParams.extend({ entryId: z.string().min(1).max(200) });
const RunParams = StudyParams.extend({ runId: z.string().min(1).max(200) });
const Page = z.strictObject({
  limit: z.coerce.number().int().min(1).max(1000).default(100),
  after: z.string().max(200).optional().describe('cursor: the `next` of the previous page'),
});

function presentStudy(study: Study) {
  const self = `/v1/studies/${study.id}`;
  const { tenant: _tenant, entries, ...rest } = study;
  return { ...rest, entryCount: entries.length, links: { self, entries: `${self}/entries`, runs: `${self}/runs` } };
}

async function presentRun(driver: RunDriver, run: Run) {
  const { counts, fraction } = await driver.progress(run);
  const self = `/v1/studies/${run.studyId}/runs/${run.id}`;
  return {
    id: run.id,
    study: run.studyId,
    state: runState(run),
    recipe: run.recipe,
    filter: run.filter,
    retryOf: run.retryOf,
    progress: fraction,
    counts,
    failed: run.items.filter((i) => i.status === 'failed').map((i) => ({ entryId: i.entryId, signal: i.signal, metadata: i.metadata, job: i.jobId, problem: i.problem })),
    createdAt: run.createdAt,
    canceledAt: run.canceledAt,
    finishedAt: run.finishedAt,
    links: { self, table: `${self}/table` },
  };
}

/**
 * Studies (named sets of entries: a stored signal or part of one plus its metadata) and study runs
 * (one recipe over the entries, as ordinary jobs fed to the queue in a bounded window).
 */
export const studyRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    const { store, queue, config } = deps;
    const studies = createStudyStore(store);
    const driver = createRunDriver({ store, queue, window: config.studyRunWindow, logger: deps.logger });
    app.addHook('onReady', async () => {
      const resumed = await driver.resume();
      if (resumed > 0) deps.logger.info({ runs: resumed }, 'unfinished study runs resumed');
    });
    app.addHook('onClose', async () => driver.close());

    // A CSV manifest arrives as text; it is parsed (and every row checked) by the studies layer.
    app.addContentTypeParser('text/csv', { parseAs: 'string' }, (_request, body, done) => done(null, body));

    app.post(
      '/v1/studies',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Create a study',
          tags: ['studies'],
          body: z.strictObject({ name: z.string().min(1).max(STUDY_LIMITS.nameLength), description: z.string().max(2000).optional() }),
          response: { 201: StudySchema, 400: problemResponse('malformed request') },
        },
      },
      async (request, reply) => {
        const study = await studies.create(tenantOf(request), request.body);
        request.log.info({ studyId: study.id }, 'study created');
        return reply.code(201).header('location', `/v1/studies/${study.id}`).send(presentStudy(study));
      },
    );

    app.get(
      '/v1/studies',
      {
        schema: {
          summary: "The caller's studies, oldest first, a page at a time",
          tags: ['studies'],
          querystring: Page,
          response: { 200: z.object({ studies: z.array(StudySchema), next: z.string().nullable().describe('cursor of the next page; null on the last') }) },
        },
      },
      async (request) => {
        const { studies: page, next } = await studies.list(tenantOf(request), request.query.limit, request.query.after ?? null);
        return { studies: page.map(presentStudy), next };
      },
    );

    app.get('/v1/studies/:id', { schema: { summary: 'A study', tags: ['studies'], params: IdParams, response: { 200: StudySchema, 404: problemResponse('unknown study') } } }, async (request) =>
      presentStudy(await studies.require(tenantOf(request), request.params.id)),
    );

    app.delete(
      '/v1/studies/:id',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Delete a study, its entries and its runs (unfinished runs are canceled first); signals, jobs and records stay',
          tags: ['studies'],
          params: IdParams,
          response: { 200: z.object({ id: z.string(), deleted: z.literal(true) }), 404: problemResponse('unknown study') },
        },
      },
      async (request) => {
        const tenant = tenantOf(request);
        const { id } = request.params;
        await studies.require(tenant, id);
        for (const run of await driver.list(tenant, id)) await driver.remove(tenant, id, run.id);
        if (!(await studies.remove(tenant, id))) throw new DomainError('study-not-found', `no study with id "${id}"`);
        request.log.info({ studyId: id }, 'study deleted');
        return { id, deleted: true as const };
      },
    );

    app.post(
      '/v1/studies/:id/entries',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Add entries: a JSON list or a CSV manifest, all or nothing',
          tags: ['studies'],
          params: StudyParams,
          body: EntriesBody,
          response: {
            201: z.object({ added: z.number().int(), entries: z.array(EntrySchema) }),
            404: problemResponse('unknown study'),
            415: problemResponse('neither JSON nor text/csv'),
            422: problemResponse('a row is refused (row, column and pointer say where); nothing was added'),
          },
        },
        // The studies layer checks every row itself, so that each fault names its row and column.
        validatorCompiler: zodValidator({ params: StudyParams }),
      },
      async (request, reply) => {
        const tenant = tenantOf(request);
        // Another tenant's study is 404 whatever the body holds.
        await studies.require(tenant, request.params.id);
        const body: unknown = request.body;
        const csv = typeof body === 'string' && /^text\/csv\b/i.test(request.headers['content-type'] ?? '');
        const inputs = csv ? readCsvManifest(body) : readJsonEntries(body);
        const added = await studies.addEntries(tenant, request.params.id, inputs);
        request.log.info({ studyId: request.params.id, added: added.length }, 'study entries added');
        return reply.code(201).send({ added: added.length, entries: added });
      },
    );

    app.get(
      '/v1/studies/:id/entries',
      {
        schema: {
          summary: "A study's entries in the order they were added, a page at a time",
          tags: ['studies'],
          params: StudyParams,
          querystring: Page,
          response: { 200: z.object({ entries: z.array(EntrySchema), next: z.string().nullable() }), 404: problemResponse('unknown study') },
        },
      },
      async (request) => {
        const study = await studies.require(tenantOf(request), request.params.id);
        const { limit, after } = request.query;
        const from = after === undefined ? 0 : study.entries.findIndex((e) => e.id === after) + 1;
        if (after !== undefined && from === 0) throw new DomainError('invalid-request', `cursor "${after}" names no entry of this study`, { pointer: '/query/after' });
        const page = study.entries.slice(from, from + limit);
        return { entries: page, next: from + limit < study.entries.length ? page[page.length - 1]!.id : null };
      },
    );

    app.delete(
      '/v1/studies/:id/entries/:entryId',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Remove an entry (runs already started keep it)',
          tags: ['studies'],
          params: EntryParams,
          response: { 200: z.object({ id: z.string(), deleted: z.literal(true) }), 404: problemResponse('unknown study or entry') },
        },
      },
      async (request) => {
        const { id, entryId } = request.params;
        if (!(await studies.removeEntry(tenantOf(request), id, entryId))) throw new DomainError('entry-not-found', `study ${id} has no entry "${entryId}"`);
        return { id: entryId, deleted: true as const };
      },
    );

    app.post(
      '/v1/studies/:id/runs',
      {
        config: { access: 'submit', recipePointer: '/recipe' },
        schema: {
          summary: 'Run one recipe over the study (or the entries the filter selects), or retry the failed entries of a run',
          description: `One ordinary job per entry, on the same queue as single jobs; an entry whose record exists already is not computed again. At most STUDY_RUN_WINDOW (here ${config.studyRunWindow}) of a run's jobs are queued at once; the next are queued as those finish, so other jobs never wait behind a whole run. An entry the recipe does not fit fails at once with its problem.`,
          tags: ['studies'],
          params: StudyParams,
          body: RunRequest,
          response: {
            202: RunSchema,
            400: problemResponse('malformed request, or no entry is selected'),
            404: problemResponse('unknown study, recipe or run to retry'),
            422: problemResponse('the recipe is invalid'),
            503: problemResponse('the queue is unavailable'),
          },
        },
        validatorCompiler: zodValidator({ body: RunRequestEnvelope, params: StudyParams }),
      },
      async (request, reply) => {
        const tenant = tenantOf(request);
        const body = request.body as { recipe?: unknown; filter?: RunFilter; retryOf?: string };
        const study = await studies.require(tenant, request.params.id);
        let selected: { entry: StudyEntry; metadata: StudyEntry['metadata'] }[];
        let recipe = body.recipe;
        if (body.retryOf !== undefined) {
          const previous = await driver.require(tenant, study.id, body.retryOf);
          if (!previous.finishedAt) throw new DomainError('invalid-request', `run ${previous.id} has not finished; retry its failed entries once it has`, { pointer: '/retryOf' });
          if (recipe !== undefined) throw new DomainError('invalid-request', 'a retry uses the recipe of the run it retries; leave "recipe" out', { pointer: '/recipe' });
          recipe = previous.recipe.id;
          const again = previous.items.filter((i) => i.status === 'failed' || i.status === 'canceled');
          selected = selectEntries(again.map(itemAsEntry), body.filter ?? null).map((entry) => ({ entry, metadata: entry.metadata }));
          if (selected.length === 0)
            throw new DomainError('invalid-request', `run ${previous.id} has no failed or canceled entries${body.filter ? ' matching the filter' : ''}`, { pointer: '/retryOf' });
        } else {
          if (recipe === undefined) throw new DomainError('invalid-request', 'name a recipe (a pinned id or an inline recipe)', { pointer: '/recipe' });
          selected = selectEntries(study.entries, body.filter ?? null).map((entry) => ({ entry, metadata: entry.metadata }));
          if (selected.length === 0)
            throw new DomainError('invalid-request', study.entries.length === 0 ? 'the study has no entries yet' : 'no entry of the study matches the filter', {
              pointer: body.filter ? '/filter' : '/',
            });
        }
        const pinned = typeof recipe === 'string' ? await getRecipe(store, recipe, '/recipe') : await pinRecipe(store, recipe);
        const items: RunItem[] = [];
        for (const { entry, metadata } of selected) {
          const base = { entryId: entry.id, signal: entry.signal, sha256: entry.sha256, view: entry.view, metadata, reused: false, resultHash: null };
          try {
            const meta = await getSignalMeta(store, entry.signal, tenant, '/signal');
            const { jobId, spec } = planJob(config.recipeLimits, meta, pinned, entry.view);
            items.push({ ...base, jobId, recordKey: spec.recordKey, status: 'waiting', problem: null });
          } catch (error) {
            // This entry cannot be analysed with this recipe (signal gone, recipe does not fit): it
            // fails now with its problem, and the other entries run.
            if (!(error instanceof Error)) throw error;
            const { problem: translated, status } = toProblem(error, (e) => classifyHttpError(e, request));
            if (status >= 500) throw error;
            const recordKey = recordKeyOf(tenant, entry.sha256, pinned.hash, entry.view);
            const problem = { ...translated, detail: `entry ${entry.id}: ${translated.detail}` };
            items.push({ ...base, jobId: jobIdOf(recordKey), recordKey, status: 'failed', problem });
          }
        }
        const run: Run = {
          id: newId('run'),
          studyId: study.id,
          tenant,
          recipe: { id: pinned.id, hash: pinned.hash, method: pinned.recipe.method },
          filter: body.filter ?? null,
          retryOf: body.retryOf ?? null,
          createdAt: new Date().toISOString(),
          canceledAt: null,
          finishedAt: null,
          items,
        };
        await driver.start(run);
        request.log.info({ studyId: study.id, runId: run.id, entries: items.length, recipeId: pinned.id }, 'study run started');
        return reply
          .code(202)
          .header('location', `/v1/studies/${study.id}/runs/${run.id}`)
          .send(await presentRun(driver, run));
      },
    );

    app.get(
      '/v1/studies/:id/runs',
      {
        schema: { summary: "A study's runs, oldest first", tags: ['studies'], params: StudyParams, response: { 200: z.object({ runs: z.array(RunSchema) }), 404: problemResponse('unknown study') } },
      },
      async (request) => {
        const tenant = tenantOf(request);
        await studies.require(tenant, request.params.id);
        const runs = await driver.list(tenant, request.params.id);
        return { runs: await Promise.all(runs.map((r) => presentRun(driver, r))) };
      },
    );

    app.get(
      '/v1/studies/:id/runs/:runId',
      {
        schema: {
          summary: 'Progress of a run: counts per state, its failed entries with their problems, its state',
          tags: ['studies'],
          params: RunParams,
          response: { 200: RunSchema, 404: problemResponse('unknown study or run') },
        },
      },
      async (request) => {
        const tenant = tenantOf(request);
        await studies.require(tenant, request.params.id);
        return presentRun(driver, await driver.require(tenant, request.params.id, request.params.runId));
      },
    );

    app.delete(
      '/v1/studies/:id/runs/:runId',
      {
        config: { access: 'submit' },
        schema: {
          summary: 'Cancel a run: no more of its jobs are queued, and its queued and running jobs are canceled',
          tags: ['studies'],
          params: RunParams,
          response: { 200: RunSchema, 404: problemResponse('unknown study or run'), 409: problemResponse('the run already finished') },
        },
      },
      async (request) => {
        const tenant = tenantOf(request);
        await studies.require(tenant, request.params.id);
        const run = await driver.cancel(tenant, request.params.id, request.params.runId);
        request.log.info({ studyId: run.studyId, runId: run.id }, 'study run canceled');
        return presentRun(driver, run);
      },
    );
    app.get(
      '/v1/studies/:id/runs/:runId/table',
      {
        schema: {
          summary: "One table over every succeeded entry of a run, each row carrying its entry's metadata columns",
          description: `Every succeeded entry's table, in the order of the run, each row led by an \`entry\` column and one column per metadata key (a key numeric in every entry is a double column, else text).\n\n${TABLE_DESCRIPTION}`,
          tags: ['studies'],
          params: RunParams,
          querystring: TableQuery,
          response: {
            200: TABLE_RESPONSE,
            400: problemResponse('unknown level or format'),
            404: problemResponse('unknown study or run'),
            406: problemResponse('Accept allows neither CSV nor Parquet'),
            409: problemResponse('no entry of the run has succeeded yet'),
            422: problemResponse('the records of this recipe cannot give the level'),
          },
        },
      },
      async (request, reply) => {
        const tenant = tenantOf(request);
        const { id, runId } = request.params;
        await studies.require(tenant, id);
        const run = await driver.require(tenant, id, runId);
        const items = run.items.filter((i) => i.status === 'succeeded');
        const format = chooseTableFormat(request.query.format, request.headers.accept);
        const records = (async function* () {
          for (const item of items) {
            const text = await store.getDocument('records', item.recordKey);
            // A record removed since (retention, deletion of its signal) leaves no rows.
            if (text !== null) yield { item, record: JSON.parse(text) as FeatureRecord };
          }
        })();
        const first = await records.next();
        if (first.done) throw new DomainError('record-not-ready', `run ${run.id} has no succeeded entry with a stored record yet (${runState(run)}); poll the run`);
        const columns = metadataColumns(items.map((i) => i.metadata));
        const level = request.query.level ?? tableLevels(first.value.record)[0] ?? 'bands';
        const layout = createTableLayout(first.value.record, level, { metadata: columns, entry: true });
        const text = new Set(columns.filter((c) => c.type === 'string').map((c) => c.name));
        const rowsOf = ({ item, record }: { item: RunItem; record: FeatureRecord }) =>
          tableRows(layout, record, { entryId: item.entryId, metadata: Object.fromEntries(Object.entries(item.metadata).map(([k, v]) => [k, text.has(k) ? String(v) : v])) });
        async function* batches() {
          yield rowsOf(first.value!);
          for await (const next of records) yield rowsOf(next);
        }
        request.log.info({ studyId: id, runId, level, format, entries: items.length }, 'run table streamed');
        return sendTable(reply, { format, columns: layout.columns, fileStem: `${id}-${runId}-${level}`, batches: batches() });
      },
    );
  };

/** A run's item as the entry it was taken from (a retry runs the entries as they were then). */
function itemAsEntry(item: RunItem): StudyEntry {
  return { id: item.entryId, signal: item.signal, sha256: item.sha256, view: item.view, metadata: item.metadata, addedAt: '' };
}
