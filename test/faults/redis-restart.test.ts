import { existsSync } from 'node:fs';
import { setTimeout as sleep } from 'node:timers/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REDIS_REQUIRED } from '../helpers/redis.js';
import { http, OwnRedis, pollJobHttp, smallInlineSignal, startHttpApi, startWorkerProcess, until, type ServiceProcess } from './helpers.js';

const haveRedisServer = existsSync('/usr/bin/redis-server') && existsSync('/usr/bin/redis-cli');
if (!haveRedisServer && REDIS_REQUIRED) throw new Error("/usr/bin/redis-server is required here (CI) to stop and restart a Redis of the test's own");
if (!haveRedisServer) console.warn('[skip] Redis outage tests skipped: /usr/bin/redis-server is not installed');

const RECIPE = { method: 'welch', segmentSeconds: 1 };

async function expectQueueUnavailable(base: string, seed: number) {
  const res = await http(base, 'POST', '/v1/jobs', { signal: smallInlineSignal(seed), recipe: RECIPE });
  expect(res.status).toBe(503);
  // RFC 9457 §3: problem details travel as application/problem+json; RFC 9110 §10.2.3: Retry-After in seconds.
  expect(res.headers.get('content-type')).toMatch(/^application\/problem\+json/);
  expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
  expect(res.body.type).toBe('/problems/queue-unavailable');
  expect(res.body.status).toBe(503);
}

/**
 * Redis going away (restart, failover, a full disk) must turn into 503 + Retry-After rather than
 * hung or 500 answers, and the API must reconnect by itself. With append-only persistence
 * (redis.io, "Redis persistence") a job queued before the outage survives it.
 */
async function outage(store: 'redis' | 'filesystem') {
  const redis = await OwnRedis.start();
  const api = await startHttpApi({ REDIS_URL: redis.url, REDIS_PREFIX: 'rm-outage', STORE: store });
  const env = { REDIS_URL: redis.url, REDIS_PREFIX: 'rm-outage', STORE: store, DATA_DIR: api.dataDir };
  const workers: ServiceProcess[] = [];
  return {
    redis,
    api,
    workers,
    env,
    async destroy() {
      await Promise.all(workers.map((w) => w.stop()));
      // Close with Redis up, so that the close does not wait on reconnection bounds.
      await redis.up().catch(() => undefined);
      await Promise.race([api.stop(), sleep(10_000)]);
      await redis.destroy();
    },
  };
}

/** Redis down → the API answers 503 and is not ready; Redis up → submissions succeed again and the earlier job completes. */
async function outageAndRecovery(h: Awaited<ReturnType<typeof outage>>, during: (base: string) => Promise<void>) {
  const { api, redis } = h;
  const before = await http(api.base, 'POST', '/v1/jobs', { signal: smallInlineSignal(1), recipe: RECIPE });
  expect(before.status).toBe(202);
  expect((await http(api.base, 'GET', '/readyz')).status).toBe(200);

  await redis.down();
  await during(api.base);
  const ready = await http(api.base, 'GET', '/readyz');
  expect(ready.status).toBe(503);
  expect(ready.body.status).toBe('unavailable');
  expect((await http(api.base, 'GET', '/healthz')).status).toBe(200);

  await redis.up();
  // ioredis reconnects by itself with back-off (ioredis README, default retryStrategy: min(times·50, 2000) ms).
  const after = await until(
    'a submission to be accepted again',
    async () => {
      const res = await http(api.base, 'POST', '/v1/jobs', { signal: smallInlineSignal(3), recipe: RECIPE });
      return res.status === 202 ? res : undefined;
    },
    20_000,
    250,
  );
  expect((await http(api.base, 'GET', '/readyz')).status).toBe(200);
  const queued = await http(api.base, 'GET', `/v1/jobs/${before.body.id as string}`);
  expect(queued.status).toBe(200);
  expect(queued.body.state).toBe('queued');

  const worker = startWorkerProcess(h.env);
  h.workers.push(worker);
  expect((await pollJobHttp(api.base, before.body.id as string, 30_000)).state).toBe('succeeded');
  expect((await pollJobHttp(api.base, after.body.id as string, 30_000)).state).toBe('succeeded');
  expect(
    worker
      .logs('job completed')
      .map((l) => l.jobId)
      .sort(),
  ).toEqual([before.body.id, after.body.id].sort());
}

/**
 * Redis going away (restart, failover, a full disk) must turn into 503 + Retry-After rather than
 * hung or 500 answers, and the API must reconnect by itself. With append-only persistence
 * (redis.io, "Redis persistence") a job queued before the outage survives it.
 */
describe.skipIf(!haveRedisServer)('when Redis is stopped and started again under a running API', () => {
  describe('when signals live on the filesystem and only the queue is in Redis', () => {
    let h: Awaited<ReturnType<typeof outage>>;
    beforeAll(async () => (h = await outage('filesystem')));
    afterAll(async () => h?.destroy(), 30_000);

    it('should answer 503 queue-unavailable while Redis is down, recover by itself, and keep the job queued before', async () => {
      await outageAndRecovery(h, (base) => expectQueueUnavailable(base, 2));
    }, 90_000);

    it('should keep serving stored records while Redis is down', async () => {
      const job = await http(h.api.base, 'POST', '/v1/jobs', { signal: smallInlineSignal(11), recipe: RECIPE });
      expect(job.status).toBe(202);
      const done = await pollJobHttp(h.api.base, job.body.id as string, 30_000);
      expect(done.state).toBe('succeeded');
      await h.redis.down();
      try {
        const record = await http(h.api.base, 'GET', `/v1/jobs/${job.body.id as string}/record`);
        expect(record.status).toBe(200);
        expect(record.body.resultHash).toBe(done.resultHash);
        expect((await http(h.api.base, 'GET', `/v1/jobs/${job.body.id as string}`)).status).toBe(503);
      } finally {
        await h.redis.up();
      }
    }, 90_000);
  });

  describe('when signals live in Redis too (STORE=redis, the default with REDIS_URL)', () => {
    let h: Awaited<ReturnType<typeof outage>>;
    beforeAll(async () => (h = await outage('redis')));
    afterAll(async () => h?.destroy(), 30_000);

    it('should refuse submissions while Redis is down, recover by itself, and keep the job queued before', async () => {
      await outageAndRecovery(h, async (base) => {
        const res = await http(base, 'POST', '/v1/jobs', { signal: smallInlineSignal(2), recipe: RECIPE });
        expect(res.status).toBeGreaterThanOrEqual(500);
        expect(res.headers.get('content-type')).toMatch(/^application\/problem\+json/);
      });
    }, 90_000);

    // With STORE=redis the store is read before the queue: its faults must be a 503 too, not a 500.
    it('should answer 503 queue-unavailable with Retry-After, not 500, while Redis is down', async () => {
      await h.redis.down();
      try {
        await expectQueueUnavailable(h.api.base, 4);
      } finally {
        await h.redis.up();
      }
    }, 30_000);
  });
});
