import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RedisStore } from '../../src/stores/redis-store.js';
import { redisForTests, TEST_REDIS_URL } from '../helpers/redis.js';
import { computing, http, LONG_RECIPE, LONG_SIGNAL, noiseFloat32, startDistributed, until, uploadFloat32, type Distributed } from './helpers.js';

const withRedis = await redisForTests();
const { channels, seconds, samplingRate } = LONG_SIGNAL;
const MAX_STALLED = 1;

/**
 * A job whose every run ends with the worker dead (a poison job) must not circle for ever: BullMQ
 * fails it once it has stalled more than maxStalledCount times (docs.bullmq.io, "Stalled jobs"),
 * with the reason "job stalled more than allowable limit" (BullMQ's wording, read in its
 * moveStalledJobsToWait script).
 *
 * Since BullMQ 6 that failure is deferred: the stall check writes the reason into the job hash
 * ("defa") and puts the job back in the wait list, and the next worker to take it fails it at once
 * instead of running it. For that instant the job is active again, with one more start counted, but
 * nothing computes: the test must not mistake it for a real restart and kill a bystander worker
 * (which once made it count three kills instead of two).
 */
describe.skipIf(!withRedis)('when a job kills every worker that picks it up', () => {
  let d: Distributed;
  beforeAll(async () => {
    d = await startDistributed('rm-faults-poison', { WORKER_LOCK_MS: '2000', WORKER_MAX_STALLED: String(MAX_STALLED) }, 2);
  });
  afterAll(async () => d?.destroy());

  it('should fail the job after maxStalledCount + 1 runs and say that it stalled', async () => {
    const { api, workers, prefix } = d;
    const signal = await uploadFloat32(api.base, noiseFloat32(23, channels, seconds, samplingRate), channels, samplingRate);
    const submitted = await http(api.base, 'POST', '/v1/jobs', { signal, recipe: LONG_RECIPE });
    expect(submitted.status).toBe(202);
    const id = submitted.body.id as string;

    let kills = 0;
    let job: Record<string, unknown> = submitted.body;
    // Bounded: at most MAX_STALLED + 3 kills, each wait bounded in time.
    for (let round = 0; round < MAX_STALLED + 3 && job.state !== 'failed'; round++) {
      job = await until(
        'the job to run again or fail',
        async () => {
          // The job hash first (both fields in one read), the state after: "defa" is set before the
          // pickup that counts the extra start and cleared when that pickup fails the job, so read in
          // this order a start without "defa" is a real restart or already a failure, never the pickup.
          const [deferredFailure, started] = await d.redis.hmget(`${d.prefix}:analyses:${id}`, 'defa', 'ats');
          const res = await http(api.base, 'GET', `/v1/jobs/${id}`);
          if (res.body.state !== 'running') return res.body.state === 'queued' ? undefined : res.body;
          // A killed worker's job stays "running" until the stall is noticed: wait for a fresh start
          // (BullMQ's attemptsStarted, "ats"), and for the failure when the start carries "defa".
          return !deferredFailure && Number(started) > kills ? res.body : undefined;
        },
        30_000,
        100,
      );
      if (job.state !== 'running') break;
      const { process: holder } = await computing(workers);
      holder.kill('SIGKILL');
      await holder.exited;
      kills++;
      await d.start();
    }

    expect(job.state).toBe('failed');
    expect(kills).toBe(MAX_STALLED + 1);
    const problem = job.problem as { type: string; status: number; detail: string };
    expect(problem.type).toBe('/problems/worker-crashed');
    expect(problem.status).toBe(500);
    expect(problem.detail).toMatch(/stalled more than allowable limit/);
    // Nothing half-written: no record exists for a job that never finished a run.
    const store = new RedisStore(TEST_REDIS_URL, prefix);
    try {
      expect(await store.listDocuments('records')).toEqual([]);
    } finally {
      await store.close();
    }
    const record = await http(api.base, 'GET', `/v1/jobs/${id}/record`);
    expect(record.status).toBe(409);
  }, 90_000);
});
