import { createHash } from 'node:crypto';
import { tableFromIPC } from 'apache-arrow';
import { readParquet } from 'parquet-wasm/node';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { FeatureRecord, FeatureResult } from '../../src/engine/record.js';
import { demoRecording, toUploadJson } from '../../src/signals/demo-recording.js';
import { pollJob, startTestApi } from '../helpers/app.js';
import { csvObjects } from '../tables/csv-parse.js';

const sha = (key: string) => createHash('sha256').update(key).digest('hex');
const KEYS = { lab: 'lab-a-submit-5e1f0b', other: 'lab-b-submit-c4a902' };
const auth = (key: string) => ({ authorization: `Bearer ${key}` });

let api: Awaited<ReturnType<typeof startTestApi>>;
let jobId: string;
let record: FeatureRecord;

async function submit(recipe: Record<string, unknown>) {
  const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', headers: auth(KEYS.lab), payload: { signal: toUploadJson(demoRecording(6, 3)), recipe } });
  expect(res.statusCode, res.body).toBe(202);
  return pollJob(api.app, res.json().id, 60_000, auth(KEYS.lab));
}

const get = (url: string, headers: Record<string, string> = {}) => api.app.inject({ method: 'GET', url, headers: { ...auth(KEYS.lab), ...headers } });

beforeAll(async () => {
  api = await startTestApi({ API_KEYS: `lab-a:submit:${sha(KEYS.lab)},lab-b:submit:${sha(KEYS.other)}`, RATE_LIMIT_PER_MINUTE: '0' });
  const job = await submit({
    method: 'welch',
    segmentSeconds: 1,
    perEpoch: true,
    features: { peakFrequency: {}, spectralEdge: {} },
    epoching: { mode: 'events', labels: ['eyes-closed/late', 'eyes-open/late'], beforeSeconds: 0, afterSeconds: 4 },
  });
  expect(job.state).toBe('succeeded');
  jobId = job.id as string;
  record = (await get(`/v1/jobs/${jobId}/record`)).json() as FeatureRecord;
}, 90_000);
afterAll(async () => {
  await api.stop();
});

describe('when a table of a succeeded job is asked for', () => {
  it('should stream CSV with a file name, one row per spectrum × channel × band, holding the record numbers', async () => {
    const res = await get(`/v1/jobs/${jobId}/table?level=bands&format=csv`);
    expect(res.statusCode, res.body).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toBe(`attachment; filename="${jobId}-bands.csv"`);
    const rows = csvObjects(res.body);
    const result = record.result as FeatureResult;
    // 1 mean + 2 label means + 4 epochs (the late eyes-open and eyes-closed blocks, two each) × 8 channels × 5 bands.
    expect(rows.length).toBe(7 * 8 * 5);
    const oz = rows.find((r) => r.scope === 'mean' && r.channel === 'Oz' && r.band === 'alpha')!;
    const expected = result.channels.find((c) => c.name === 'Oz')!.bands.find((b) => b.name === 'alpha')!;
    expect(Object.is(Number(oz.absolute), expected.absolute)).toBe(true);
    expect([oz.signal, oz.recipe, oz.resultHash]).toEqual([record.input.signal, record.recipe.id, record.resultHash]);
    // demoRecording(6): the late blocks start at 24, 30, 36 and 42 s, alternating eyes-open and eyes-closed.
    const epochs = rows.filter((r) => r.scope === 'epoch' && r.channel === 'Oz' && r.band === 'alpha');
    expect(epochs.map((r) => [r.epochStart, r.label])).toEqual([
      ['24', 'eyes-open/late'],
      ['30', 'eyes-closed/late'],
      ['36', 'eyes-open/late'],
      ['42', 'eyes-closed/late'],
    ]);
  });

  it('should answer Parquet to Accept: application/vnd.apache.parquet, readable by an independent reader', async () => {
    const res = await get(`/v1/jobs/${jobId}/table?level=features`, { accept: 'application/vnd.apache.parquet' });
    expect(res.statusCode, res.body).toBe(200);
    expect(res.headers['content-type']).toBe('application/vnd.apache.parquet');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="${jobId}-features.parquet"`);
    const table = tableFromIPC(readParquet(new Uint8Array(res.rawPayload)).intoIPCStream());
    expect(table.numRows).toBe(7 * 8);
    const peak = table.getChild('peakFrequency')!;
    const channel = table.getChild('channel')!;
    const i = Array.from({ length: table.numRows }, (_, k) => k).find((k) => channel.get(k) === 'Oz')!;
    expect(peak.get(i)).toBe((record.result as FeatureResult).channels.find((c) => c.name === 'Oz')!.features!.peakFrequency!.frequency);
  });

  it('should prefer the format named in the query to the Accept header, and the better-rated type in Accept', async () => {
    const csv = await get(`/v1/jobs/${jobId}/table?format=csv`, { accept: 'application/vnd.apache.parquet' });
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    const rated = await get(`/v1/jobs/${jobId}/table`, { accept: 'text/csv;q=0.5, application/vnd.apache.parquet' });
    expect(rated.headers['content-type']).toBe('application/vnd.apache.parquet');
    const plain = await get(`/v1/jobs/${jobId}/table`, { accept: '*/*' });
    expect(plain.headers['content-type']).toMatch(/^text\/csv/);
  });
});

describe('when the table cannot be given', () => {
  it('should refuse an unknown level with 400, naming the parameter and the allowed levels', async () => {
    const res = await get(`/v1/jobs/${jobId}/table?level=bandz`);
    expect(res.statusCode).toBe(400);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    const problem = res.json();
    expect(problem).toMatchObject({ type: '/problems/invalid-request', pointer: '/query/level' });
    for (const level of ['bands', 'ratios', 'features', 'spectra', 'summary', 'pair-bands']) expect(problem.detail).toContain(level);
  });

  it('should refuse a level the record cannot give with 422 and the levels it gives', async () => {
    const res = await get(`/v1/jobs/${jobId}/table?level=pair-spectra`);
    expect(res.statusCode).toBe(422);
    expect(res.json()).toMatchObject({ type: '/problems/table-level-unavailable', pointer: '/query/level', levels: ['bands', 'features', 'spectra'] });
  });

  it('should answer 406 when Accept allows neither format', async () => {
    const res = await get(`/v1/jobs/${jobId}/table`, { accept: 'application/json' });
    expect(res.statusCode).toBe(406);
    expect(res.json()).toMatchObject({ type: '/problems/not-acceptable', pointer: '/headers/accept' });
  });

  it('should answer 409 for a job that failed, with its reason', async () => {
    // A flat channel is flagged in every epoch, and dropFlagged leaves no epoch: known only once the samples are read.
    const flat = { samplingRate: 128, channels: ['Cz'], data: [Array.from({ length: 512 }, () => 0)] };
    const res0 = await api.app.inject({
      method: 'POST',
      url: '/v1/jobs',
      headers: auth(KEYS.lab),
      payload: { signal: flat, recipe: { method: 'welch', features: { quality: { dropFlagged: true } } } },
    });
    expect(res0.statusCode, res0.body).toBe(202);
    const failed = await pollJob(api.app, res0.json().id, 60_000, auth(KEYS.lab));
    expect(failed.state).toBe('failed');
    const res = await get(`/v1/jobs/${failed.id as string}/table`);
    expect(res.statusCode).toBe(409);
    expect(res.json()).toMatchObject({ type: '/problems/record-not-ready' });
    expect(res.json().detail).toContain('left out');
  });

  it("should answer 404 for another tenant's job, as for a missing one", async () => {
    const res = await api.app.inject({ method: 'GET', url: `/v1/jobs/${jobId}/table`, headers: auth(KEYS.other) });
    expect(res.statusCode).toBe(404);
    expect(res.json()).toMatchObject({ type: '/problems/job-not-found' });
  });
});

describe('when a binary (float32) upload carries events', () => {
  // Samples k/8 − 4 are exact in float32, so the binary and the JSON upload hold the same numbers.
  const fs = 128;
  const channels = ['O1', 'O2'];
  const seconds = 12;
  const rows = channels.map((_, c) => Array.from({ length: seconds * fs }, (_, i) => ((i * (c + 3)) % 64) / 8 - 4));
  const events = [
    { onset: 0, duration: 6, label: 'eyes-open' },
    { onset: 6, duration: 6, label: 'eyes-closed' },
    { onset: 7.5, duration: null, label: 'blink' },
  ];
  const body = () => {
    const bytes = Buffer.alloc(channels.length * seconds * fs * 4);
    rows.flat().forEach((v, i) => {
      bytes.writeFloatLE(v, i * 4);
    });
    return bytes;
  };
  const binary = (query: string) =>
    api.app.inject({
      method: 'POST',
      url: `/v1/signals?samplingRate=${fs}&channels=${channels.join(',')}${query}`,
      headers: { ...auth(KEYS.lab), 'content-type': 'application/octet-stream' },
      payload: body(),
    });

  it('should store the events as a JSON upload does: the same samples and events give the same signal id', async () => {
    const fromBinary = await binary(`&events=${encodeURIComponent(JSON.stringify(events))}`);
    expect(fromBinary.statusCode, fromBinary.body).toBe(201);
    const fromJson = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: auth(KEYS.lab), payload: { samplingRate: fs, channels, data: rows, events } });
    expect(fromJson.statusCode, fromJson.body).toBe(201);
    expect(fromBinary.json().id).toBe(fromJson.json().id);
    expect(fromBinary.json().events).toEqual(events);
    const without = await binary('');
    expect(without.json().id).not.toBe(fromBinary.json().id);
  });

  it('should take the events in the body of a resumable upload, giving the same signal', async () => {
    const started = await api.app.inject({ method: 'POST', url: '/v1/uploads', headers: auth(KEYS.lab), payload: { format: 'float32', samplingRate: fs, channels, events } });
    expect(started.statusCode, started.body).toBe(201);
    const upload = started.json().id as string;
    const part = await api.app.inject({ method: 'PUT', url: `/v1/uploads/${upload}/parts/1`, headers: { ...auth(KEYS.lab), 'content-type': 'application/octet-stream' }, payload: body() });
    expect(part.statusCode, part.body).toBe(200);
    const done = await api.app.inject({ method: 'POST', url: `/v1/uploads/${upload}/complete`, headers: auth(KEYS.lab), payload: {} });
    expect(done.statusCode, done.body).toBe(201);
    const fromBinary = await binary(`&events=${encodeURIComponent(JSON.stringify(events))}`);
    expect(done.json().id).toBe(fromBinary.json().id);
  });

  it('should cut epochs inside the uploaded blocks and show their labels in the table', async () => {
    const id = (await binary(`&events=${encodeURIComponent(JSON.stringify(events))}`)).json().id as string;
    const submitted = await api.app.inject({
      method: 'POST',
      url: '/v1/jobs',
      headers: auth(KEYS.lab),
      payload: { signal: id, recipe: { method: 'welch', segmentSeconds: 1, perEpoch: true, epoching: { mode: 'blocks', labels: ['eyes-open', 'eyes-closed'], epochSeconds: 2 } } },
    });
    expect(submitted.statusCode, submitted.body).toBe(202);
    const job = await pollJob(api.app, submitted.json().id, 60_000, auth(KEYS.lab));
    expect(job.state, JSON.stringify(job.problem)).toBe('succeeded');
    const table = csvObjects((await get(`/v1/jobs/${job.id as string}/table?level=bands`)).body);
    const epochs = table.filter((r) => r.scope === 'epoch' && r.channel === 'O1' && r.band === 'alpha');
    // Two 6-s blocks, three 2-s epochs each; the blink marker has no duration and tiles nothing.
    expect(epochs.map((r) => [r.epochStart, r.label])).toEqual([
      ['0', 'eyes-open'],
      ['2', 'eyes-open'],
      ['4', 'eyes-open'],
      ['6', 'eyes-closed'],
      ['8', 'eyes-closed'],
      ['10', 'eyes-closed'],
    ]);
  });

  it('should refuse blocks epoching on a label whose events have no duration before queueing, naming the label', async () => {
    const id = (await binary(`&events=${encodeURIComponent(JSON.stringify(events))}`)).json().id as string;
    const res = await api.app.inject({
      method: 'POST',
      url: '/v1/jobs',
      headers: auth(KEYS.lab),
      payload: { signal: id, recipe: { method: 'welch', epoching: { mode: 'blocks', labels: ['eyes-open', 'blink'], epochSeconds: 2 } } },
    });
    expect(res.statusCode).toBe(422);
    expect(res.json()).toMatchObject({ type: '/problems/recipe-unfit', pointer: '/recipe/epoching/labels/1' });
  });

  it('should refuse events that are not JSON, or an event without a label, pointing into the query', async () => {
    const broken = await binary('&events=%5B%7Bonset');
    expect(broken.statusCode).toBe(400);
    expect(broken.json()).toMatchObject({ type: '/problems/invalid-request', pointer: '/query/events' });
    const unlabelled = await binary(`&events=${encodeURIComponent(JSON.stringify([{ onset: 1, duration: 2 }]))}`);
    expect(unlabelled.statusCode).toBe(400);
    expect(unlabelled.json()).toMatchObject({ pointer: '/query/events/0/label' });
  });
});
