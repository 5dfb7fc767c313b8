import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';
import { RedisStore } from '../../src/stores/redis-store.js';
import type { Store } from '../../src/stores/store.js';
import { redisForTests, TEST_REDIS_URL, uniqueName } from '../helpers/redis.js';

/**
 * Both stores for `describe.each`: [name, enabled, create]. Each `create` gives a fresh, empty
 * store (a temp data directory, or a unique Redis key prefix) that is removed after the file's tests.
 */
export async function storeKinds(stem: string): Promise<[string, boolean, () => Promise<Store>][]> {
  const withRedis = await redisForTests();
  const cleanups: (() => Promise<void>)[] = [];
  afterAll(async () => {
    for (const cleanup of cleanups) await cleanup();
  });
  return [
    [
      'filesystem',
      true,
      async () => {
        const dir = await mkdtemp(join(tmpdir(), `rhythmetric-${stem}-`));
        cleanups.push(() => rm(dir, { recursive: true, force: true }));
        return new FilesystemStore(dir);
      },
    ],
    [
      'redis',
      withRedis,
      async () => {
        const prefix = uniqueName(`rm-${stem}`);
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
}
