import { Redis } from 'ioredis';

/**
 * Tests that need Redis use TEST_REDIS_URL (default redis://127.0.0.1:6379). Without a Redis they
 * are skipped with the reason printed, except under CI (CI=true) or RHYTHMETRIC_REQUIRE_REDIS=1,
 * where a missing Redis fails the run instead of hiding the distributed-mode tests.
 */
export const TEST_REDIS_URL = process.env.TEST_REDIS_URL ?? 'redis://127.0.0.1:6379';
export const REDIS_REQUIRED = process.env.CI === 'true' || process.env.RHYTHMETRIC_REQUIRE_REDIS === '1';

export async function redisAnswers(url = TEST_REDIS_URL): Promise<boolean> {
  const client = new Redis(url, { lazyConnect: true, maxRetriesPerRequest: 0, connectTimeout: 1000, retryStrategy: () => null });
  client.on('error', () => {});
  try {
    await client.connect();
    return (await client.ping()) === 'PONG';
  } catch {
    return false;
  } finally {
    client.disconnect();
  }
}

/** Top-level await in a test file: resolves to whether the Redis suites run. */
export async function redisForTests(): Promise<boolean> {
  const ok = await redisAnswers();
  if (!ok && REDIS_REQUIRED) throw new Error(`Redis is required here (CI) but does not answer at ${TEST_REDIS_URL}`);
  if (!ok) console.warn(`[skip] Redis tests skipped: no Redis answers at ${TEST_REDIS_URL} (set TEST_REDIS_URL, or CI=true to make this an error)`);
  return ok;
}

export function uniqueName(stem: string): string {
  return `${stem}-${process.pid}-${Date.now().toString(36)}-${Math.floor(Math.random() * 1e6).toString(36)}`;
}
