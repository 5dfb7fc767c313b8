import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { redisForTests } from '../helpers/redis.js';
import { freePort, http, LONG_RECIPE, LONG_SIGNAL, noiseFloat32, OwnRedis, pollJobHttp, serveEmbedded, ServiceProcess, startDistributed, until, uploadFloat32, type Distributed } from './helpers.js';

const withRedis = await redisForTests();
const { channels, seconds, samplingRate } = LONG_SIGNAL;
/** SIGTERM → exit: Kubernetes waits 30 s (terminationGracePeriodSeconds) before SIGKILL; common practice. */
const EXIT_BOUND_MS = 30_000;

async function runningJob(base: string, seed: number): Promise<string> {
  const signal = await uploadFloat32(base, noiseFloat32(seed, channels, seconds, samplingRate), channels, samplingRate);
  const submitted = await http(base, 'POST', '/v1/jobs', { signal, recipe: LONG_RECIPE });
  expect(submitted.status).toBe(202);
  const id = submitted.body.id as string;
  await until('the job to run', async () => ((await http(base, 'GET', `/v1/jobs/${id}`)).body.state === 'running' ? true : undefined), 20_000, 50);
  return id;
}

async function exitWithin(child: ServiceProcess, ms: number) {
  const started = Date.now();
  const result = await Promise.race([child.exited, new Promise<null>((ok) => setTimeout(() => ok(null), ms))]);
  return { result, ms: Date.now() - started };
}

describe('when the embedded server gets SIGTERM while a job runs', () => {
  let dataDir: string;
  const children: ServiceProcess[] = [];

  beforeAll(async () => {
    dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-shutdown-'));
  });

  afterAll(async () => {
    await Promise.all(children.map((c) => c.stop()));
    await rm(dataDir, { recursive: true, force: true });
  });

  const serve = () => serveEmbedded(dataDir, children);

  it('should exit 0 promptly and resume the job from DATA_DIR after a restart', async () => {
    const first = await serve();
    const id = await runningJob(first.base, 31);
    first.child.kill('SIGTERM');
    const { result, ms } = await exitWithin(first.child, EXIT_BOUND_MS);
    expect(result, `no exit within ${EXIT_BOUND_MS} ms`).not.toBeNull();
    expect(result!.code).toBe(0);
    expect(ms).toBeLessThan(EXIT_BOUND_MS);
    expect(first.child.logs('shutting down')).toHaveLength(1);

    const second = await serve();
    const finished = await pollJobHttp(second.base, id, 60_000);
    expect(finished.state).toBe('succeeded');
    // The interrupted run and the resumed one.
    expect(finished.attempts).toBe(2);
    const record = await http(second.base, 'GET', `/v1/jobs/${id}/record`);
    expect(record.status).toBe(200);
    expect(record.body.resultHash).toBe(finished.resultHash);
  }, 150_000);
});

describe.skipIf(!withRedis)('when a worker process gets SIGTERM while it computes', () => {
  let d: Distributed;
  beforeAll(async () => {
    d = await startDistributed('rm-faults-term', { WORKER_LOCK_MS: '2000' }, 0);
  });
  afterAll(async () => d?.destroy());

  it('should not lose the job: the worker finishes it (or hands it back) and exits 0', async () => {
    const { api, workers } = d;
    const worker = await d.start();
    const id = await runningJob(api.base, 37);
    worker.kill('SIGTERM');
    const { result } = await exitWithin(worker, 60_000);
    expect(result, 'the worker did not exit within 60 s').not.toBeNull();
    expect(result!.code).toBe(0);

    let job = (await http(api.base, 'GET', `/v1/jobs/${id}`)).body;
    if (job.state !== 'succeeded') {
      // Handed back instead of finished: another worker must pick it up.
      await d.start();
      job = await pollJobHttp(api.base, id, 45_000);
    }
    expect(job.state).toBe('succeeded');
    const completions = workers.flatMap((w) => w.logs('job completed')).filter((l) => l.jobId === id);
    expect(completions).toHaveLength(1);
  }, 90_000);
});

describe.skipIf(!existsSync('/usr/bin/redis-server'))('when the distributed API gets SIGTERM while Redis is down', () => {
  let redis: OwnRedis;
  let server: ServiceProcess | null = null;
  beforeAll(async () => (redis = await OwnRedis.start()));
  afterAll(async () => {
    await server?.stop();
    await redis?.destroy();
  });

  // Closing waits on Redis connections; with Redis unreachable those waits must be bounded, or
  // the shutdown hook never reaches process.exit and the orchestrator has to SIGKILL the API.
  it('should still exit 0 within 15 s', async () => {
    const port = await freePort();
    server = new ServiceProcess('serve', { REDIS_URL: redis.url, REDIS_PREFIX: 'rm-term-outage', PORT: String(port), HOST: '127.0.0.1' });
    await server.waitForLog('rhythmetric serving', 20_000);
    await redis.down();
    expect((await http(`http://127.0.0.1:${port}`, 'GET', '/readyz')).status).toBe(503);
    server.kill('SIGTERM');
    const { result } = await exitWithin(server, 15_000);
    expect(result, 'no exit within 15 s of SIGTERM').not.toBeNull();
    expect(result!.code).toBe(0);
  }, 40_000);
});
