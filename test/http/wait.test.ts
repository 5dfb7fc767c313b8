import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createLogger } from '../../src/cli/runtime.js';
import { DomainError, toProblem } from '../../src/common/errors.js';
import { loadConfig } from '../../src/config.js';
import { buildApp } from '../../src/http/app.js';
import type { ComputePool } from '../../src/jobs/compute-pool.js';
import { EmbeddedQueue } from '../../src/jobs/embedded-queue.js';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';
import { useTestApi } from '../helpers/app.js';

const fs = 250;
/** A sinusoid of amplitude A µV and frequency f Hz, `seconds` long. */
function tone(amplitude: number, frequency: number, seconds: number): number[] {
  return Array.from({ length: seconds * fs }, (_, i) => amplitude * Math.sin((2 * Math.PI * frequency * i) / fs));
}

const smallJob = (amplitude: number) => ({
  signal: { samplingRate: fs, channels: ['Oz'], unit: 'uV', data: [tone(amplitude, 10, 4)] },
  recipe: { method: 'welch', detrend: 'none' },
});

describe('when a client submits a small job with ?wait', () => {
  const api = useTestApi();

  it('should answer 200 with the finished job and its resultHash in one request', async () => {
    const res = await api().app.inject({ method: 'POST', url: '/v1/jobs?wait=20', payload: smallJob(2) });
    expect(res.statusCode).toBe(200);
    const job = res.json();
    expect(job).toMatchObject({ state: 'succeeded', progress: 1, problem: null });
    expect(job.resultHash).toMatch(/^[0-9a-f]{64}$/);
    expect(res.headers.location).toBe(`/v1/jobs/${job.id}`);

    const record = (await api().app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` })).json();
    expect(record.resultHash).toBe(job.resultHash);
    // Common practice (docs/references.md §4): a sinusoid of amplitude A has mean-square power A²/2,
    // and with a periodic Hann window an on-bin 10 Hz tone stays inside the alpha band.
    const alpha = record.result.channels[0].bands.find((b: { name: string }) => b.name === 'alpha');
    expect(alpha.absolute).toBeCloseTo(2, 10);
  });

  it('should answer an identical finished job 200 at once, with or without a wait', async () => {
    const first = await api().app.inject({ method: 'POST', url: '/v1/jobs?wait=20', payload: smallJob(3) });
    expect(first.statusCode).toBe(200);
    const again = await api().app.inject({ method: 'POST', url: '/v1/jobs?wait=0.5', payload: smallJob(3) });
    expect(again.statusCode).toBe(200);
    expect(again.json()).toMatchObject({ id: first.json().id, state: 'succeeded', resultHash: first.json().resultHash });
  });
});

describe('when the wait is not a number of seconds within MAX_WAIT_SECONDS', () => {
  const api = useTestApi({ MAX_WAIT_SECONDS: '5' });

  it.each(['abc', '-1', '6', 'Infinity'])('should answer 400 naming the query parameter for wait=%s and queue nothing', async (wait) => {
    const res = await api().app.inject({ method: 'POST', url: `/v1/jobs?wait=${wait}`, payload: smallJob(4) });
    expect(res.statusCode).toBe(400);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    const problem = res.json();
    expect(problem.pointer).toBe('/query/wait');
    expect(problem.detail).toMatch(/query parameter \/query\/wait/);
    if (wait === '6') expect(problem.detail).toMatch(/at most 5 seconds.*MAX_WAIT_SECONDS/);
    const listed = (await api().app.inject({ method: 'GET', url: '/v1/jobs' })).json();
    expect(listed.jobs).toEqual([]);
  });

  it('should answer 400 for an unknown query parameter, so a misspelt wait is never ignored', async () => {
    const res = await api().app.inject({ method: 'POST', url: '/v1/jobs?wiat=5', payload: smallJob(4) });
    expect(res.statusCode).toBe(400);
    expect(res.json().detail).toMatch(/wiat/);
  });
});

describe('when the job does not finish within the wait', () => {
  const dirs: string[] = [];
  afterEach(async () => {
    for (const dir of dirs.splice(0)) await rm(dir, { recursive: true, force: true });
  });

  /** An embedded API whose computations are answered by `pool`, for jobs whose length the test decides. */
  async function apiWith(pool: ComputePool) {
    const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-wait-'));
    dirs.push(dataDir);
    const config = loadConfig({ DATA_DIR: dataDir, LOG_LEVEL: 'silent' });
    const store = new FilesystemStore(dataDir);
    const queue = await EmbeddedQueue.open({ store, storeConfig: config.store, pool });
    const app = await buildApp({ config, store, queue, logger: createLogger(config) });
    return { app, queue, close: async () => (await app.close(), await queue.close()) };
  }

  it('should answer 202 with the running job once the wait has passed', async () => {
    // A computation that ends only when canceled: longer than any wait.
    const endless: ComputePool = {
      threads: 1,
      run: (_spec, _store, _mode, _progress, signal) => new Promise((_resolve, reject) => signal?.addEventListener('abort', () => reject(new Error('aborted')))),
      close: async () => {},
    };
    const api = await apiWith(endless);
    try {
      const started = Date.now();
      const res = await api.app.inject({ method: 'POST', url: '/v1/jobs?wait=0.3', payload: smallJob(5) });
      expect(res.statusCode).toBe(202);
      // Less 10 ms: the event loop reads its clock once per turn, so a timer may seem a moment early.
      expect(Date.now() - started).toBeGreaterThanOrEqual(290);
      expect(res.json()).toMatchObject({ state: 'running', resultHash: null });
      const canceled = await api.app.inject({ method: 'DELETE', url: `/v1/jobs/${res.json().id}` });
      expect(canceled.json().state).toBe('canceled');
    } finally {
      await api.close();
    }
  });

  it('should answer 200 with the failed job and its problem when it fails within the wait', async () => {
    const failing: ComputePool = {
      threads: 1,
      run: async () => ({ ok: false, problem: toProblem(new DomainError('recipe-unfit', 'the test pool refuses every job', { pointer: '/recipe' })).problem }),
      close: async () => {},
    };
    const api = await apiWith(failing);
    try {
      const res = await api.app.inject({ method: 'POST', url: '/v1/jobs?wait=10', payload: smallJob(6) });
      expect(res.statusCode).toBe(200);
      expect(res.json()).toMatchObject({ state: 'failed', resultHash: null });
      expect(res.json().problem).toMatchObject({ detail: 'the test pool refuses every job', pointer: '/recipe' });
    } finally {
      await api.close();
    }
  });
});
