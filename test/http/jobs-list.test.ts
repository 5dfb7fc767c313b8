import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { pollJob, startTestApi } from '../helpers/app.js';

type Api = Awaited<ReturnType<typeof startTestApi>>;
let api: Api;

const ORIGIN = 'https://dash.lab-b.example';

beforeAll(async () => {
  api = await startTestApi({ CORS_ORIGINS: ORIGIN });
});
afterAll(async () => {
  await api.stop();
});

/** A small invented signal: white noise, seeded so that each seed is its own signal. */
function noiseSignal(seed: number) {
  const random = createRandom(seed);
  const row = () => Array.from({ length: 1000 }, () => Math.round(1000 * random.normal()) / 100);
  return { samplingRate: 250, channels: ['Cz', 'Pz'], data: [row(), row()] };
}

async function submit(seed: number, recipe: Record<string, unknown>, labels?: Record<string, string>) {
  // Creation times are in milliseconds: keep them distinct so that the expected order is the submission order.
  await new Promise((r) => setTimeout(r, 3));
  const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: noiseSignal(seed), recipe, ...(labels ? { labels } : {}) } });
  expect(res.statusCode, res.body).toBe(202);
  return res.json() as { id: string; createdAt: string };
}

async function list(query: string) {
  const res = await api.app.inject({ method: 'GET', url: `/v1/jobs${query}` });
  expect(res.statusCode, res.body).toBe(200);
  return res.json() as { jobs: { id: string; state: string; method: string; labels: Record<string, string>; createdAt: string }[]; nextCursor: string | null; links: { next: string | null } };
}

const ids: string[] = [];

describe('when a dashboard lists jobs', () => {
  beforeAll(async () => {
    // Five jobs, created in this order (so listed in the reverse one): two studies, two methods.
    ids.push((await submit(1, { method: 'welch', segmentSeconds: 1 }, { study: 'night-shift', condition: 'eyes-open' })).id);
    ids.push((await submit(2, { method: 'welch', segmentSeconds: 1 }, { study: 'night-shift', condition: 'eyes-closed' })).id);
    ids.push((await submit(3, { method: 'periodogram' }, { study: 'pilot' })).id);
    ids.push((await submit(4, { method: 'multitaper' })).id);
    ids.push((await submit(5, { method: 'welch', segmentSeconds: 2 })).id);
    for (const id of ids) expect((await pollJob(api.app, id)).state).toBe('succeeded');
  });

  it("should carry each job's method and labels, newest first", async () => {
    const page = await list('');
    expect(page.jobs.map((j) => j.id)).toEqual([...ids].reverse());
    expect(page.jobs.map((j) => j.method)).toEqual(['welch', 'multitaper', 'periodogram', 'welch', 'welch']);
    expect(page.jobs[4]!.labels).toEqual({ study: 'night-shift', condition: 'eyes-open' });
    expect(page.jobs[0]!.labels).toEqual({});
    expect(page.nextCursor).toBeNull();
  });

  it('should filter by method, study and state', async () => {
    expect((await list('?method=welch')).jobs.map((j) => j.id)).toEqual([ids[4], ids[1], ids[0]]);
    expect((await list('?study=night-shift')).jobs.map((j) => j.id)).toEqual([ids[1], ids[0]]);
    expect((await list('?study=night-shift&method=periodogram')).jobs).toEqual([]);
    expect((await list('?state=succeeded')).jobs).toHaveLength(5);
    expect((await list('?state=queued,running')).jobs).toEqual([]);
  });

  it('should page with an opaque cursor, never skipping or repeating a job', async () => {
    const seen: string[] = [];
    let page = await list('?limit=2');
    const sizes = [page.jobs.length];
    seen.push(...page.jobs.map((j) => j.id));
    while (page.nextCursor !== null) {
      expect(page.links.next).toContain(`cursor=${page.nextCursor}`);
      page = await list(`?limit=2&cursor=${page.nextCursor}`);
      sizes.push(page.jobs.length);
      seen.push(...page.jobs.map((j) => j.id));
    }
    expect(sizes).toEqual([2, 2, 1]);
    expect(seen).toEqual([...ids].reverse());
  });

  it("should keep the filters on the next page's link", async () => {
    const page = await list('?method=welch&limit=1');
    expect(page.links.next).toMatch(/^\/v1\/jobs\?method=welch&limit=1&cursor=/);
    const second = await list(page.links.next!.slice('/v1/jobs'.length));
    expect(second.jobs.map((j) => j.id)).toEqual([ids[1]]);
  });

  it('should filter by a creation window, both ends excluded', async () => {
    const all = (await list('')).jobs;
    const third = all.find((j) => j.id === ids[2])!;
    const after = (await list(`?createdAfter=${encodeURIComponent(third.createdAt)}`)).jobs.map((j) => j.id);
    expect(after).toEqual(all.filter((j) => j.createdAt > third.createdAt).map((j) => j.id));
    expect(after).not.toContain(ids[2]);
    const before = (await list(`?createdBefore=${encodeURIComponent(third.createdAt)}`)).jobs.map((j) => j.id);
    expect(before).toEqual(all.filter((j) => j.createdAt < third.createdAt).map((j) => j.id));
    // An offset form names the same instant.
    const shifted = new Date(third.createdAt).toISOString().replace('Z', '+00:00');
    expect((await list(`?createdAfter=${encodeURIComponent(shifted)}`)).jobs.map((j) => j.id)).toEqual(after);
  });

  it('should refuse a cursor it did not issue, and a bad filter, saying where', async () => {
    for (const [query, pointer] of [
      ['?cursor=bm90LWEtY3Vyc29y', '/query/cursor'],
      ['?state=queued,finished', '/query/state/1'],
      ['?method=fourier', '/query/method'],
      ['?createdAfter=yesterday', '/query/createdAfter'],
    ] as const) {
      const res = await api.app.inject({ method: 'GET', url: `/v1/jobs${query}` });
      expect(res.statusCode, query).toBe(400);
      expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
      expect(res.json(), query).toMatchObject({ type: '/problems/invalid-request', pointer });
    }
  });

  it("should refuse a malformed label at submission, with the label's pointer, and queue nothing", async () => {
    const before = (await list('')).jobs.length;
    const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: noiseSignal(9), recipe: { method: 'welch', segmentSeconds: 1 }, labels: { '9lives': 'x' } } });
    expect(res.statusCode).toBe(400);
    expect(res.json().pointer).toMatch(/^\/labels/);
    expect((await list('')).jobs.length).toBe(before);
  });
});

describe('when a dashboard watches several jobs at once', () => {
  it('should stream their states as server-sent events and end when all have finished', async () => {
    const a = await submit(21, { method: 'welch', segmentSeconds: 1 });
    const b = await submit(22, { method: 'welch', segmentSeconds: 1 });
    const address = await api.app.listen({ port: 0, host: '127.0.0.1' });
    const res = await fetch(`${address}/v1/jobs/events?ids=${a.id},${b.id},job_00000000000000000000000000000000`, { headers: { origin: ORIGIN } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/event-stream/);
    expect(res.headers.get('access-control-allow-origin')).toBe(ORIGIN);
    // The body ends by itself once both jobs finished (text() would hang otherwise).
    const text = await res.text();
    const events = text
      .split('\n\n')
      .filter((block) => block.includes('data: '))
      .map((block) => ({ event: /event: (\w+)/.exec(block)![1], data: JSON.parse(/data: (.*)/.exec(block)![1]!) }));
    expect(events[0]).toEqual({ event: 'unknown', data: { ids: ['job_00000000000000000000000000000000'] } });
    for (const id of [a.id, b.id]) {
      const states = events.filter((e) => e.event === 'state' && e.data.id === id).map((e) => e.data.state);
      expect(states.at(-1)).toBe('succeeded');
    }
  });
});

describe('when a page on another origin reads responses', () => {
  it("should expose the request id, ETag, download name and an attachment's shape and dtype", async () => {
    const res = await api.app.inject({ method: 'GET', url: '/v1/jobs', headers: { origin: ORIGIN } });
    const exposed = String(res.headers['access-control-expose-headers'])
      .split(',')
      .map((h) => h.trim());
    for (const header of ['x-request-id', 'etag', 'content-disposition', 'x-rhythmetric-shape', 'x-rhythmetric-dtype']) expect(exposed).toContain(header);
  });
});

describe('when a study run submits its jobs', () => {
  it('should label each job with its study, run, entry and metadata, so the list filters by study', async () => {
    const post = (url: string, payload: unknown) => api.app.inject({ method: 'POST', url, payload: payload as Record<string, unknown> });
    const signals: string[] = [];
    for (const seed of [41, 42]) {
      const res = await post('/v1/signals', noiseSignal(seed));
      expect(res.statusCode).toBe(201);
      signals.push(res.json().id);
    }
    const study = (await post('/v1/studies', { name: 'list labels' })).json().id as string;
    const entries = await post(`/v1/studies/${study}/entries`, {
      entries: [
        { signal: signals[0], metadata: { subject: 'p01', condition: 'eyes-open' } },
        { signal: signals[1], metadata: { subject: 'p02', condition: 'eyes-closed', age: 31 } },
      ],
    });
    expect(entries.statusCode, entries.body).toBe(201);
    const run = await post(`/v1/studies/${study}/runs`, { recipe: { method: 'periodogram', detrend: 'linear' } });
    expect(run.statusCode, run.body).toBe(202);
    const runId = run.json().id as string;
    const deadline = Date.now() + 30_000;
    while ((await api.app.inject({ method: 'GET', url: `/v1/studies/${study}/runs/${runId}` })).json().state === 'running' && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));

    const listed = (await list(`?study=${study}`)).jobs;
    expect(listed).toHaveLength(2);
    const bySubject = new Map(listed.map((j) => [j.labels.subject, j]));
    expect(bySubject.get('p01')!.labels).toMatchObject({ study, run: runId, condition: 'eyes-open' });
    expect(bySubject.get('p02')!.labels).toMatchObject({ study, run: runId, condition: 'eyes-closed', age: '31' });
    expect(listed.every((j) => j.method === 'periodogram' && j.labels.entry !== undefined)).toBe(true);
  });
});
