import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config.js';
import { createLogger } from '../../src/cli/runtime.js';
import { buildApp } from '../../src/http/app.js';
import { OPEN_PRINCIPAL } from '../../src/http/auth.js';
import type { JobQueue } from '../../src/jobs/queue.js';
import { createStore } from '../../src/stores/create-store.js';
import { demoEpochs, toUploadJson } from '../../src/signals/demo-recording.js';
import { pollJob, sink, startTestApi } from '../helpers/app.js';
import { byClass, labelValue, parseSvg } from '../plots/svg-reader.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
let welchJob: string;
let morletJob: string;
let openJob: string;
const signal = toUploadJson(demoEpochs('eyes-closed', 'late', 6, 4, 20261201));

async function submit(recipe: Record<string, unknown>, body: unknown = signal): Promise<string> {
  const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: body, recipe } });
  expect(res.statusCode, res.body).toBeLessThan(300);
  const job = await pollJob(api.app, res.json().id, 60_000);
  expect(job.state, JSON.stringify(job.problem)).toBe('succeeded');
  return job.id as string;
}

beforeAll(async () => {
  api = await startTestApi();
  welchJob = await submit({ method: 'welch', features: { peakFrequency: {} } });
  openJob = await submit({ method: 'welch' }, toUploadJson(demoEpochs('eyes-open', 'late', 6, 4, 20261201)));
  morletJob = await submit({ method: 'morlet', frequencies: { low: 4, high: 30, count: 12 }, decimation: 8 });
}, 120_000);
afterAll(async () => {
  await api.stop();
});

const get = (url: string, headers: Record<string, string> = {}) => api.app.inject({ method: 'GET', url, headers });

describe('when a PSD plot of a succeeded Welch job is asked for', () => {
  it('should answer SVG of the asked size with an ETag, the same bytes each time', async () => {
    const res = await get(`/v1/jobs/${welchJob}/plots/psd?channels=O1,Oz&width=640&height=360`);
    expect(res.statusCode, res.body).toBe(200);
    expect(res.headers['content-type']).toBe('image/svg+xml; charset=utf-8');
    const doc = parseSvg(res.body);
    expect(doc.documentElement!.getAttribute('width')).toBe('640');
    expect(doc.documentElement!.getAttribute('height')).toBe('360');
    expect(byClass(doc, 'series').map((p) => p.getAttribute('data-series'))).toEqual(['O1', 'Oz']);
    expect(res.headers.etag).toMatch(/^"[0-9a-f]{64}"$/);
    const again = await get(`/v1/jobs/${welchJob}/plots/psd?channels=O1,Oz&width=640&height=360`);
    expect(again.body).toBe(res.body);
    expect(again.headers.etag).toBe(res.headers.etag);
  });

  it('should answer 304 with no body when If-None-Match holds the ETag', async () => {
    const first = await get(`/v1/jobs/${welchJob}/plots/psd?scale=log10`);
    const res = await get(`/v1/jobs/${welchJob}/plots/psd?scale=log10`, { 'if-none-match': `"nope", ${first.headers.etag as string}` });
    expect(res.statusCode).toBe(304);
    expect(res.body).toBe('');
    expect(res.headers.etag).toBe(first.headers.etag);
    const other = await get(`/v1/jobs/${welchJob}/plots/psd?scale=db`, { 'if-none-match': first.headers.etag as string });
    expect(other.statusCode).toBe(200);
  });
});

describe('when a time–frequency plot of a succeeded Morlet job is asked for', () => {
  it("should read the channel's matrix from the store and span the colour bar over it", async () => {
    const res = await get(`/v1/jobs/${morletJob}/plots/time-frequency?channels=Oz`);
    expect(res.statusCode, res.body).toBe(200);
    const record = (await get(`/v1/jobs/${morletJob}/record`)).json();
    const listed = record.result.timeFrequency.attachments as { name: string; kind: string; channel: string | null }[];
    const fetch = async (name: string) => (await get(`/v1/jobs/${morletJob}/attachments/${name}`)).rawPayload;
    const powerBytes = await fetch(listed.find((a) => a.kind === 'power' && a.channel === 'Oz')!.name);
    const mask = await fetch(listed.find((a) => a.kind === 'edgeMask')!.name);
    let min = Infinity;
    let max = -Infinity;
    for (let i = 0; i < mask.length; i++) {
      const v = powerBytes.readDoubleLE(i * 8);
      if (mask[i] !== 1 && Number.isFinite(v)) [min, max] = [Math.min(min, v), Math.max(max, v)];
    }
    const doc = parseSvg(res.body);
    const ends = byClass(doc, 'colour-bar-end').map((t) => labelValue(t.textContent!));
    expect(Math.abs(ends[0]! - 10 * Math.log10(min))).toBeLessThan(0.01);
    expect(Math.abs(ends[1]! - 10 * Math.log10(max))).toBeLessThan(0.01);
    expect(byClass(doc, 'panel').map((p) => p.getAttribute('data-channel'))).toEqual(['Oz']);
  });

  it('should refuse a time–frequency plot of a Welch record and a bands plot of a Morlet record', async () => {
    const tf = await get(`/v1/jobs/${welchJob}/plots/time-frequency`);
    expect(tf.statusCode).toBe(422);
    expect(tf.json().allowed).toEqual(['psd', 'bands']);
    const bands = await get(`/v1/jobs/${morletJob}/plots/bands`);
    expect(bands.statusCode).toBe(422);
    expect(bands.json().allowed).toEqual(['time-frequency']);
  });

  it('should draw the bands of a Welch job', async () => {
    const res = await get(`/v1/jobs/${welchJob}/plots/bands?value=relative&channels=O2`);
    expect(res.statusCode, res.body).toBe(200);
    expect(byClass(parseSvg(res.body), 'bar')).toHaveLength(5);
  });
});

describe('when two jobs are compared', () => {
  it('should overlay their PSDs of the channel with the given labels, with an ETag', async () => {
    const url = `/v1/plots/compare?jobs=${welchJob},${openJob}&channel=O1&labels=eyes%20closed,eyes%20open&frequencyRange=1,40`;
    const res = await get(url);
    expect(res.statusCode, res.body).toBe(200);
    expect(byClass(parseSvg(res.body), 'series').map((l) => l.getAttribute('data-series'))).toEqual(['eyes closed', 'eyes open']);
    expect((await get(url, { 'if-none-match': res.headers.etag as string })).statusCode).toBe(304);
  });

  it('should point at what is wrong', async () => {
    const labels = await get(`/v1/plots/compare?jobs=${welchJob},${openJob}&channel=O1&labels=one`);
    expect(labels.statusCode).toBe(400);
    expect(labels.json().pointer).toBe('/query/labels');
    const channel = await get(`/v1/plots/compare?jobs=${welchJob},${openJob}&channel=T7`);
    expect(channel.statusCode).toBe(400);
    expect(channel.json().pointer).toBe('/query/channel');
    const method = await get(`/v1/plots/compare?jobs=${welchJob},${morletJob}&channel=O1`);
    expect(method.statusCode).toBe(422);
    expect(method.json().pointer).toBe('/query/jobs');
    const one = await get(`/v1/plots/compare?jobs=${welchJob}&channel=O1`);
    expect(one.statusCode).toBe(400);
    expect(one.json().pointer).toBe('/query/jobs');
  });
});

describe('when a study run is drawn per condition', () => {
  it("should draw one mean with its spread per condition over the run's succeeded entries", async () => {
    const post = (url: string, payload: unknown) => api.app.inject({ method: 'POST', url, payload: payload as Record<string, unknown> });
    const entries = [];
    for (const [i, condition] of (['eyes-closed', 'eyes-open', 'eyes-closed', 'eyes-open'] as const).entries()) {
      const res = await post('/v1/signals', toUploadJson(demoEpochs(condition, 'early', 2, 4, 700 + i)));
      expect(res.statusCode, res.body).toBe(201);
      entries.push({ signal: res.json().id, metadata: { subject: `p0${1 + (i >> 1)}`, condition } });
    }
    const study = (await post('/v1/studies', { name: 'plot study' })).json().id as string;
    expect((await post(`/v1/studies/${study}/entries`, { entries })).statusCode).toBe(201);
    const run = (await post(`/v1/studies/${study}/runs`, { recipe: { method: 'welch' } })).json().id as string;
    const deadline = Date.now() + 60_000;
    while ((await get(`/v1/studies/${study}/runs/${run}`)).json().state === 'running' && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
    const res = await get(`/v1/studies/${study}/runs/${run}/plots/psd?channel=Oz`);
    expect(res.statusCode, res.body).toBe(200);
    const doc = parseSvg(res.body);
    expect(byClass(doc, 'series').map((l) => l.getAttribute('data-series'))).toEqual(['eyes-closed (n = 2)', 'eyes-open (n = 2)']);
    expect(byClass(doc, 'spread')).toHaveLength(2);
    const key = await get(`/v1/studies/${study}/runs/${run}/plots/psd?channel=Oz&by=shift`);
    expect(key.statusCode).toBe(400);
    expect(key.json().pointer).toBe('/query/by');
    expect(key.json().allowed).toEqual(['condition', 'subject']);
  });
});

describe('when a plot request is wrong', () => {
  it('should list the kinds for an unknown kind', async () => {
    const res = await get(`/v1/jobs/${welchJob}/plots/histogram`);
    expect(res.statusCode).toBe(404);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    const body = res.json();
    expect(body.type).toBe('/problems/unknown-plot-kind');
    expect(body.pointer).toBe('/params/kind');
    expect(body.allowed).toContain('psd');
  });

  it("should list the record's channels for an unknown channel", async () => {
    const res = await get(`/v1/jobs/${welchJob}/plots/psd?channels=Oz,T7`);
    expect(res.statusCode).toBe(400);
    const body = res.json();
    expect(body.type).toBe('/problems/unknown-channel');
    expect(body.pointer).toBe('/query/channels');
    expect(body.channels).toEqual(['F3', 'F4', 'Fz', 'Cz', 'Pz', 'O1', 'Oz', 'O2']);
  });

  it("should refuse a kind that does not fit the record's method, naming those that do", async () => {
    const res = await get(`/v1/jobs/${morletJob}/plots/psd`);
    expect(res.statusCode).toBe(422);
    const body = res.json();
    expect(body.type).toBe('/problems/plot-not-applicable');
    expect(body.detail).toContain('morlet');
  });

  it('should point at a malformed option', async () => {
    const res = await get(`/v1/jobs/${welchJob}/plots/psd?width=20`);
    expect(res.statusCode).toBe(400);
    expect(res.json().pointer).toBe('/query/width');
    const range = await get(`/v1/jobs/${welchJob}/plots/psd?frequencyRange=40,10`);
    expect(range.statusCode).toBe(400);
    expect(range.json().pointer).toBe('/query/frequencyRange');
    const empty = await get(`/v1/jobs/${welchJob}/plots/psd?frequencyRange=500,600`);
    expect(empty.statusCode).toBe(400);
    expect(empty.json().pointer).toBe('/query/frequencyRange');
  });

  it('should answer 404 for an unknown job', async () => {
    const res = await get(`/v1/jobs/job_${'0'.repeat(32)}/plots/psd`);
    expect(res.statusCode).toBe(404);
    expect(res.json().type).toBe('/problems/job-not-found');
  });
});

describe('when the job has not succeeded yet', () => {
  it('should answer 409 record-not-ready', async () => {
    const config = loadConfig({ DATA_DIR: api.dataDir, LOG_LEVEL: 'silent' });
    const running = { id: `job_${'1'.repeat(32)}`, tenant: OPEN_PRINCIPAL.tenant, state: 'running', progress: 0.5, recordKey: 'none' };
    const queue = { mode: 'embedded', get: async (id: string) => (id === running.id ? running : null), onFinished: () => () => {} } as unknown as JobQueue;
    const app = await buildApp({ config, store: createStore(config.store), queue, logger: createLogger(config, sink().stream) });
    try {
      const res = await app.inject({ method: 'GET', url: `/v1/jobs/${running.id}/plots/psd` });
      expect(res.statusCode, res.body).toBe(409);
      expect(res.json().type).toBe('/problems/record-not-ready');
    } finally {
      await app.close();
    }
  });
});
