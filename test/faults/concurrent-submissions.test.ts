import { Redis } from 'ioredis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RedisStore } from '../../src/stores/redis-store.js';
import type { Store } from '../../src/stores/store.js';
import { redisForTests, TEST_REDIS_URL, uniqueName } from '../helpers/redis.js';
import { FINISHED, http, smallInlineSignal, startHttpApi, startWorkerProcess, until, type HttpAnswer, type ServiceProcess } from './helpers.js';

const withRedis = await redisForTests();
const SUBMISSIONS = 500;
const RECIPE = { method: 'welch', segmentSeconds: 1 };

/**
 * Fires every submission at once over real loopback HTTP (not inject), so the sockets, the body
 * parser and the queue all see the burst; then checks the bookkeeping of each accepted job.
 */
async function burst(base: string, seedBase: number): Promise<HttpAnswer[]> {
  return Promise.all(Array.from({ length: SUBMISSIONS }, (_, i) => http(base, 'POST', '/v1/jobs', { signal: smallInlineSignal(seedBase + i, 2, 2, 128), recipe: RECIPE })));
}

/** Every accepted job must end succeeded or failed-with-a-reason: none lost, none twice. */
async function checkAccounting(base: string, answers: HttpAnswer[], store: Store, timeoutMs: number) {
  const statuses = new Map<number, number>();
  for (const a of answers) statuses.set(a.status, (statuses.get(a.status) ?? 0) + 1);
  // Distinct signals → distinct jobs, all new: every answer is 202 (nothing refused under the burst).
  expect(Object.fromEntries(statuses)).toEqual({ 202: SUBMISSIONS });
  const ids = answers.map((a) => a.body.id as string);
  expect(new Set(ids).size).toBe(SUBMISSIONS);

  const finished = await until(
    `all ${SUBMISSIONS} jobs to finish`,
    async () => {
      const listed = await http(base, 'GET', '/v1/jobs?limit=1000');
      const jobs = listed.body.jobs as { id: string; state: string; problem: { detail: string } | null; resultHash: string | null }[];
      return jobs.length >= SUBMISSIONS && jobs.every((j) => FINISHED.has(j.state)) ? jobs : undefined;
    },
    timeoutMs,
    500,
  );
  expect(finished.map((j) => j.id).sort()).toEqual([...ids].sort());
  for (const job of finished) {
    if (job.state === 'failed') expect(job.problem?.detail).toMatch(/\S/);
    else expect(job.state).toBe('succeeded');
  }
  const succeeded = finished.filter((j) => j.state === 'succeeded');
  // One record per succeeded job, no more: a job computed twice would still write one key, so the
  // distinct result hashes show that no two jobs shared a record either.
  expect((await store.listDocuments('records')).length).toBe(succeeded.length);
  expect(new Set(succeeded.map((j) => j.resultHash)).size).toBe(succeeded.length);
  return { succeeded: succeeded.length, failed: finished.length - succeeded.length };
}

describe(`when ${SUBMISSIONS} submissions arrive at once`, () => {
  describe('when the API runs in embedded mode', () => {
    let api: Awaited<ReturnType<typeof startHttpApi>>;
    beforeAll(async () => (api = await startHttpApi({ WORKER_THREADS: '2' })));
    afterAll(async () => api?.stop());

    it('should finish every accepted job once, with one stored job document each', async () => {
      const answers = await burst(api.base, 1000);
      const result = await checkAccounting(api.base, answers, api.store, 120_000);
      expect(result.succeeded).toBe(SUBMISSIONS);
      expect((await api.store.listDocuments('jobs')).length).toBe(SUBMISSIONS);
    }, 150_000);
  });

  describe.skipIf(!withRedis)('when the API queues on Redis for two worker processes', () => {
    const prefix = uniqueName('rm-faults-burst');
    const env = { REDIS_URL: TEST_REDIS_URL, REDIS_PREFIX: prefix, QUEUE_NAME: 'analyses' };
    let api: Awaited<ReturnType<typeof startHttpApi>>;
    const workers: ServiceProcess[] = [];
    let store: RedisStore;

    beforeAll(async () => {
      api = await startHttpApi(env);
      store = new RedisStore(TEST_REDIS_URL, prefix);
      workers.push(startWorkerProcess(env), startWorkerProcess(env));
      await Promise.all(workers.map((w) => w.waitForLog('rhythmetric worker started', 20_000)));
    });

    afterAll(async () => {
      await Promise.all(workers.map((w) => w.stop()));
      await api?.stop();
      const redis = new Redis(TEST_REDIS_URL, { maxRetriesPerRequest: 1 });
      const keys = await redis.keys(`${prefix}:*`);
      if (keys.length > 0) await redis.del(...keys);
      redis.disconnect();
      await store?.close();
    });

    it('should finish every accepted job once across both workers', async () => {
      const answers = await burst(api.base, 5000);
      const result = await checkAccounting(api.base, answers, store, 120_000);
      expect(result.succeeded).toBe(SUBMISSIONS);
      const completed = workers.flatMap((w) => w.logs('job completed').map((l) => l.jobId as string));
      // Each job completed by exactly one worker, once.
      expect(completed.length).toBe(SUBMISSIONS);
      expect(new Set(completed).size).toBe(SUBMISSIONS);
    }, 150_000);
  });
});
