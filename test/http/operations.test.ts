import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pollJob, startTestApi } from '../helpers/app.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi();
});
afterAll(async () => {
  await api.stop();
});

const signal = { samplingRate: 200, channels: ['O1', 'O2'], data: [0, 1].map((c) => Array.from({ length: 2000 }, (_, i) => Math.sin(i / 5 + c))) };

describe('when a dashboard follows a job', () => {
  it('should stream its states as server-sent events and end after the finished state', async () => {
    const job = (await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal, recipe: { method: 'welch', segmentSeconds: 1, perEpoch: true } } })).json();
    const res = await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/events` });
    expect(res.statusCode).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/event-stream/);
    const events = res.body
      .split('\n\n')
      .filter((block) => block.includes('event: state'))
      .map((block) =>
        JSON.parse(
          block
            .split('\n')
            .find((l) => l.startsWith('data: '))!
            .slice(6),
        ),
      );
    expect(events.length).toBeGreaterThan(0);
    expect(events.at(-1)).toMatchObject({ id: job.id, state: 'succeeded', progress: 1 });
    const unknown = await api.app.inject({ method: 'GET', url: '/v1/jobs/job_00000000000000000000000000000000/events' });
    expect(unknown.statusCode).toBe(404);
  });
});

describe('when Prometheus scrapes the service', () => {
  it('should expose job counts by state, queue depth, job durations, stored bytes and HTTP latency', async () => {
    const job = (await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal, recipe: { method: 'multitaper' } } })).json();
    await pollJob(api.app, job.id);
    const res = await api.app.inject({ method: 'GET', url: '/metrics' });
    expect(res.statusCode).toBe(200);
    const text = res.body;
    expect(text).toMatch(/rhythmetric_jobs\{state="succeeded"\} [1-9]/);
    expect(text).toMatch(/rhythmetric_queue_depth \d+/);
    expect(text).toMatch(/rhythmetric_job_duration_seconds_count\{method="multitaper",state="succeeded"\} 1/);
    expect(text).toMatch(/rhythmetric_stored_bytes [1-9]/);
    expect(text).toMatch(/rhythmetric_http_request_duration_seconds_count\{method="POST",route="\/v1\/jobs",status="202"\} [1-9]/);
    expect(text).toMatch(/rhythmetric_jobs_submitted_total\{method="multitaper",created="true"\} 1/);
  });
});

describe('when the store has a size limit', () => {
  it('should answer 507 once the limit is reached and store nothing half-written', async () => {
    const small = await startTestApi({ MAX_STORE_BYTES: String(2000 * 2 * 8 + 100) });
    try {
      expect((await small.app.inject({ method: 'POST', url: '/v1/signals', payload: signal })).statusCode).toBe(201);
      const full = await small.app.inject({ method: 'POST', url: '/v1/signals', payload: { ...signal, channels: ['O1', 'Oz'] } });
      expect(full.statusCode).toBe(507);
      expect(full.json().type).toBe('/problems/storage-full');
      expect((await small.store.usage()).signals).toBe(1);
      expect(await small.store.listSignals()).toHaveLength(1);
    } finally {
      await small.stop();
    }
  });
});

describe('when data outlives the retention period', () => {
  it('should sweep finished jobs, their records and old signals, and keep what is newer', async () => {
    const { sweepExpired } = await import('../../src/jobs/retention.js');
    const local = await startTestApi();
    try {
      const job = (await local.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal, recipe: { method: 'welch', segmentSeconds: 1 } } })).json();
      await pollJob(local.app, job.id);
      expect(await sweepExpired(local.store, local.queue, 3_600_000)).toEqual({ jobs: 0, records: 0, signals: 0 });
      // An hour later with a retention of one minute, everything above is expired.
      const removed = await sweepExpired(local.store, local.queue, 60_000, Date.now() + 3_600_000);
      expect(removed).toEqual({ jobs: 1, records: 1, signals: 1 });
      expect((await local.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}` })).statusCode).toBe(404);
      expect(await local.store.listDocuments('records')).toEqual([]);
    } finally {
      await local.stop();
    }
  });
});
