import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { storeSignal } from '../../src/stores/signals.js';
import { BullQueue } from '../../src/jobs/bullmq-queue.js';
import { startBullWorker } from '../../src/jobs/bullmq-worker.js';
import { createComputePool, type ComputePool } from '../../src/jobs/compute-pool.js';
import { EmbeddedQueue } from '../../src/jobs/embedded-queue.js';
import type { JobQueue } from '../../src/jobs/queue.js';
import type { JobListFilter } from '../../src/jobs/list.js';
import { jobIdOf, recordKeyOf, type JobSpec, type JobView } from '../../src/jobs/spec.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import type { Signal } from '../../src/signals/signal.js';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';
import { RedisStore } from '../../src/stores/redis-store.js';
import type { Store } from '../../src/stores/store.js';
import { redisForTests, TEST_REDIS_URL, uniqueName } from '../helpers/redis.js';

const withRedis = await redisForTests();

interface Harness {
  queue: JobQueue;
  store: Store;
  close(): Promise<void>;
}

function noise(channels: number, samples: number, seed: number, epochs = 1): Signal {
  const random = createRandom(seed);
  const data = new Float64Array(epochs * channels * samples).map(() => 10 * random.normal());
  return { samplingRate: 500, channels: Array.from({ length: channels }, (_, i) => `E${i + 1}`), unit: 'uV', epochCount: epochs, samplesPerEpoch: samples, data };
}

async function specFor(store: Store, signal: Signal, recipe: unknown, tenant = 'public', labels?: Record<string, string>): Promise<{ spec: JobSpec; id: string }> {
  const meta = await storeSignal(store, signal, tenant);
  const pinned = normalizeRecipe(recipe);
  const recordKey = recordKeyOf(tenant, meta.sha256, pinned.hash);
  return {
    id: jobIdOf(recordKey),
    spec: { tenant, signalId: meta.id, sha256: meta.sha256, recipeId: pinned.id, recipeHash: pinned.hash, recipe: pinned.recipe, recordKey, ...(labels ? { labels } : {}) },
  };
}

const adapters: [string, boolean, () => Promise<Harness>][] = [
  [
    'embedded',
    true,
    async () => {
      const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-queue-'));
      const store = new FilesystemStore(dataDir);
      const pool = createComputePool(1);
      const queue = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool, concurrency: 1 });
      return {
        queue,
        store,
        async close() {
          await queue.close();
          await pool.close();
          await rm(dataDir, { recursive: true, force: true });
        },
      };
    },
  ],
  [
    'bullmq',
    withRedis,
    async () => {
      const prefix = uniqueName('rm-test');
      const store = new RedisStore(TEST_REDIS_URL, prefix);
      const queue = new BullQueue({ url: TEST_REDIS_URL, prefix, queueName: 'analyses', backoffMs: 50 });
      expect(await queue.connected()).toBe(true);
      const pool: ComputePool = createComputePool(1);
      const worker = startBullWorker({ url: TEST_REDIS_URL, prefix, queueName: 'analyses', store: { kind: 'redis', url: TEST_REDIS_URL, prefix }, pool, concurrency: 1 });
      return {
        queue,
        store,
        async close() {
          await worker.close();
          await pool.close();
          await queue.close();
          const keys = await store.redis.keys(`${prefix}:*`);
          if (keys.length > 0) await store.redis.del(...keys);
          await store.close();
        },
      };
    },
  ],
];

const resultHashes = new Map<string, string>();
const recordResults = new Map<string, string>();

describe.each(adapters)('queue adapter %s', (name, enabled, create) => {
  let h: Harness;
  beforeAll(async () => {
    if (enabled) h = await create();
  });
  afterAll(async () => {
    if (enabled) await h.close();
  });

  it.skipIf(!enabled)('should run a job to success with progress 1 and store its record', async () => {
    const { spec, id } = await specFor(h.store, noise(4, 5000, 7, 2), { method: 'welch', fftLength: 1024 });
    const { job, created } = await h.queue.submit(spec, id);
    expect(created).toBe(true);
    expect(['queued', 'running', 'succeeded']).toContain(job.state);
    const done = await h.queue.waitFor(id, 20_000);
    expect(done).toMatchObject({ state: 'succeeded', progress: 1, problem: null });
    expect(done.resultHash).toMatch(/^[0-9a-f]{64}$/);
    const text = await h.store.getDocument('records', spec.recordKey);
    expect(text).not.toBeNull();
    const record = JSON.parse(text!);
    expect(record.resultHash).toBe(done.resultHash);
    resultHashes.set(name, done.resultHash!);
    recordResults.set(name, JSON.stringify(record.result));
  });

  it.skipIf(!enabled)('should answer an identical submission with the existing job', async () => {
    const { spec, id } = await specFor(h.store, noise(4, 5000, 7, 2), { method: 'welch', fftLength: 1024 });
    const again = await h.queue.submit(spec, id);
    expect(again.created).toBe(false);
    expect(again.job.id).toBe(id);
  });

  it.skipIf(!enabled)('should fail a job with bad input at once, without retries, with the reason', async () => {
    const { spec } = await specFor(h.store, noise(1, 1000, 3), { method: 'welch', segmentSeconds: 1 });
    const broken = { ...spec, signalId: 'sig_ffffffffffffffffffffffffffffffff', recordKey: `${spec.recordKey}.broken` };
    const id = jobIdOf(broken.recordKey);
    await h.queue.submit(broken, id);
    const done = await h.queue.waitFor(id, 20_000);
    expect(done.state).toBe('failed');
    // Bad input is not retried: at most the one attempt that found it.
    expect(done.attempts).toBeLessThanOrEqual(1);
    expect(done.problem).toMatchObject({ type: '/problems/signal-not-found', status: 404 });
    expect(done.problem!.detail).toContain('sig_ffffffffffffffffffffffffffffffff');
  });

  it.skipIf(!enabled)('should cancel a job still waiting behind another', async () => {
    const big = await specFor(h.store, noise(64, 60_000, 11), { method: 'welch', fftLength: 1000 });
    const small = await specFor(h.store, noise(1, 1000, 12), { method: 'welch', segmentSeconds: 1 });
    await h.queue.submit(big.spec, big.id);
    await h.queue.submit(small.spec, small.id);
    const canceled = await h.queue.cancel(small.id);
    expect(canceled?.state).toBe('canceled');
    expect((await h.queue.get(small.id))?.state).toBe('canceled');
    expect((await h.queue.waitFor(big.id, 30_000)).state).toBe('succeeded');
    // A canceled job can be submitted again and then runs.
    const again = await h.queue.submit(small.spec, small.id);
    expect(again.created).toBe(true);
    expect((await h.queue.waitFor(small.id, 20_000)).state).toBe('succeeded');
  });

  it.skipIf(!enabled)('should cancel a running job', async () => {
    const big = await specFor(h.store, noise(64, 120_000, 21), { method: 'welch', fftLength: 1009 });
    await h.queue.submit(big.spec, big.id);
    const deadline = Date.now() + 10_000;
    while ((await h.queue.get(big.id))?.state !== 'running' && Date.now() < deadline) await new Promise((r) => setTimeout(r, 5));
    const canceled = await h.queue.cancel(big.id);
    expect(canceled?.state, JSON.stringify(canceled?.problem)).toBe('canceled');
    expect(await h.store.getDocument('records', big.spec.recordKey)).toBeNull();
  });

  it.skipIf(!enabled)('should list by state, method, study and creation window, newest first, and continue after a position', async () => {
    const tenant = `lister-${name}`;
    const submitted: JobView[] = [];
    const add = async (spec: JobSpec, id: string) => {
      // Creation times are in milliseconds: keep them distinct so that the expected order is the submission order.
      await new Promise((r) => setTimeout(r, 3));
      submitted.push((await h.queue.submit(spec, id)).job);
    };
    const a = await specFor(h.store, noise(1, 1000, 31), { method: 'welch', segmentSeconds: 1 }, tenant, { study: 's1' });
    const b = await specFor(h.store, noise(1, 1000, 32), { method: 'periodogram' }, tenant, { study: 's1', condition: 'late' });
    const c = await specFor(h.store, noise(1, 1000, 33), { method: 'welch', segmentSeconds: 1 }, tenant, { study: 's2' });
    const broken = { ...c.spec, signalId: 'sig_eeeeeeeeeeeeeeeeeeeeeeeeeeeeeeee', recordKey: `${c.spec.recordKey}.broken` };
    for (const { spec, id } of [a, b, c, { spec: broken, id: jobIdOf(broken.recordKey) }]) await add(spec, id);
    for (const job of submitted) await h.queue.waitFor(job.id, 20_000);
    const [ja, jb, jc, jd] = submitted.map((j) => j.id);
    const ids = async (filter: Partial<JobListFilter>) => (await h.queue.list({ tenant, limit: 100, ...filter })).map((j) => j.id);

    const all = await h.queue.list({ tenant, limit: 100 });
    expect(all.map((j) => j.id)).toEqual([jd, jc, jb, ja]);
    expect(all.map((j) => j.method)).toEqual(['welch', 'welch', 'periodogram', 'welch']);
    expect(all[2]!.labels).toEqual({ study: 's1', condition: 'late' });
    expect(await ids({ method: 'periodogram' })).toEqual([jb]);
    expect(await ids({ study: 's1' })).toEqual([jb, ja]);
    expect(await ids({ states: ['failed'] })).toEqual([jd]);
    expect(await ids({ states: ['succeeded', 'canceled'] })).toEqual([jc, jb, ja]);
    expect(await ids({ createdAfter: all[2]!.createdAt })).toEqual([jd, jc]);
    expect(await ids({ createdBefore: all[2]!.createdAt })).toEqual([ja]);
    expect(await ids({ after: all[1]! })).toEqual([jb, ja]);
    expect(await ids({ limit: 2 })).toEqual([jd, jc]);
    // Another tenant's jobs never show.
    expect(await ids({ tenant: 'nobody' })).toEqual([]);
  });

  it.skipIf(!enabled)('should answer null for an unknown job and report ready', async () => {
    expect(await h.queue.get('job_00000000000000000000000000000000')).toBeNull();
    expect(await h.queue.ready()).toBe(true);
  });
});

describe('when both modes compute the same job', () => {
  it.skipIf(!withRedis)('should give byte-identical results and the same resultHash', () => {
    expect(resultHashes.get('embedded')).toBeDefined();
    expect(resultHashes.get('bullmq')).toBe(resultHashes.get('embedded'));
    expect(recordResults.get('bullmq')).toBe(recordResults.get('embedded'));
  });
});
