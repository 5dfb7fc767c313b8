import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config.js';
import { createLogger } from '../../src/cli/runtime.js';
import { buildApp } from '../../src/http/app.js';
import { OPEN_PRINCIPAL } from '../../src/http/auth.js';
import type { JobQueue } from '../../src/jobs/queue.js';
import { createStore } from '../../src/stores/create-store.js';
import { demoEpochs, toUploadJson } from '../../src/signals/demo-recording.js';
import { pollJob, sink, startTestApi } from '../helpers/app.js';
import { byClass, parseSvg } from '../plots/svg-reader.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
let welchJob: string;
let morletJob: string;
const signal = toUploadJson(demoEpochs('eyes-closed', 'late', 6, 4, 20261201));

async function submit(recipe: Record<string, unknown>): Promise<string> {
  const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal, recipe } });
  expect(res.statusCode, res.body).toBeLessThan(300);
  const job = await pollJob(api.app, res.json().id, 60_000);
  expect(job.state, JSON.stringify(job.problem)).toBe('succeeded');
  return job.id as string;
}

beforeAll(async () => {
  api = await startTestApi();
  welchJob = await submit({ method: 'welch', features: { peakFrequency: {} } });
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

  it('should list the record\'s channels for an unknown channel', async () => {
    const res = await get(`/v1/jobs/${welchJob}/plots/psd?channels=Oz,T7`);
    expect(res.statusCode).toBe(400);
    const body = res.json();
    expect(body.type).toBe('/problems/unknown-channel');
    expect(body.pointer).toBe('/query/channels');
    expect(body.channels).toEqual(['F3', 'F4', 'Fz', 'Cz', 'Pz', 'O1', 'Oz', 'O2']);
  });

  it('should refuse a kind that does not fit the record\'s method, naming those that do', async () => {
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
