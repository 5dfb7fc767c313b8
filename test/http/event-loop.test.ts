import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { pollJob, startTestApi } from '../helpers/app.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi({ WORKER_THREADS: '1' });
});
afterAll(async () => {
  await api.stop();
});

describe('when a large job runs in embedded mode', () => {
  it('should keep answering other requests, because the work runs on worker threads', async () => {
    // 64 channels × 300 s × 500 Hz with a prime FFT length: seconds of work on one thread.
    const random = createRandom(5);
    const samples = 150_000;
    const channels = 64;
    const values = new Float32Array(channels * samples).map(() => random.normal());
    const upload = await api.app.inject({
      method: 'POST',
      url: `/v1/signals?samplingRate=500&channels=${Array.from({ length: channels }, (_, i) => `E${i}`).join(',')}`,
      headers: { 'content-type': 'application/octet-stream' },
      payload: Buffer.from(values.buffer),
    });
    expect(upload.statusCode).toBe(201);
    const submitted = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: upload.json().id, recipe: { method: 'welch', fftLength: 1009 } } });
    expect(submitted.statusCode).toBe(202);

    // Measure the event loop while the job runs: the worst gap between 5 ms timer ticks.
    let worstGap = 0;
    let last = performance.now();
    const ticker = setInterval(() => {
      const now = performance.now();
      worstGap = Math.max(worstGap, now - last);
      last = now;
    }, 5);
    let answered = 0;
    let sawRunning = false;
    for (;;) {
      const res = await api.app.inject({ method: 'GET', url: `/v1/jobs/${submitted.json().id}` });
      answered++;
      const { state } = res.json();
      if (state === 'running') sawRunning = true;
      if (state !== 'queued' && state !== 'running') break;
      await new Promise((r) => setTimeout(r, 10));
    }
    clearInterval(ticker);
    const job = await pollJob(api.app, submitted.json().id);
    expect(job.state).toBe('succeeded');
    expect(sawRunning).toBe(true);
    expect(answered).toBeGreaterThan(5);
    // A blocked loop would show a gap as long as the whole computation (seconds). The bound is
    // generous for a loaded 2-core CI machine, and far below the job's duration.
    expect(worstGap).toBeLessThan(250);
  });
});
