import Fastify from 'fastify';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DomainError } from '../../src/common/errors.js';
import { EngineInputError } from '../../src/engine/errors.js';
import { errorHandler } from '../../src/http/error-handler.js';
import { refusalOf } from '../../src/jobs/failure.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { invalid, overLimit, unfit } from '../../src/methods/fit.js';
import { jobIdOf, recordKeyOf, type JobSpec } from '../../src/jobs/spec.js';
import type { SignalView } from '../../src/signals/view.js';
import { SignalInputError } from '../../src/signals/errors.js';
import { StorageFullError } from '../../src/stores/store.js';
import { startTestApi } from '../helpers/app.js';

// Each error as a layer throws it, with the problem code the registry (src/common/errors.ts) gives
// its kind. Before the errors shared one translation, a signal limit from a worker was
// `invalid-signal` and an invalid recipe `recipe-unfit`.
const thrown: [string, () => DomainError, string][] = [
  ['a signal over a size limit', () => new SignalInputError('limit', 'too many channels', '/channels'), 'limit-exceeded'],
  ['a malformed signal', () => new SignalInputError('shape', 'ragged rows', '/data/1'), 'invalid-signal'],
  ['an invalid recipe', () => invalid('frequencyRange must be [low, high]', '/frequencyRange/1'), 'invalid-recipe'],
  ['a recipe that does not fit', () => unfit('segment longer than the epoch', '/segmentSeconds'), 'recipe-unfit'],
  ['a recipe over a limit', () => overLimit('fftLength above the limit', '/fftLength'), 'limit-exceeded'],
  ['an epoch of non-finite samples', () => new EngineInputError('non-finite', 'epoch 0 holds NaN', '/recipe/nonFinite'), 'non-finite'],
  ['a full store', () => new StorageFullError(10, 5, 12), 'storage-full'],
];

describe('when the same domain error is answered over HTTP and recorded by a worker', () => {
  const app = Fastify();
  let current: () => DomainError = thrown[0]![1];
  app.setErrorHandler(errorHandler);
  app.get('/throw', async () => {
    throw current();
  });
  afterAll(() => app.close());

  it.each(thrown)('should give %s the same problem in both places', async (_what, make, code) => {
    current = make;
    const res = await app.inject({ method: 'GET', url: '/throw' });
    const { requestId: _id, ...http } = res.json() as Record<string, unknown>;
    const worker = refusalOf(make());
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(http.type).toBe(`/problems/${code}`);
    expect(worker).toEqual(http);
    expect(res.statusCode).toBe(worker!.status);
  });

  it('should leave an error that is not a domain error to be retried', () => {
    expect(refusalOf(new Error('worker thread exited'))).toBeNull();
  });
});

describe('when the same bad input reaches the embedded queue as a job planned without checks', () => {
  let api: Awaited<ReturnType<typeof startTestApi>>;
  let signalId = '';
  let sha256 = '';
  beforeAll(async () => {
    api = await startTestApi();
    // Invented: one second of a 10 Hz sine at 256 Hz.
    const data = [Array.from({ length: 256 }, (_, i) => Math.sin((2 * Math.PI * 10 * i) / 256))];
    const res = await api.app.inject({ method: 'POST', url: '/v1/signals', payload: { samplingRate: 256, channels: ['Oz'], data } });
    expect(res.statusCode).toBe(201);
    ({ id: signalId, sha256 } = res.json() as { id: string; sha256: string });
  });
  afterAll(() => api.stop());

  /** A job as an earlier version queued it: no resolved recipe, so the worker resolves and checks. */
  async function runUnchecked(recipe: unknown, view: SignalView | null) {
    const pinned = normalizeRecipe(recipe);
    const recordKey = recordKeyOf('public', sha256, pinned.hash, view);
    const spec: JobSpec = { tenant: 'public', signalId, sha256, recipeId: pinned.id, recipeHash: pinned.hash, recipe: pinned.recipe, recordKey, view };
    const id = jobIdOf(recordKey);
    await api.queue.submit(spec, id);
    return api.queue.waitFor(id, 20_000);
  }

  it("should give a planned job (recipe resolved once, with the limits) and an earlier version's job the same record", async () => {
    const recipe = { method: 'welch', segmentSeconds: 0.5 };
    const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: signalId, recipe } });
    expect(res.statusCode).toBe(202);
    const planned = await api.queue.waitFor((res.json() as { id: string }).id, 20_000);
    expect(planned.state).toBe('succeeded');
    const record = (await api.store.getDocument('records', planned.recordKey))!;
    await api.store.deleteDocument('records', planned.recordKey);
    await api.queue.remove(planned.id);
    const unchecked = await runUnchecked(recipe, null);
    expect(unchecked.state).toBe('succeeded');
    expect(unchecked.resultHash).toBe(planned.resultHash);
    expect(JSON.parse((await api.store.getDocument('records', unchecked.recordKey))!).result).toEqual(JSON.parse(record).result);
  });

  it.each([
    ['a segment longer than the epoch', { method: 'welch', segmentSeconds: 4 }, null],
    ['a time window outside the signal', { method: 'welch', segmentSeconds: 0.5 }, { start: 30 }],
    ['a channel the signal does not have', { method: 'welch', segmentSeconds: 0.5 }, { channels: ['Cz'] }],
  ] as [string, Record<string, unknown>, SignalView | null][])('should give %s the same code, status and pointer', async (_what, recipe, view) => {
    const signal = view ? { signal: signalId, ...view } : signalId;
    const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal, recipe } });
    expect(res.statusCode).toBeGreaterThanOrEqual(400);
    const http = res.json() as { type: string; status: number; pointer?: string };
    const job = await runUnchecked(recipe, view);
    expect(job.state).toBe('failed');
    expect({ type: job.problem!.type, status: job.problem!.status, pointer: job.problem!.pointer }).toEqual({ type: http.type, status: http.status, pointer: http.pointer });
  });
});
