import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { pollJob, startTestApi } from '../helpers/app.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi();
});
afterAll(async () => {
  await api.stop();
});

const fs = 128;
const seconds = 60;
const gapStart = 20 * fs;
const gapLength = 64; // 0.5 s of samples lost on one channel, as an amplifier dropout would leave

/** Invented continuous recording: 10 Hz rhythm over white noise on four channels. */
function recording(gapValue: number | null) {
  const random = createRandom(404);
  return ['Fz', 'Cz', 'Pz', 'Oz'].map((_, c) =>
    Array.from({ length: seconds * fs }, (_, i) => {
      if (c === 2 && i >= gapStart && i < gapStart + gapLength) {
        random.normal();
        return gapValue;
      }
      return 10 * Math.sin((2 * Math.PI * 10 * i) / fs) + 5 * random.normal();
    }),
  );
}

async function post(url: string, payload: unknown) {
  return api.app.inject({ method: 'POST', url, payload: payload as Record<string, unknown> });
}

async function record(signal: string, recipe: Record<string, unknown>, view?: Record<string, unknown>) {
  const res = await post('/v1/jobs', { signal: view ? { signal, ...view } : signal, recipe });
  expect(res.statusCode, res.body).toBeLessThan(300);
  const job = await pollJob(api.app, res.json().id, 60_000);
  expect(job.state, JSON.stringify(job.problem)).toBe('succeeded');
  return (await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` })).json();
}

describe('when a continuous recording has a run of non-finite samples', () => {
  it('should refuse it by default, and with "bad-span" leave out only the Welch segments that touch the gap', async () => {
    const withGap = await post('/v1/signals', { samplingRate: fs, channels: ['Fz', 'Cz', 'Pz', 'Oz'], nonFinite: 'keep', data: recording(null) });
    expect(withGap.statusCode, withGap.body).toBe(201);
    const refused = await post('/v1/jobs', { signal: withGap.json().id, recipe: { method: 'welch' } });
    expect(refused.statusCode).toBe(422);
    expect(refused.json().detail).toMatch(/"bad-span"/);

    const kept = await record(withGap.json().id, { method: 'welch', nonFinite: 'bad-span' });
    // 2-s segments stepped by 1 s over 60 s: 59 segments. The gap covers samples 2560–2623 (20.0 to
    // 20.49 s), which the segments starting at 19 s and 20 s hold (counted by hand): 57 are left.
    for (const s of kept.result.estimate.segments) expect(s).toMatchObject({ used: 57, leftOut: 2 });
    expect(kept.result.estimate.epochsUsed).toBe(1);
    expect(kept.result.warnings.join()).toMatch(/1 run\(s\) of non-finite samples \(0\.5 s in all\) treated as bad spans/);

    // The same recording with the gap filled by zeros and declared a bad span by hand gives the same
    // bits: the gap's samples never reach an average.
    const filled = await post('/v1/signals', { samplingRate: fs, channels: ['Fz', 'Cz', 'Pz', 'Oz'], data: recording(0) });
    const declared = await record(filled.json().id, { method: 'welch' }, { badSpans: [[gapStart / fs, (gapStart + gapLength - 1) / fs]] });
    expect(declared.result.channels).toEqual(kept.result.channels);
  });

  it('should leave out the epochs that epoching cuts across the gap', async () => {
    const withGap = await post('/v1/signals', { samplingRate: fs, channels: ['Fz', 'Cz', 'Pz', 'Oz'], nonFinite: 'keep', data: recording(null) });
    const r = await record(withGap.json().id, { method: 'multitaper', nonFinite: 'bad-span', epoching: { mode: 'fixed', epochSeconds: 4 } });
    // 4-s epochs from 0 s: only the one starting at 20 s holds the gap; 14 of 15 remain.
    expect(r.result.epoching.kept).toHaveLength(14);
    expect(r.result.epoching.dropped.map((d: { startSeconds: number }) => d.startSeconds)).toEqual([20]);
  });

  it('should refuse "bad-span" where the estimate would take the whole unepoched recording', async () => {
    const withGap = await post('/v1/signals', { samplingRate: fs, channels: ['Fz', 'Cz', 'Pz', 'Oz'], nonFinite: 'keep', data: recording(null) });
    const refused = await post('/v1/jobs', { signal: withGap.json().id, recipe: { method: 'multitaper', nonFinite: 'bad-span' } });
    expect(refused.statusCode).toBe(422);
    expect(refused.json()).toMatchObject({ type: '/problems/recipe-unfit', pointer: '/recipe/nonFinite' });
  });
});
