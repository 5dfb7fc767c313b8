import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { RedisStore, SAMPLE_CHUNK_BYTES } from '../../src/stores/redis-store.js';
import type { SignalMeta } from '../../src/stores/store.js';
import { redisForTests, TEST_REDIS_URL, uniqueName } from '../helpers/redis.js';

const withRedis = await redisForTests();
const stores: RedisStore[] = [];
afterAll(async () => {
  for (const store of stores) {
    let cursor = '0';
    do {
      const [next, keys] = await store.redis.scan(cursor, 'MATCH', `${store.prefix}:*`, 'COUNT', 500);
      cursor = next;
      if (keys.length) await store.redis.del(...keys);
    } while (cursor !== '0');
    await store.close();
  }
});

function openStore() {
  const store = new RedisStore(TEST_REDIS_URL, uniqueName('rm-chunks'));
  stores.push(store);
  return store;
}

/** 2.5 chunks of seeded noise (invented data), so that the last chunk is a partial one. */
const values = (() => {
  const random = createRandom(71);
  return Float64Array.from({ length: Math.floor((2.5 * SAMPLE_CHUNK_BYTES) / 8) }, () => random.normal());
})();
const bytes = new Uint8Array(values.buffer);
const same = (data: Float64Array) => Buffer.from(data.buffer, data.byteOffset, data.byteLength).equals(Buffer.from(bytes.buffer));
const meta = (id: string): SignalMeta => ({
  id,
  sha256: 'b'.repeat(64),
  tenant: 'public',
  samplingRate: 500,
  channels: ['Cz'],
  unit: 'uV',
  epochCount: 1,
  samplesPerEpoch: values.length,
  nonFiniteSamples: 0,
  events: [],
  bytes: bytes.byteLength,
  storedAt: '2026-12-03T00:00:00.000Z',
});

async function valueSizes(store: RedisStore, id: string): Promise<number[]> {
  const keys = await store.redis.keys(`${store.prefix}:signal:${id}:*`);
  return Promise.all(keys.map((k) => store.redis.strlen(k)));
}

describe.skipIf(!withRedis)('when a large signal is stored in Redis', () => {
  it('should keep every value at or under the chunk size and read the samples back bit for bit', async () => {
    const store = openStore();
    const id = 'sig_00000000000000000000000000000001';
    await store.putSignal(meta(id), bytes);
    const sizes = await valueSizes(store, id);
    expect(Math.max(...sizes)).toBeLessThanOrEqual(SAMPLE_CHUNK_BYTES);
    expect(sizes.length).toBe(1 + 3); // the meta and ⌈2.5⌉ chunks
    const loaded = await store.getSignal(id);
    expect(same(loaded!.signal.data)).toBe(true);
    expect((await store.usage()).bytes).toBe(bytes.byteLength);
  });

  it('should store a samples file the same way, and remove every chunk with the signal', async () => {
    const store = openStore();
    const id = 'sig_00000000000000000000000000000002';
    const dir = await mkdtemp(join(tmpdir(), 'rhythmetric-chunks-'));
    try {
      const path = join(dir, 'samples.f64');
      await writeFile(path, bytes);
      await store.putSignalFile(meta(id), path);
      expect(same((await store.getSignal(id))!.signal.data)).toBe(true);
      // Committed chunks are permanent (TTL -1); only chunks of an unfinished write expire.
      const chunk = `${store.prefix}:signal:${id}:samples:0`;
      expect(await store.redis.pttl(chunk)).toBe(-1);
      expect(await store.deleteSignal(id)).toBe(true);
      expect(await valueSizes(store, id)).toEqual([]);
      expect((await store.usage()).bytes).toBe(0);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('should still read a signal stored before chunks, as one value', async () => {
    const store = openStore();
    const id = 'sig_00000000000000000000000000000003';
    await store.redis.set(`${store.prefix}:signal:${id}:meta`, JSON.stringify(meta(id)));
    await store.redis.set(`${store.prefix}:signal:${id}:samples`, Buffer.from(bytes.buffer));
    expect(same((await store.getSignal(id))!.signal.data)).toBe(true);
    await store.redis.incrby(`${store.prefix}:usage:bytes`, bytes.byteLength);
    await store.redis.incr(`${store.prefix}:usage:signals`);
    expect(await store.deleteSignal(id)).toBe(true);
    expect(await valueSizes(store, id)).toEqual([]);
  });
});
