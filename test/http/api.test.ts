import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pollJob, startTestApi } from '../helpers/app.js';

type Api = Awaited<ReturnType<typeof startTestApi>>;
let api: Api;

beforeAll(async () => {
  api = await startTestApi();
});
afterAll(async () => {
  await api.stop();
});

const fs = 250;
/** A = 2 µV, 10 Hz: on a bin centre for 2 s segments (Δf = 0.5 Hz). */
function tone(amplitude: number, frequency: number, seconds: number, phase = 0): number[] {
  return Array.from({ length: seconds * fs }, (_, i) => amplitude * Math.sin((2 * Math.PI * frequency * i) / fs + phase));
}

async function post(url: string, payload: unknown) {
  return api.app.inject({ method: 'POST', url, payload: payload as Record<string, unknown> });
}

describe('when a pipeline uploads, submits and fetches', () => {
  it('should give the same id for the same content and a record whose band power is A²/2', async () => {
    const body = { samplingRate: fs, channels: ['Fz', 'Cz'], unit: 'uV', data: [tone(2, 10, 8), tone(1, 20, 8, 0.3)] };
    const first = await post('/v1/signals', body);
    expect(first.statusCode).toBe(201);
    const again = await post('/v1/signals', body);
    expect(again.json().id).toBe(first.json().id);
    const info = first.json();
    expect(info).toMatchObject({ samplingRate: 250, channels: ['Fz', 'Cz'], epochCount: 1, samplesPerEpoch: 2000 });
    expect(info.sha256).toMatch(/^[0-9a-f]{64}$/);

    const recipe = await post('/v1/recipes', { method: 'welch', detrend: 'none' });
    expect(recipe.statusCode).toBe(201);
    expect(recipe.json().recipe).toMatchObject({ window: 'hann', segmentSeconds: 2, overlap: 0.5, average: 'mean', fftLength: null });

    const submitted = await post('/v1/jobs', { signal: info.id, recipe: recipe.json().id });
    expect(submitted.statusCode).toBe(202);
    const job = await pollJob(api.app, submitted.json().id);
    expect(job.state).toBe('succeeded');
    expect(job.progress).toBe(1);

    const res = await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` });
    expect(res.statusCode).toBe(200);
    const record = res.json();
    expect(record.schema).toBe('rhythmetric.record/1');
    expect(record.recipe.hash).toBe(recipe.json().hash);
    expect(record.input).toMatchObject({ signal: info.id, sha256: info.sha256 });
    expect(record.recipe.derived).toMatchObject({ segmentSamples: 500, overlapSamples: 250, fftLength: 500, frequencyResolution: 0.5 });
    // Common practice (docs/references.md §4): a sinusoid of amplitude A has mean-square power A²/2; with a
    // periodic Hann window an on-bin tone leaks only into its two neighbours, all inside the band.
    const alphaFz = record.result.channels[0].bands.find((b: { name: string }) => b.name === 'alpha');
    expect(alphaFz.absolute).toBeCloseTo(2, 10);
    expect(alphaFz.decibels).toBeCloseTo(10 * Math.log10(2), 9);
    const betaCz = record.result.channels[1].bands.find((b: { name: string }) => b.name === 'beta');
    expect(betaCz.absolute).toBeCloseTo(0.5, 10);
    expect(record.resultHash).toMatch(/^[0-9a-f]{64}$/);

    // An identical submission is answered from the finished job, not computed again.
    const repeat = await post('/v1/jobs', { signal: info.id, recipe: recipe.json().id });
    expect(repeat.statusCode).toBe(200);
    expect(repeat.json()).toMatchObject({ id: job.id, state: 'succeeded' });
  });

  it('should accept an inline signal and an inline recipe, and report every epoch when asked', async () => {
    const epochs = [0, 1, 2].map((e) => [tone(1 + e, 10, 2), tone(1, 6, 2)]);
    const submitted = await post('/v1/jobs', {
      signal: { samplingRate: fs, channels: ['O1', 'Fz'], epochs },
      recipe: { method: 'welch', window: 'rectangular', segmentSeconds: 1, overlap: 0, detrend: 'none', perEpoch: true, bands: [{ name: 'alpha', low: 8, high: 13 }] },
    });
    expect(submitted.statusCode).toBe(202);
    const job = await pollJob(api.app, submitted.json().id);
    expect(job.state).toBe('succeeded');
    const record = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` })).json();
    expect(record.result.epochs).toHaveLength(3);
    // Per epoch the on-bin tone of amplitude A gives A²/2; the channel PSD is the mean over epochs.
    const perEpoch = record.result.epochs.map((e: { channels: { bands: { absolute: number }[] }[] }) => e.channels[0]!.bands[0]!.absolute);
    perEpoch.forEach((p: number, e: number) => expect(p).toBeCloseTo((1 + e) ** 2 / 2, 10));
    expect(record.result.channels[0].bands[0].absolute).toBeCloseTo((0.5 + 2 + 4.5) / 3, 10);
  });

  it('should refuse to cancel a finished job (canceling queued and running jobs: test/jobs/queue-conformance.test.ts)', async () => {
    const submitted = await post('/v1/jobs', { signal: { samplingRate: fs, channels: ['Cz'], data: [tone(1, 10, 4)] }, recipe: { method: 'welch', segmentSeconds: 1 } });
    const job = await pollJob(api.app, submitted.json().id);
    const cancel = await api.app.inject({ method: 'DELETE', url: `/v1/jobs/${job.id}` });
    expect(cancel.statusCode).toBe(409);
    expect(cancel.json().type).toBe('/problems/job-finished');
  });
});

describe('when the input is wrong', () => {
  const good = { samplingRate: fs, channels: ['Fz', 'Cz'], data: [tone(1, 10, 4), tone(1, 10, 4)] };
  const cases: [string, string, unknown, number, string, string | null][] = [
    ['ragged channels', '/v1/signals', { ...good, data: [tone(1, 10, 4), tone(1, 10, 3)] }, 422, 'invalid-signal', '/data/1'],
    ['a null sample', '/v1/signals', { ...good, data: [tone(1, 10, 4), [1, null, ...tone(1, 10, 4).slice(2)]] }, 422, 'invalid-signal', '/data/1/1'],
    ['a zero sampling rate', '/v1/signals', { ...good, samplingRate: 0 }, 422, 'invalid-signal', '/samplingRate'],
    ['an absurd sampling rate', '/v1/signals', { ...good, samplingRate: 5e6 }, 422, 'invalid-signal', '/samplingRate'],
    ['more channel names than rows', '/v1/signals', { ...good, channels: ['Fz', 'Cz', 'Pz'] }, 422, 'invalid-signal', '/data'],
    ['a duplicate channel name', '/v1/signals', { ...good, channels: ['Fz', 'Fz'] }, 422, 'invalid-signal', '/channels/1'],
    ['an unknown upload field', '/v1/signals', { ...good, samplerate: 250 }, 422, 'invalid-signal', '/'],
    [
      'a string sample',
      '/v1/signals',
      {
        ...good,
        data: [
          ['a', 1],
          [1, 2],
        ],
      },
      422,
      'invalid-signal',
      '/data/0/0',
    ],
    // The envelope checks only that each row is an array; the decoder checks the samples.
    ['a row that is not an array', '/v1/signals', { ...good, data: [1, [1, 2]] }, 422, 'invalid-signal', '/data/0'],
    ['an epoch row that is not an array', '/v1/signals', { ...good, data: undefined, epochs: [[[1, 2], 'x']] }, 422, 'invalid-signal', '/epochs/0/1'],
    ['both data and epochs', '/v1/signals', { ...good, epochs: [good.data] }, 422, 'invalid-signal', '/epochs'],
    ['a misspelt recipe setting', '/v1/recipes', { method: 'welch', segmentSecond: 2 }, 422, 'invalid-recipe', '/'],
    ['an unknown method', '/v1/recipes', { method: 'wavelet-soup' }, 422, 'invalid-recipe', '/method'],
    ['an overlap of 1', '/v1/recipes', { method: 'welch', overlap: 1 }, 422, 'invalid-recipe', '/overlap'],
    ['an unknown window', '/v1/recipes', { method: 'welch', window: 'kaiser' }, 422, 'invalid-recipe', '/window'],
    ['a band with low ≥ high', '/v1/recipes', { method: 'welch', bands: [{ name: 'x', low: 8, high: 4 }] }, 422, 'invalid-recipe', '/bands/0/high'],
    ['a tukey ratio with hann', '/v1/recipes', { method: 'welch', tukeyRatio: 0.3 }, 422, 'invalid-recipe', '/tukeyRatio'],
    ['a ratio of an unknown band', '/v1/recipes', { method: 'welch', ratios: [{ numerator: 'theta', denominator: 'betta' }] }, 422, 'invalid-recipe', '/ratios/0/denominator'],
    ['a segment longer than the epoch', '/v1/jobs', { signal: good, recipe: { method: 'welch', segmentSeconds: 8 } }, 422, 'recipe-unfit', '/recipe/segmentSeconds'],
    ['an fftLength below the segment', '/v1/jobs', { signal: good, recipe: { method: 'welch', fftLength: 100 } }, 422, 'recipe-unfit', '/recipe/fftLength'],
    ['a band above Nyquist', '/v1/jobs', { signal: good, recipe: { method: 'welch', bands: [{ name: 'hf', low: 100, high: 200 }] } }, 422, 'recipe-unfit', '/recipe/bands/0/high'],
    ['a band narrower than the resolution', '/v1/jobs', { signal: good, recipe: { method: 'welch', bands: [{ name: 'thin', low: 10.1, high: 10.2 }] } }, 422, 'recipe-unfit', '/recipe/bands/0'],
    ['a frequency range above Nyquist', '/v1/jobs', { signal: good, recipe: { method: 'welch', frequencyRange: [0, 200] } }, 422, 'recipe-unfit', '/recipe/frequencyRange/1'],
    ['an unknown recipe id', '/v1/jobs', { signal: good, recipe: 'rcp_00000000000000000000000000000000' }, 404, 'recipe-not-found', '/recipe'],
    ['an unknown signal id', '/v1/jobs', { signal: 'sig_00000000000000000000000000000000', recipe: { method: 'welch' } }, 404, 'signal-not-found', '/signal'],
    [
      'a ragged inline signal',
      '/v1/jobs',
      {
        signal: {
          ...good,
          data: [
            [1, 2, 3],
            [1, 2],
          ],
        },
        recipe: { method: 'welch' },
      },
      422,
      'invalid-signal',
      '/signal/data/1',
    ],
    ['an inline row that is not an array', '/v1/jobs', { signal: { ...good, data: [[1, 2], 3] }, recipe: { method: 'welch' } }, 400, 'invalid-request', '/signal/data/1'],
    ['an unknown job field', '/v1/jobs', { signal: good, recipe: { method: 'welch' }, priority: 1 }, 400, 'invalid-request', '/'],
  ];
  it.each(cases)('should answer %s with a problem naming where', async (_name, url, payload, status, code, pointer) => {
    const res = await post(url, payload);
    expect(res.statusCode).toBe(status);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    const problem = res.json();
    expect(problem).toMatchObject({ type: `/problems/${code}`, status });
    expect(typeof problem.title).toBe('string');
    expect(problem.detail.length).toBeGreaterThan(10);
    if (pointer) expect(problem.pointer).toBe(pointer);
    expect(problem.requestId).toBe(res.headers['x-request-id']);
    expect(JSON.stringify(problem)).not.toMatch(/at .*\.ts:\d+/);
  });

  it('should name the misspelt setting in words', async () => {
    const problem = (await post('/v1/recipes', { method: 'welch', segmentSecond: 2 })).json();
    expect(problem.detail).toContain('"segmentSecond"');
  });

  it('should answer malformed JSON with 400 and an unsupported type with 415', async () => {
    const bad = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: { 'content-type': 'application/json' }, payload: '{"samplingRate": 2' });
    expect(bad.statusCode).toBe(400);
    expect(bad.json().type).toBe('/problems/invalid-request');
    const text = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: { 'content-type': 'text/csv' }, payload: '1,2,3' });
    expect(text.statusCode).toBe(415);
    expect(text.json().type).toBe('/problems/unsupported-media-type');
  });

  it('should answer unknown routes and ids with 404 problems', async () => {
    expect((await api.app.inject({ method: 'GET', url: '/v1/nothing' })).json().type).toBe('/problems/not-found');
    expect((await api.app.inject({ method: 'GET', url: '/v1/jobs/job_nope' })).json().type).toBe('/problems/job-not-found');
    expect((await api.app.inject({ method: 'GET', url: '/v1/recipes/rcp_nope' })).statusCode).toBe(404);
    expect((await api.app.inject({ method: 'GET', url: '/v1/signals/sig_nope' })).statusCode).toBe(404);
  });

  it('should refuse a job on a signal with gaps unless the recipe skips such epochs', async () => {
    const withGap = { samplingRate: fs, channels: ['Cz'], nonFinite: 'keep', epochs: [[tone(1, 10, 2)], [[null, ...tone(1, 10, 2).slice(1)]], [tone(3, 10, 2)]] };
    const stored = await post('/v1/signals', withGap);
    expect(stored.statusCode).toBe(201);
    expect(stored.json().nonFiniteSamples).toBe(1);
    const refused = await post('/v1/jobs', { signal: stored.json().id, recipe: { method: 'welch', segmentSeconds: 1 } });
    expect(refused.statusCode).toBe(422);
    expect(refused.json()).toMatchObject({ type: '/problems/non-finite', pointer: '/recipe/nonFinite' });
    const accepted = await post('/v1/jobs', { signal: stored.json().id, recipe: { method: 'welch', segmentSeconds: 1, nonFinite: 'skip-epoch' } });
    const job = await pollJob(api.app, accepted.json().id);
    const record = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` })).json();
    expect(record.result.estimate.epochsUsed).toBe(2);
    expect(record.result.estimate.epochsSkipped).toEqual([expect.objectContaining({ index: 1, reason: 'non-finite' })]);
  });
});

describe('when uploading binary float32', () => {
  it('should store the same signal, with the same id, as the equal JSON upload', async () => {
    // Values exactly representable in float32 so that both paths hold identical float64 numbers.
    const rows = [Array.from({ length: 500 }, (_, i) => ((i % 17) - 8) / 4), Array.from({ length: 500 }, (_, i) => ((i % 5) - 2) * 0.5)];
    const json = await post('/v1/signals', { samplingRate: fs, channels: ['C3', 'C4'], data: rows });
    const bytes = Buffer.from(new Float32Array(rows.flat()).buffer);
    const bin = await api.app.inject({ method: 'POST', url: '/v1/signals?samplingRate=250&channels=C3,C4', headers: { 'content-type': 'application/octet-stream' }, payload: bytes });
    expect(bin.statusCode).toBe(201);
    expect(bin.json().id).toBe(json.json().id);
  });

  it('should say what is wrong with a body that does not divide into the described shape', async () => {
    const res = await api.app.inject({
      method: 'POST',
      url: '/v1/signals?samplingRate=250&channels=C3,C4,Pz&epochCount=2',
      headers: { 'content-type': 'application/octet-stream' },
      payload: Buffer.alloc(4 * 1001),
    });
    expect(res.statusCode).toBe(422);
    expect(res.json().detail).toContain('do not divide');
    const missing = await api.app.inject({ method: 'POST', url: '/v1/signals?channels=C3', headers: { 'content-type': 'application/octet-stream' }, payload: Buffer.alloc(8) });
    expect(missing.statusCode).toBe(400);
    expect(missing.json().pointer).toBe('/query/samplingRate');
  });

  it('should locate a NaN sample by epoch, channel and byte offset', async () => {
    const values = new Float32Array(2 * 300);
    values[300 + 7] = Number.NaN;
    const res = await api.app.inject({
      method: 'POST',
      url: '/v1/signals?samplingRate=100&channels=A,B',
      headers: { 'content-type': 'application/octet-stream' },
      payload: Buffer.from(values.buffer),
    });
    expect(res.statusCode).toBe(422);
    expect(res.json().detail).toMatch(/sample 7 of channel "B" in epoch 0 .*byte offset 1228/);
  });
});

describe('when the body is too large', () => {
  it('should answer 413 with a problem', async () => {
    const small = await startTestApi({ BODY_LIMIT_BYTES: '1000' });
    try {
      const res = await small.app.inject({ method: 'POST', url: '/v1/signals', payload: { samplingRate: 100, channels: ['A'], data: [Array.from({ length: 500 }, () => 1.5)] } });
      expect(res.statusCode).toBe(413);
      expect(res.json().type).toBe('/problems/payload-too-large');
      const bin = await small.app.inject({ method: 'POST', url: '/v1/signals?samplingRate=100&channels=A', headers: { 'content-type': 'application/octet-stream' }, payload: Buffer.alloc(4000) });
      expect(bin.statusCode).toBe(413);
    } finally {
      await small.stop();
    }
  });

  it('should refuse more samples than the configured limit before storing anything', async () => {
    const small = await startTestApi({ MAX_SAMPLES: '100' });
    try {
      const res = await small.app.inject({ method: 'POST', url: '/v1/signals', payload: { samplingRate: 100, channels: ['A'], data: [Array.from({ length: 200 }, () => 1)] } });
      expect(res.statusCode).toBe(422);
      expect(res.json().type).toBe('/problems/limit-exceeded');
      expect(await small.store.listDocuments('jobs')).toEqual([]);
    } finally {
      await small.stop();
    }
  });
});

describe('when operators look at the service', () => {
  it('should report health, readiness and problem documentation', async () => {
    expect((await api.app.inject({ method: 'GET', url: '/healthz' })).json()).toMatchObject({ status: 'ok', mode: 'embedded' });
    expect((await api.app.inject({ method: 'GET', url: '/readyz' })).json()).toMatchObject({ status: 'ok', checks: { store: true, queue: true } });
    const doc = (await api.app.inject({ method: 'GET', url: '/problems/recipe-unfit' })).json();
    expect(doc).toMatchObject({ type: '/problems/recipe-unfit', status: 422 });
  });

  it('should echo the request id and log it with the job id', async () => {
    const res = await api.app.inject({
      method: 'POST',
      url: '/v1/jobs',
      headers: { 'x-request-id': 'lab-pipeline-42' },
      payload: { signal: { samplingRate: fs, channels: ['Oz'], data: [tone(1, 10, 2)] }, recipe: { method: 'welch', segmentSeconds: 1 } },
    });
    expect(res.headers['x-request-id']).toBe('lab-pipeline-42');
    const line = api.logs.find((l) => l.reqId === 'lab-pipeline-42' && l.msg === 'job submitted');
    expect(line).toMatchObject({ jobId: res.json().id });
  });
});

describe('when a job refers to part of a stored signal', () => {
  it('should analyze the window and channels it names, and refuse names and times that do not exist', async () => {
    const stored = (await post('/v1/signals', { samplingRate: fs, channels: ['O1', 'O2'], data: [tone(2, 10, 20), tone(1, 10, 20)] })).json();
    const ok = await post('/v1/jobs', { signal: { signal: stored.id, start: 4, end: 12, channels: ['O2'] }, recipe: { method: 'welch', detrend: 'none' } });
    expect(ok.statusCode).toBe(202);
    const job = await pollJob(api.app, ok.json().id);
    const record = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` })).json();
    expect(record.input.view).toEqual({ start: 4, end: 12, channels: ['O2'] });
    expect(record.result.channels.map((c: { name: string }) => c.name)).toEqual(['O2']);
    expect(record.result.channels[0].bands.find((b: { name: string }) => b.name === 'alpha').absolute).toBeCloseTo(0.5, 10);

    const badName = await post('/v1/jobs', { signal: { signal: stored.id, channels: ['Oz'] }, recipe: { method: 'welch' } });
    expect(badName.statusCode).toBe(422);
    expect(badName.json()).toMatchObject({ type: '/problems/invalid-signal', pointer: '/signal/channels/0' });
    const badTime = await post('/v1/jobs', { signal: { signal: stored.id, start: 30 }, recipe: { method: 'welch' } });
    expect(badTime.json().pointer).toBe('/signal/start');
    const epochedTwice = await post('/v1/jobs', {
      signal: { samplingRate: fs, channels: ['Cz'], epochs: [[tone(1, 10, 4)], [tone(1, 10, 4)]] },
      recipe: { method: 'welch', epoching: { mode: 'fixed', epochSeconds: 2 } },
    });
    expect(epochedTwice.json()).toMatchObject({ type: '/problems/recipe-unfit', pointer: '/recipe/epoching' });
  });
});

describe('when a recipe uses a setting name deprecated in 0.3.0', () => {
  it('should pin the same recipe as the new name and say so in a Warning header, for recipes and jobs', async () => {
    const renamed = await post('/v1/recipes', { method: 'welch', epoching: { mode: 'fixed', epochSeconds: 2 } });
    expect(renamed.statusCode).toBe(201);
    expect(renamed.headers.warning).toBeUndefined();
    const old = await post('/v1/recipes', { method: 'welch', epoching: { mode: 'fixed', lengthSeconds: 2 } });
    expect(old.statusCode).toBe(201);
    expect(old.json().id).toBe(renamed.json().id);
    expect(String(old.headers.warning)).toMatch(/^299 rhythmetric ".*\/epoching\/lengthSeconds.*epochSeconds.*"$/);

    const signal = await post('/v1/signals', { samplingRate: fs, channels: ['Fz'], unit: 'uV', data: [tone(2, 10, 8)] });
    const job = await post('/v1/jobs', { signal: signal.json().id, recipe: { method: 'welch', epoching: { mode: 'fixed', lengthSeconds: 2 } } });
    expect(job.statusCode).toBeLessThan(300);
    expect(String(job.headers.warning)).toContain('/recipe/epoching/lengthSeconds');
  });
});
