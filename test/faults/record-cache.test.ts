import { existsSync } from 'node:fs';
import { setTimeout as sleep } from 'node:timers/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { http, OwnRedis, pollJobHttp, smallInlineSignal, startHttpApi, startWorkerProcess, type ServiceProcess } from './helpers.js';

const haveRedisServer = existsSync('/usr/bin/redis-server') && existsSync('/usr/bin/redis-cli');
const RECIPE = { method: 'spectrogram', segmentSeconds: 0.5, stepSeconds: 0.25 };

async function raw(base: string, path: string) {
  const res = await fetch(`${base}${path}`, { signal: AbortSignal.timeout(10_000) });
  return { status: res.status, bytes: new Uint8Array(await res.arrayBuffer()) };
}

/**
 * Records are immutable (their key names the input hash, the recipe hash and the engine version),
 * so with STORE=redis the API may keep the ones it has served and go on serving them while Redis
 * is down; anything it has not read before still answers 503.
 */
describe.skipIf(!haveRedisServer)('when Redis goes down under an API with STORE=redis', () => {
  let redis: OwnRedis;
  let api: Awaited<ReturnType<typeof startHttpApi>>;
  let worker: ServiceProcess;

  beforeAll(async () => {
    redis = await OwnRedis.start();
    const env = { REDIS_URL: redis.url, REDIS_PREFIX: 'rm-record-cache', STORE: 'redis' };
    api = await startHttpApi(env);
    worker = startWorkerProcess(env);
    await worker.waitForLog('rhythmetric worker started', 20_000);
  });
  afterAll(async () => {
    await worker?.stop();
    await redis?.up().catch(() => undefined);
    await Promise.race([api?.stop(), sleep(10_000)]);
    await redis?.destroy();
  }, 30_000);

  it('should still serve a record and an attachment read before, and answer 503 for one never read', async () => {
    const submit = async (seed: number) => {
      const res = await http(api.base, 'POST', '/v1/jobs', { signal: smallInlineSignal(seed), recipe: RECIPE });
      expect(res.status).toBe(202);
      const done = await pollJobHttp(api.base, res.body.id as string, 30_000);
      expect(done.state).toBe('succeeded');
      return done;
    };
    const read = await submit(61);
    const unread = await submit(62);
    const id = read.id as string;
    const record = await http(api.base, 'GET', `/v1/jobs/${id}/record`);
    expect(record.status).toBe(200);
    const attachments = record.body.attachments as { name: string }[];
    expect(attachments.length).toBeGreaterThan(0);
    const name = attachments[0]!.name;
    const matrix = await raw(api.base, `/v1/jobs/${id}/attachments/${name}`);
    expect(matrix.status).toBe(200);

    await redis.down();
    const job = await http(api.base, 'GET', `/v1/jobs/${id}`);
    expect(job.status).toBe(503); // the job state lives in Redis only: nothing to serve from
    const again = await http(api.base, 'GET', `/v1/jobs/${id}/record`);
    expect(again.status).toBe(200);
    expect(again.body).toEqual(record.body);
    const matrixAgain = await raw(api.base, `/v1/jobs/${id}/attachments/${name}`);
    expect(matrixAgain.status).toBe(200);
    expect(Buffer.from(matrixAgain.bytes).equals(Buffer.from(matrix.bytes))).toBe(true);
    const never = await http(api.base, 'GET', `/v1/jobs/${unread.id as string}/record`);
    expect(never.status).toBe(503);
    expect(never.headers.get('content-type')).toMatch(/^application\/problem\+json/);
    expect(never.body.type).toBe('/problems/queue-unavailable');
    // Another tenant's client cannot use the cache to read it: open mode has one tenant, so the
    // tenant check is covered by the unit test of the cache.
  }, 90_000);
});
