import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';
import { RedisStore } from '../../src/stores/redis-store.js';
import type { SignalMeta, Store } from '../../src/stores/store.js';
import { redisForTests, TEST_REDIS_URL, uniqueName } from '../helpers/redis.js';

const withRedis = await redisForTests();
const cleanups: (() => Promise<void>)[] = [];
afterAll(async () => {
  for (const cleanup of cleanups) await cleanup();
});

const samples = new Uint8Array(new Float64Array([1, 2, 3, 4]).buffer);
const meta: SignalMeta = {
  id: 'sig_0123456789abcdef0123456789abcdef',
  sha256: 'a'.repeat(64),
  tenant: 'public',
  samplingRate: 2,
  channels: ['A'],
  unit: 'uV',
  epochCount: 1,
  samplesPerEpoch: 4,
  nonFiniteSamples: 0,
  events: [],
  bytes: samples.byteLength,
  storedAt: '2026-12-01T00:00:00.000Z',
};

const stores: [string, boolean, () => Promise<Store>][] = [
  [
    'filesystem',
    true,
    async () => {
      const dir = await mkdtemp(join(tmpdir(), 'rhythmetric-usage-'));
      cleanups.push(() => rm(dir, { recursive: true, force: true }));
      return new FilesystemStore(dir);
    },
  ],
  [
    'redis',
    withRedis,
    async () => {
      const prefix = uniqueName('rm-usage');
      const store = new RedisStore(TEST_REDIS_URL, prefix);
      cleanups.push(async () => {
        const keys = await store.redis.keys(`${prefix}:*`);
        if (keys.length > 0) await store.redis.del(...keys);
        await store.close();
      });
      return store;
    },
  ],
];

describe.each(stores)('%s store', (_name, enabled, create) => {
  it.skipIf(!enabled)('should count a signal stored twice at once only once (storing the same content is harmless)', async () => {
    const store = await create();
    await store.usage(); // the filesystem store keeps a running total from its first scan
    await Promise.all([store.putSignal(meta, samples), store.putSignal(meta, samples)]);
    expect(await store.usage()).toEqual({ signals: 1, bytes: 32 });
    const loaded = await store.getSignal(meta.id);
    expect(Array.from(loaded!.signal.data)).toEqual([1, 2, 3, 4]);
    expect(await store.deleteSignal(meta.id)).toBe(true);
    expect(await store.usage()).toEqual({ signals: 0, bytes: 0 });
  });
});
