import { createHash } from 'node:crypto';
import type { InjectOptions } from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEpochs, toUploadJson, type DemoCondition, type DemoShift } from '../../src/signals/demo-recording.js';
import { tableFromIPC } from 'apache-arrow';
import { readParquet } from 'parquet-wasm/node';
import { pollJob, startTestApi } from '../helpers/app.js';
import { csvObjects } from '../tables/csv-parse.js';

type Api = Awaited<ReturnType<typeof startTestApi>>;

const sha = (key: string) => createHash('sha256').update(key).digest('hex');
const KEYS = { a: 'lab-a-submit-5e1f0c', b: 'lab-b-submit-c93a7d' };
const API_KEYS = [`lab-a:admin:${sha(KEYS.a)}:a-admin`, `lab-b:submit:${sha(KEYS.b)}:b-submit`].join(',');
const asA = { authorization: `Bearer ${KEYS.a}` };
const asB = { authorization: `Bearer ${KEYS.b}` };

/** A small invented recording of the demo generator: 2 epochs of 2 s, 8 channels at 256 Hz. */
function demoBody(seed: number, condition: DemoCondition = 'eyes-closed', shift: DemoShift = 'early', epochs = 2) {
  return toUploadJson(demoEpochs(condition, shift, epochs, 2, seed));
}

function client(api: Api, headers: Record<string, string>) {
  const call = (method: 'GET' | 'POST' | 'DELETE', url: string, payload?: unknown, extra: Record<string, string> = {}) => {
    const options: InjectOptions = { method, url, headers: { ...headers, ...extra } };
    if (payload !== undefined) options.payload = payload as InjectOptions['payload'];
    return api.app.inject(options);
  };
  return {
    get: (url: string) => call('GET', url),
    post: (url: string, payload: unknown) => call('POST', url, payload),
    csv: (url: string, text: string) => call('POST', url, text, { 'content-type': 'text/csv' }),
    del: (url: string) => call('DELETE', url),
  };
}

async function upload(c: ReturnType<typeof client>, seed: number, condition: DemoCondition = 'eyes-closed', shift: DemoShift = 'early', epochs = 2): Promise<string> {
  const res = await c.post('/v1/signals', demoBody(seed, condition, shift, epochs));
  expect(res.statusCode).toBe(201);
  return res.json().id as string;
}

async function newStudy(c: ReturnType<typeof client>, name = 'night shift'): Promise<string> {
  const res = await c.post('/v1/studies', { name });
  expect(res.statusCode).toBe(201);
  return res.json().id as string;
}

async function pollRun(c: ReturnType<typeof client>, study: string, run: string, timeoutMs = 60_000, onPoll?: (view: RunView) => void): Promise<RunView> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await c.get(`/v1/studies/${study}/runs/${run}`);
    expect(res.statusCode).toBe(200);
    const view = res.json() as RunView;
    onPoll?.(view);
    if (view.state !== 'running') return view;
    if (Date.now() > deadline) throw new Error(`run ${run} still running: ${JSON.stringify(view.counts)}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

interface RunView {
  id: string;
  state: string;
  counts: Record<'total' | 'waiting' | 'queued' | 'running' | 'succeeded' | 'failed' | 'canceled' | 'reused', number>;
  failed: { entryId: string; signal: string; problem: { type: string; detail: string } | null }[];
  finishedAt: string | null;
}

const RECIPE = {
  method: 'welch',
  segmentSeconds: 1,
  bands: [
    { name: 'theta', low: 4, high: 8 },
    { name: 'alpha', low: 8, high: 13 },
  ],
};

describe('when entries are added to a study', () => {
  let api: Api;
  let a: ReturnType<typeof client>;
  let signals: string[];
  beforeAll(async () => {
    api = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '0' });
    a = client(api, asA);
    signals = [await upload(a, 11), await upload(a, 12), await upload(a, 13)];
  });
  afterAll(async () => api.stop());

  it('should add a CSV manifest whole, keep text and numeric columns apart, and page the entries', async () => {
    const study = await newStudy(a);
    const manifest = ['signal,subject,session,condition,age:number', `${signals[0]},p01,early,eyes-closed,31`, `${signals[1]},"p,02",late,eyes-closed,27.5`, `${signals[2]},007,late,eyes-open,`].join(
      '\r\n',
    );
    const res = await a.csv(`/v1/studies/${study}/entries`, manifest);
    expect(res.statusCode).toBe(201);
    expect(res.json().added).toBe(3);
    const first = await a.get(`/v1/studies/${study}/entries?limit=2`);
    expect(first.json().entries.map((e: { metadata: unknown }) => e.metadata)).toEqual([
      { subject: 'p01', session: 'early', condition: 'eyes-closed', age: 31 },
      { subject: 'p,02', session: 'late', condition: 'eyes-closed', age: 27.5 },
    ]);
    const second = await a.get(`/v1/studies/${study}/entries?limit=2&after=${first.json().next}`);
    // "007" stays text (a subject code), and the empty age cell leaves the key out.
    expect(second.json()).toMatchObject({ entries: [{ signal: signals[2], metadata: { subject: '007', session: 'late', condition: 'eyes-open' } }], next: null });
    expect((await a.get(`/v1/studies/${study}`)).json().entryCount).toBe(3);
  });

  it('should let one signal appear in several entries as different parts of it', async () => {
    const study = await newStudy(a);
    // The demo epochs make a 2-epoch signal; channel subsets are parts of it as well.
    const res = await a.post(`/v1/studies/${study}/entries`, {
      entries: [
        { signal: signals[0], channels: ['O1', 'O2'], metadata: { subject: 'p01', region: 'occipital' } },
        { signal: signals[0], channels: ['F3', 'F4'], metadata: { subject: 'p01', region: 'frontal' } },
      ],
    });
    expect(res.statusCode).toBe(201);
    expect(new Set(res.json().entries.map((e: { id: string }) => e.id)).size).toBe(2);
  });

  it('should accept a completed resumable upload in place of a signal id', async () => {
    const samples = new Float32Array(256 * 4).map((_, i) => Math.sin((2 * Math.PI * 10 * i) / 256));
    const start = await a.post('/v1/uploads', { format: 'float32', samplingRate: 256, channels: ['Oz'] });
    expect(start.statusCode).toBe(201);
    const id = start.json().id as string;
    const part = await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/1`, headers: { ...asA, 'content-type': 'application/octet-stream' }, payload: Buffer.from(samples.buffer) });
    expect(part.statusCode).toBeLessThan(300);
    const done = await a.post(`/v1/uploads/${id}/complete`, {});
    expect(done.statusCode).toBe(201);
    const study = await newStudy(a);
    const res = await a.csv(`/v1/studies/${study}/entries`, `upload,subject\n${id},p09\n`);
    expect(res.statusCode).toBe(201);
    expect(res.json().entries[0].signal).toBe(done.json().id);
  });

  describe('when the manifest is bad', () => {
    let study: string;
    beforeAll(async () => {
      study = await newStudy(a, 'refusals');
      expect((await a.post(`/v1/studies/${study}/entries`, { entries: [{ signal: signals[0], metadata: { subject: 'p01' } }] })).statusCode).toBe(201);
    });

    const cases: [string, () => { csv?: string; json?: unknown }, { reason: string; row: number | null; column: string | null; pointer: string }][] = [
      ['an unknown signal', () => ({ csv: `signal,subject\n${signals[1]},p02\nsig_${'0'.repeat(32)},p03\n` }), { reason: 'unknown-signal', row: 2, column: 'signal', pointer: '/rows/2/signal' }],
      ['a signal twice in the manifest', () => ({ csv: `signal,subject\n${signals[1]},p02\n${signals[1]},p03\n` }), { reason: 'duplicate-entry', row: 2, column: 'signal', pointer: '/rows/2/signal' }],
      [
        'a signal already in the study',
        () => ({
          json: {
            entries: [
              { signal: signals[1], metadata: { subject: 'p02' } },
              { signal: signals[0], metadata: { subject: 'p01' } },
            ],
          },
        }),
        { reason: 'duplicate-entry', row: 2, column: 'signal', pointer: '/entries/1/signal' },
      ],
      ['a key that is not a name', () => ({ csv: `signal,subject,eye state\n${signals[1]},p02,closed\n` }), { reason: 'bad-key', row: 0, column: 'eye state', pointer: '/header/2' }],
      [
        'a key that is a table column',
        () => ({ json: { entries: [{ signal: signals[1], metadata: { subject: 'p02', Epoch: 3 } }] } }),
        { reason: 'bad-key', row: 1, column: 'Epoch', pointer: '/entries/0/metadata/Epoch' },
      ],
      ['no subject column', () => ({ csv: `signal,condition\n${signals[1]},eyes-open\n` }), { reason: 'missing-column', row: 0, column: 'subject', pointer: '/header' }],
      [
        'a short row',
        () => ({ csv: `signal,subject,condition\n${signals[1]},p02,eyes-open\n${signals[2]},p03\n` }),
        { reason: 'missing-column', row: 2, column: 'condition', pointer: '/rows/2/condition' },
      ],
      ['no signal column', () => ({ csv: `subject,condition\np02,eyes-open\n` }), { reason: 'missing-column', row: 0, column: 'signal', pointer: '/header' }],
      [
        'text in a numeric column',
        () => ({ csv: `signal,subject,age:number\n${signals[1]},p02,31\n${signals[2]},p03,thirty\n` }),
        { reason: 'wrong-type', row: 2, column: 'age', pointer: '/rows/2/age' },
      ],
      [
        'a boolean metadata value',
        () => ({ json: { entries: [{ signal: signals[1], metadata: { subject: 'p02', medicated: true } }] } }),
        { reason: 'wrong-type', row: 1, column: 'medicated', pointer: '/entries/0/metadata/medicated' },
      ],
      [
        'a window outside the signal',
        () => ({ json: { entries: [{ signal: signals[1], channels: ['O1', 'T7'], metadata: { subject: 'p02' } }] } }),
        { reason: 'bad-view', row: 1, column: 'channels', pointer: '/entries/0/channels' },
      ],
    ];

    it.each(cases)('should refuse %s whole, naming the row and column', async (_name, body, expected) => {
      const { csv, json } = body();
      const res = csv === undefined ? await a.post(`/v1/studies/${study}/entries`, json) : await a.csv(`/v1/studies/${study}/entries`, csv);
      expect(res.statusCode).toBe(422);
      expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
      const problem = res.json();
      expect(problem).toMatchObject({ type: '/problems/invalid-manifest', ...expected });
      if (expected.row !== null && expected.row > 0) expect(problem.detail).toContain(`row ${expected.row}`);
      expect(problem.detail).toContain(`"${expected.column}"`);
      expect(problem.detail).toContain('nothing was added');
      // Nothing of the refused list was added: the study holds only its first entry.
      const entries = (await a.get(`/v1/studies/${study}/entries`)).json().entries;
      expect(entries.map((e: { signal: string }) => e.signal)).toEqual([signals[0]]);
    });
  });
});

describe('when two tenants keep studies', () => {
  let api: Api;
  let a: ReturnType<typeof client>;
  let b: ReturnType<typeof client>;
  beforeAll(async () => {
    api = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '0' });
    a = client(api, asA);
    b = client(api, asB);
  });
  afterAll(async () => api.stop());

  it("should answer another tenant's study, entries and runs exactly like missing ones", async () => {
    const signal = await upload(a, 21);
    const study = await newStudy(a, 'lab a');
    expect((await a.post(`/v1/studies/${study}/entries`, { entries: [{ signal, metadata: { subject: 'p01' } }] })).statusCode).toBe(201);
    const run = await a.post(`/v1/studies/${study}/runs`, { recipe: RECIPE });
    expect(run.statusCode).toBe(202);
    for (const url of [`/v1/studies/${study}`, `/v1/studies/${study}/entries`, `/v1/studies/${study}/runs`, `/v1/studies/${study}/runs/${run.json().id}`]) {
      const res = await b.get(url);
      expect(res.statusCode, url).toBe(404);
      expect(res.json().type).toBe('/problems/study-not-found');
    }
    expect((await b.post(`/v1/studies/${study}/entries`, { entries: [{ signal, metadata: { subject: 'x' } }] })).statusCode).toBe(404);
    expect((await b.del(`/v1/studies/${study}`)).statusCode).toBe(404);
    expect((await b.get('/v1/studies')).json().studies).toEqual([]);
    // Lab B cannot put lab A's signal in a study of its own either.
    const own = await newStudy(b, 'lab b');
    const refused = await b.post(`/v1/studies/${own}/entries`, { entries: [{ signal, metadata: { subject: 'p01' } }] });
    expect(refused.json()).toMatchObject({ status: 422, reason: 'unknown-signal', pointer: '/entries/0/signal' });
    expect((await a.get('/v1/studies')).json().studies.map((s: { id: string }) => s.id)).toEqual([study]);
    await pollRun(a, study, run.json().id);
  });

  it('should list studies a page at a time with a cursor', async () => {
    const ids = [await newStudy(b, 'one'), await newStudy(b, 'two'), await newStudy(b, 'three')];
    const all = (await b.get('/v1/studies?limit=1000')).json().studies.map((s: { id: string }) => s.id);
    const seen: string[] = [];
    let url = '/v1/studies?limit=2';
    for (;;) {
      const page = (await b.get(url)).json();
      seen.push(...page.studies.map((s: { id: string }) => s.id));
      if (!page.next) break;
      url = `/v1/studies?limit=2&after=${page.next}`;
    }
    expect(seen).toEqual(all);
    expect(seen.slice(-3)).toEqual(ids);
  });
});

describe('when a study is run', () => {
  let api: Api;
  let a: ReturnType<typeof client>;
  let study: string;
  let signals: string[];
  beforeAll(async () => {
    api = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '0', WORKER_THREADS: '2', STUDY_RUN_WINDOW: '2' });
    a = client(api, asA);
    study = await newStudy(a);
    signals = [];
    const rows = ['signal,subject,session,condition'];
    let seed = 100;
    for (const subject of ['p01', 'p02', 'p03']) {
      for (const condition of ['eyes-open', 'eyes-closed'] as DemoCondition[]) {
        const id = await upload(a, seed++, condition, 'early');
        signals.push(id);
        rows.push(`${id},${subject},early,${condition}`);
      }
    }
    expect((await a.csv(`/v1/studies/${study}/entries`, rows.join('\n'))).statusCode).toBe(201);
  });
  afterAll(async () => api.stop());

  it('should compute one job per entry, and compute nothing new when the same recipe runs again', async () => {
    const first = await a.post(`/v1/studies/${study}/runs`, { recipe: RECIPE });
    expect(first.statusCode).toBe(202);
    const done = await pollRun(a, study, first.json().id);
    expect(done).toMatchObject({ state: 'succeeded', counts: { total: 6, succeeded: 6, failed: 0, reused: 0 } });
    const jobsBefore = (await a.get('/v1/jobs?limit=1000')).json().jobs;
    expect(jobsBefore).toHaveLength(6);

    const second = await a.post(`/v1/studies/${study}/runs`, { recipe: RECIPE });
    const again = await pollRun(a, study, second.json().id);
    expect(again).toMatchObject({ state: 'succeeded', counts: { total: 6, succeeded: 6, reused: 6 } });
    // The same jobs, started once: not one of them ran a second time.
    expect((await a.get('/v1/jobs?limit=1000')).json().jobs).toEqual(jobsBefore);
  });

  it("should give one table of the run whose rows carry each entry's metadata and exactly its record's numbers", async () => {
    const res = await a.post(`/v1/studies/${study}/runs`, { recipe: RECIPE });
    const run = await pollRun(a, study, res.json().id);
    expect(run.state).toBe('succeeded');
    const entries = (await a.get(`/v1/studies/${study}/entries`)).json().entries as { id: string; signal: string; metadata: Record<string, string> }[];
    // Each entry's own record, fetched through the single-job path (the same job answers, 200).
    const records = new Map<string, { result: { channels: { name: string; bands: { name: string; absolute: number; relative: number | null; decibels: number | null }[] }[] }; resultHash: string }>();
    for (const entry of entries) {
      const job = await a.post('/v1/jobs', { signal: entry.signal, recipe: RECIPE });
      expect(job.statusCode).toBe(200);
      records.set(entry.id, (await a.get(`/v1/jobs/${job.json().id}/record`)).json());
    }

    const csv = await a.get(`/v1/studies/${study}/runs/${run.id}/table?level=bands`);
    expect(csv.statusCode).toBe(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.headers['content-disposition']).toBe(`attachment; filename="${study}-${run.id}-bands.csv"`);
    const rows = csvObjects(csv.body);
    // RFC 4180 §2: the header names the columns; entry and metadata lead, provenance closes.
    expect(Object.keys(rows[0]!).slice(0, 5)).toEqual(['entry', 'subject', 'session', 'condition', 'signal']);
    // One mean row per entry × channel × band (the recipe asks for no per-epoch rows).
    expect(rows).toHaveLength(6 * 8 * 2);
    for (const row of rows) {
      const entry = entries.find((e) => e.id === row.entry)!;
      expect(row).toMatchObject({ ...entry.metadata, signal: entry.signal, scope: 'mean' });
      const record = records.get(entry.id)!;
      const band = record.result.channels.find((c) => c.name === row.channel)!.bands.find((b) => b.name === row.band)!;
      // Each number reads back to the very double of the record (ECMAScript Number-to-String is the shortest round trip).
      expect(Object.is(Number(row.absolute), band.absolute)).toBe(true);
      expect(Object.is(Number(row.relative), band.relative)).toBe(true);
      expect(Object.is(Number(row.decibels), band.decibels)).toBe(true);
      expect(row.resultHash).toBe(record.resultHash);
    }

    // The same table as Parquet, chosen by Accept, read back by an independent reader (parquet-wasm).
    const parquet = await api.app.inject({
      method: 'GET',
      url: `/v1/studies/${study}/runs/${run.id}/table?level=bands`,
      headers: { ...asA, accept: 'text/csv;q=0.5, application/vnd.apache.parquet' },
    });
    expect(parquet.statusCode).toBe(200);
    expect(parquet.headers['content-type']).toBe('application/vnd.apache.parquet');
    const table = tableFromIPC(readParquet(new Uint8Array(parquet.rawPayload)).intoIPCStream());
    expect(table.numRows).toBe(rows.length);
    const subject = table.getChild('subject')!;
    const absolute = table.getChild('absolute')!;
    rows.forEach((row, i) => {
      expect(subject.get(i)).toBe(row.subject);
      expect(Object.is(absolute.get(i), Number(row.absolute))).toBe(true);
    });

    const unknownLevel = await a.get(`/v1/studies/${study}/runs/${run.id}/table?level=everything`);
    expect(unknownLevel.statusCode).toBe(400);
    expect(unknownLevel.json().pointer).toBe('/query/level');
  });

  it('should run only the entries the metadata filter selects', async () => {
    const res = await a.post(`/v1/studies/${study}/runs`, { recipe: { ...RECIPE, segmentSeconds: 2 }, filter: { condition: 'eyes-closed', subject: ['p01', 'p03'] } });
    const done = await pollRun(a, study, res.json().id);
    expect(done.counts).toMatchObject({ total: 2, succeeded: 2 });
  });

  it('should report a failed entry with its problem, and retry the failed entries only', async () => {
    const doomed = signals[5]!;
    const body = demoBody(105, 'eyes-closed', 'early');
    expect((await a.del(`/v1/signals/${doomed}`)).statusCode).toBe(200);
    const recipe = { ...RECIPE, detrend: 'linear' };
    const res = await a.post(`/v1/studies/${study}/runs`, { recipe });
    const done = await pollRun(a, study, res.json().id);
    expect(done).toMatchObject({ state: 'failed', counts: { total: 6, succeeded: 5, failed: 1 } });
    expect(done.failed).toHaveLength(1);
    expect(done.failed[0]).toMatchObject({ signal: doomed, problem: { type: '/problems/signal-not-found' } });
    const jobsBefore = (await a.get('/v1/jobs?limit=1000')).json().jobs;

    // The same content uploaded again has the same id, so the entry is whole again.
    expect((await a.post('/v1/signals', body)).json().id).toBe(doomed);
    const retry = await a.post(`/v1/studies/${study}/runs`, { retryOf: done.id });
    expect(retry.statusCode).toBe(202);
    const retried = await pollRun(a, study, retry.json().id);
    expect(retried).toMatchObject({ state: 'succeeded', counts: { total: 1, succeeded: 1, reused: 0 } });
    const jobsAfter = (await a.get('/v1/jobs?limit=1000')).json().jobs as { id: string }[];
    // One new job; the five that had succeeded are untouched.
    expect(jobsAfter).toHaveLength(jobsBefore.length + 1);
    for (const job of jobsBefore) expect(jobsAfter).toContainEqual(job);
    const nothingLeft = await a.post(`/v1/studies/${study}/runs`, { retryOf: retry.json().id });
    expect(nothingLeft.statusCode).toBe(400);
  });

  it('should cancel a run: its queued jobs are canceled and no further job is queued', async () => {
    // Multitaper jobs of 15 tapers and 16384-point transforms take long enough that the cancel lands
    // while the first window is still computing; the rest must never reach the queue.
    const heavy = { method: 'multitaper', timeBandwidth: 8, taperCount: 15, fftLength: 16384, bands: RECIPE.bands };
    const res = await a.post(`/v1/studies/${study}/runs`, { recipe: heavy });
    expect(res.json().counts.waiting).toBe(4);
    const canceled = await a.del(`/v1/studies/${study}/runs/${res.json().id}`);
    expect(canceled.statusCode).toBe(200);
    expect(canceled.json().state).toBe('canceled');
    const view = await pollRun(a, study, res.json().id);
    expect(view.state).toBe('canceled');
    await new Promise((r) => setTimeout(r, 1500)); // more than a driver tick
    const after = (await a.get(`/v1/studies/${study}/runs/${res.json().id}`)).json() as RunView;
    expect(after.counts.canceled + after.counts.succeeded).toBe(6);
    expect(after.counts.canceled).toBeGreaterThanOrEqual(4);
    const recipeId = (await a.post('/v1/recipes', heavy)).json().id;
    const jobs = (await a.get('/v1/jobs?limit=1000')).json().jobs.filter((j: { recipe: string }) => j.recipe === recipeId);
    // Only the first window ever reached the queue.
    expect(jobs.length).toBeLessThanOrEqual(2);
    expect((await a.del(`/v1/studies/${study}/runs/${res.json().id}`)).statusCode).toBe(409);
  });
});

describe("when a big run shares the queue with another tenant's single job", () => {
  let api: Api;
  beforeAll(async () => {
    api = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '0', WORKER_THREADS: '1', STUDY_RUN_WINDOW: '2' });
  });
  afterAll(async () => api.stop());

  it('should finish the single job before the run, with never more than the window of the run queued', async () => {
    const a = client(api, asA);
    const b = client(api, asB);
    const study = await newStudy(a);
    const entries = [];
    for (let i = 0; i < 10; i++) entries.push({ signal: await upload(a, 300 + i, 'eyes-open', 'late', 6), metadata: { subject: `p${i}` } });
    expect((await a.post(`/v1/studies/${study}/entries`, { entries })).statusCode).toBe(201);
    const single = await upload(b, 999, 'eyes-closed', 'late', 6);
    const run = await a.post(`/v1/studies/${study}/runs`, { recipe: RECIPE });
    expect(run.statusCode).toBe(202);
    const job = await b.post('/v1/jobs', { signal: single, recipe: RECIPE });
    expect(job.statusCode).toBe(202);
    let widest = 0;
    const finished = await pollRun(a, study, run.json().id, 60_000, (view) => (widest = Math.max(widest, view.counts.queued + view.counts.running)));
    expect(finished.state).toBe('succeeded');
    const singleDone = await pollJob(api.app, job.json().id, 20_000, asB);
    expect(singleDone.state).toBe('succeeded');
    expect(widest).toBeLessThanOrEqual(2);
    // The single job waited behind at most two of the run's ten jobs.
    expect(Date.parse(singleDone.finishedAt as string)).toBeLessThan(Date.parse(finished.finishedAt!));
  });
});
