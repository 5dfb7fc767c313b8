import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { startTestApi } from '../helpers/app.js';

/*
 * Issue 11: every recipe is checked against the signal's shape, and its cost estimated, when the
 * job is submitted, so that nothing that cannot finish is queued. Each refusal is a 422 problem
 * naming the setting by JSON pointer (RFC 9457 §3.1 "detail", pointer as an extension member).
 */

let api: Awaited<ReturnType<typeof startTestApi>>;
let small: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi({ WORKER_THREADS: '1', JOB_THREADS: '1' });
  small = await startTestApi({ WORKER_THREADS: '1', JOB_THREADS: '1', MAX_JOB_BYTES: String(4 * 1024 * 1024) });
});
afterAll(async () => {
  await api.stop();
  await small.stop();
});

function noise(seed: number, channels: string[], samples: number) {
  const random = createRandom(seed);
  return channels.map(() => Array.from({ length: samples }, () => Math.round(1000 * random.normal()) / 1000));
}

/** 128 Hz, 256 samples (2 s), two channels: the probe's signal. */
const short = { samplingRate: 128, channels: ['C3', 'C4'], data: noise(1, ['C3', 'C4'], 256) };
/** 20 s continuous at 128 Hz with blocks marked by events. */
const marked = {
  samplingRate: 128,
  channels: ['C3', 'C4'],
  data: noise(2, ['C3', 'C4'], 2560),
  events: [
    { onset: 1, duration: 2, label: 'rest' },
    { onset: 6, duration: 2, label: 'task' },
    { onset: 11, duration: 1, label: 'movement' },
  ],
};
const epoched = { samplingRate: 128, channels: ['C3', 'C4'], epochs: [noise(3, ['C3', 'C4'], 256), noise(4, ['C3', 'C4'], 256)] };

async function submit(app: typeof api, signal: unknown, recipe: Record<string, unknown>) {
  return app.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal, recipe } });
}

describe('when a Morlet wavelet is far longer than the epoch', () => {
  it('should refuse frequencies [0.00001] on 256 samples at 128 Hz before queueing, naming frequencies and cycles', async () => {
    const res = await submit(api, short, { method: 'morlet', frequencies: [0.00001] });
    expect(res.statusCode, res.body).toBe(422);
    const problem = res.json();
    expect(problem.type).toBe('/problems/recipe-unfit');
    expect(problem.pointer).toBe('/recipe/frequencies/0');
    // σ_t = cycles/(2πf) = 7/(2π·1e-5) ≈ 1.11e5 s, so ±3σ_t ≈ 6.68e5 s against an epoch of 2 s
    expect(problem.detail).toMatch(/0\.00001 Hz with 7 cycles spans ±3σ_t = 6\.68e\+5 s/);
  });

  it('should name the low end of a frequency range', async () => {
    const res = await submit(api, short, { method: 'morlet', frequencies: { low: 0.01, high: 20, count: 10 }, cycles: { low: 3, high: 7 } });
    expect(res.statusCode, res.body).toBe(422);
    expect(res.json().pointer).toBe('/recipe/frequencies/low');
  });

  it('should still accept wavelets that fit, as the default 2–45 Hz at 7 cycles on 2-s epochs', async () => {
    const res = await submit(api, short, { method: 'morlet', frequencies: { low: 2, high: 45, count: 4 }, output: 'summary', summary: [{ name: 'alpha', low: 8, high: 13, start: 0.5, end: 1.5 }] });
    expect(res.statusCode, res.body).toBe(202);
  });
});

describe('when a job would need more memory than MAX_JOB_BYTES', () => {
  // 200 epochs × 2 channels × 2049 bins kept per epoch = 6.6 MB of float64 (hand count), over 4 MiB
  const recipe = { method: 'welch', segmentSeconds: 1, fftLength: 4096, perEpoch: true };
  const big = { samplingRate: 128, channels: ['C3', 'C4'], epochs: Array.from({ length: 200 }, (_, e) => noise(10 + e, ['C3', 'C4'], 256)) };

  it('should refuse it with limit-exceeded naming the setting, the estimate and the limit', async () => {
    const res = await submit(small, big, recipe);
    expect(res.statusCode, res.body).toBe(422);
    const problem = res.json();
    expect(problem.type).toBe('/problems/limit-exceeded');
    expect(problem.detail).toMatch(/MAX_JOB_BYTES = 4\.00 MiB/);
    expect(problem.detail).toMatch(/would need about [\d.]+ (KiB|MiB)/);
    expect(problem.pointer).toBe('/recipe/perEpoch');
  });

  it('should accept the same job under the default limit', async () => {
    const res = await submit(api, big, recipe);
    expect(res.statusCode, res.body).toBe(202);
  });
});

describe('when connectivity bands hold no frequency bin', () => {
  const bands = [{ name: 'thin', low: 10.2, high: 10.5 }];

  it('should refuse connectivity with 422, as it refuses Welch with the same bands', async () => {
    // 1-s segments at 128 Hz: bins every 1 Hz, none in [10.2, 10.5) (common practice: Δf = fs/n)
    const welch = await submit(api, epoched, { method: 'welch', segmentSeconds: 1, bands });
    const connectivity = await submit(api, epoched, { method: 'connectivity', segmentSeconds: 1, bands });
    for (const res of [welch, connectivity]) {
      expect(res.statusCode, res.body).toBe(422);
      expect(res.json().type).toBe('/problems/recipe-unfit');
      expect(res.json().pointer).toBe('/recipe/bands/0');
    }
  });
});

describe('when connectivity is asked of one epoch', () => {
  it('should refuse it before queueing, pointing at epoching', async () => {
    const res = await submit(api, short, { method: 'connectivity', segmentSeconds: 0.5 });
    expect(res.statusCode, res.body).toBe(422);
    expect(res.json().pointer).toBe('/recipe/epoching');
    expect(res.json().detail).toMatch(/at least 2 epochs/);
  });

  it('should accept the same signal cut into epochs', async () => {
    const res = await submit(api, marked, { method: 'connectivity', segmentSeconds: 0.5, epoching: { mode: 'fixed', epochSeconds: 2 } });
    expect(res.statusCode, res.body).toBe(202);
  });
});

describe('when a recipe names event labels the signal does not have', () => {
  it('should refuse a misspelt bad-span label, listing the labels the signal has', async () => {
    const res = await submit(api, marked, { method: 'welch', segmentSeconds: 1, badSpans: { labels: ['movment'] } });
    expect(res.statusCode, res.body).toBe(422);
    const problem = res.json();
    expect(problem.pointer).toBe('/recipe/badSpans/labels/0');
    expect(problem.detail).toContain('the signal has "movement", "rest", "task"');
  });

  it('should refuse a misspelt epoching label for every method', async () => {
    for (const method of ['welch', 'multitaper', 'periodogram', 'spectrogram', 'morlet', 'connectivity']) {
      const res = await submit(api, marked, { method, epoching: { mode: 'events', labels: ['rest', 'tsak'], afterSeconds: 2 } });
      expect(res.statusCode, `${method}: ${res.body}`).toBe(422);
      expect(res.json().pointer).toBe('/recipe/epoching/labels/1');
    }
  });

  it('should accept labels the signal has', async () => {
    const res = await submit(api, marked, { method: 'welch', segmentSeconds: 1, badSpans: { labels: ['movement'] }, epoching: { mode: 'events', labels: ['rest', 'task'], afterSeconds: 2 } });
    expect(res.statusCode, res.body).toBe(202);
  });
});
