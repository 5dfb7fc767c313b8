import { Redis } from 'ioredis';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLogger, startWorker } from '../../src/cli/runtime.js';
import { demoEpochs, toUploadJson } from '../../src/signals/demo-recording.js';
import { startTestApi } from '../helpers/app.js';
import { redisForTests, TEST_REDIS_URL, uniqueName } from '../helpers/redis.js';

const withRedis = await redisForTests();

describe.runIf(withRedis)('when a study runs in distributed mode (BullMQ)', () => {
  const prefix = uniqueName('studies');
  let api: Awaited<ReturnType<typeof startTestApi>>;
  let worker: ReturnType<typeof startWorker>;

  beforeAll(async () => {
    api = await startTestApi({ REDIS_URL: TEST_REDIS_URL, REDIS_PREFIX: prefix, QUEUE_NAME: 'analyses', STUDY_RUN_WINDOW: '2', LOG_LEVEL: 'warn' });
    worker = startWorker(api.config, createLogger({ logLevel: 'silent' }));
  });
  afterAll(async () => {
    await worker?.close();
    await api?.stop();
    const redis = new Redis(TEST_REDIS_URL);
    const keys = await redis.keys(`${prefix}:*`);
    if (keys.length > 0) await redis.del(...keys);
    redis.disconnect();
  });

  it('should queue one BullMQ job per entry in windows, and reuse every record on a second run', async () => {
    const post = (url: string, payload: unknown) => api.app.inject({ method: 'POST', url, payload: payload as Record<string, unknown> });
    const study = (await post('/v1/studies', { name: 'distributed' })).json().id as string;
    const entries = [];
    for (let i = 0; i < 5; i++) {
      const signal = await post('/v1/signals', toUploadJson(demoEpochs(i % 2 ? 'eyes-open' : 'eyes-closed', 'late', 2, 2, 500 + i)));
      expect(signal.statusCode).toBe(201);
      entries.push({ signal: signal.json().id, metadata: { subject: `p${i}`, condition: i % 2 ? 'eyes-open' : 'eyes-closed' } });
    }
    expect((await post(`/v1/studies/${study}/entries`, { entries })).statusCode).toBe(201);
    const recipe = { method: 'welch', segmentSeconds: 1 };

    const poll = async (runId: string) => {
      for (let i = 0; i < 600; i++) {
        const view = (await api.app.inject({ method: 'GET', url: `/v1/studies/${study}/runs/${runId}` })).json();
        expect(view.counts.queued + view.counts.running).toBeLessThanOrEqual(2);
        if (view.state !== 'running') return view;
        await new Promise((r) => setTimeout(r, 50));
      }
      throw new Error(`run ${runId} did not finish`);
    };
    const first = await post(`/v1/studies/${study}/runs`, { recipe });
    expect(first.statusCode).toBe(202);
    expect(first.json().counts).toMatchObject({ total: 5, waiting: 3 });
    expect(await poll(first.json().id)).toMatchObject({ state: 'succeeded', counts: { succeeded: 5, reused: 0 } });
    // The jobs are ordinary BullMQ jobs of the one queue, visible to the single-job routes.
    const jobs = (await api.app.inject({ method: 'GET', url: '/v1/jobs?limit=100' })).json().jobs as { state: string }[];
    expect(jobs.filter((j) => j.state === 'succeeded')).toHaveLength(5);

    const second = await post(`/v1/studies/${study}/runs`, { recipe });
    expect(await poll(second.json().id)).toMatchObject({ state: 'succeeded', counts: { succeeded: 5, reused: 5 } });

    const table = await api.app.inject({ method: 'GET', url: `/v1/studies/${study}/runs/${second.json().id}/table?level=spectra&format=csv` });
    expect(table.statusCode, table.body).toBe(200);
  });
});
