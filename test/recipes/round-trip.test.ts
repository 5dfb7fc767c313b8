import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DomainError } from '../../src/common/errors.js';
import { isRecipeRefusal } from '../../src/recipes/errors.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe, type SignalShape } from '../../src/recipes/resolve.js';
import { checkDerivedEcho } from '../../src/recipes/round-trip.js';
import { demoEpochs, toUploadJson } from '../../src/signals/demo-recording.js';
import { pollJob, startTestApi } from '../helpers/app.js';

const SHAPE: SignalShape = { samplingRate: 256, samplesPerEpoch: 1024, epochCount: 4, channels: ['F3', 'F4', 'Oz'] };

/** The recipe as a record prints it: the settings with every default, then id, hash and derived. */
function asRecordPrintsIt(input: Record<string, unknown>, shape = SHAPE) {
  const pinned = normalizeRecipe(input);
  const { derived } = resolveRecipe(pinned.recipe, pinned.hash, shape);
  return JSON.parse(JSON.stringify({ ...pinned.recipe, id: pinned.id, hash: pinned.hash, derived })) as Record<string, unknown>;
}

function refusal(run: () => unknown): DomainError {
  try {
    run();
  } catch (error) {
    if (isRecipeRefusal(error)) return error;
    throw error;
  }
  throw new Error('expected a refusal of the recipe');
}

describe("when a record's recipe is submitted back as it prints it", () => {
  const recipes: Record<string, unknown>[] = [
    { method: 'welch', ratios: [{ numerator: 'theta', denominator: 'beta' }], features: { peakFrequency: {} } },
    { method: 'welch', window: 'tukey' },
    { method: 'multitaper', confidence: 0.95 },
    { method: 'periodogram' },
    { method: 'morlet', frequencies: { low: 4, high: 30, count: 5 } },
    { method: 'spectrogram' },
    { method: 'connectivity' },
  ];

  it.each(recipes)('should pin it under the same id and hash, and accept its derived values (%o)', (input) => {
    const printed = asRecordPrintsIt(input);
    const again = normalizeRecipe(printed);
    expect(again.id).toBe(printed.id);
    expect(again.hash).toBe(printed.hash);
    const { derived } = resolveRecipe(again.recipe, again.hash, SHAPE);
    expect(() => checkDerivedEcho(again.derivedEcho, derived)).not.toThrow();
  });

  it('should refuse a hash that does not match the settings, naming /hash', () => {
    const printed = { ...asRecordPrintsIt({ method: 'welch' }), overlap: 0.25 };
    expect(refusal(() => normalizeRecipe(printed)).pointer).toBe('/hash');
  });

  it('should refuse an id that does not match the hash, naming /id', () => {
    const printed = { ...asRecordPrintsIt({ method: 'welch' }), id: 'rcp_00000000000000000000000000000000' };
    expect(refusal(() => normalizeRecipe(printed)).pointer).toBe('/id');
  });

  it('should refuse derived values of a signal of another shape, naming the value', () => {
    const printed = asRecordPrintsIt({ method: 'welch' }, { ...SHAPE, samplingRate: 500 });
    const pinned = normalizeRecipe(printed);
    const { derived } = resolveRecipe(pinned.recipe, pinned.hash, SHAPE);
    const error = refusal(() => checkDerivedEcho(pinned.derivedEcho, derived));
    expect(error.pointer).toBe('/derived/segmentSamples');
    expect(error.code).toBe('recipe-unfit');
  });

  it('should refuse a derived name the recipe does not derive, and a derived that is not an object', () => {
    const pinned = normalizeRecipe({ ...asRecordPrintsIt({ method: 'welch' }), derived: { segmentSamples: 512, windowLength: 3 } });
    const { derived } = resolveRecipe(pinned.recipe, pinned.hash, SHAPE);
    expect(refusal(() => checkDerivedEcho(pinned.derivedEcho, derived)).pointer).toBe('/derived/windowLength');
    expect(refusal(() => normalizeRecipe({ method: 'welch', derived: [1] })).pointer).toBe('/derived');
  });

  it('should still refuse a misspelt setting beside the echoed values', () => {
    const printed = { ...asRecordPrintsIt({ method: 'welch' }), overlapp: 0.5 };
    expect(refusal(() => normalizeRecipe(printed)).message).toMatch(/"overlapp"/);
  });
});

describe("when the API receives a record's recipe verbatim", () => {
  let api: Awaited<ReturnType<typeof startTestApi>>;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(async () => {
    await api?.stop();
  });

  it('should take it in POST /v1/recipes and POST /v1/jobs, and refuse a tampered one with the pointer of the field', async () => {
    const signal = toUploadJson(demoEpochs('eyes-closed', 'late', 2, 4, 7));
    const first = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal, recipe: { method: 'welch', segmentSeconds: 1 } } });
    expect(first.statusCode).toBe(202);
    const job = first.json() as { id: string };
    expect((await pollJob(api.app, job.id)).state).toBe('succeeded');
    const record = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` })).json() as { recipe: Record<string, unknown>; input: { signal: string } };

    const pinned = await api.app.inject({ method: 'POST', url: '/v1/recipes', payload: record.recipe });
    expect(pinned.statusCode).toBe(201);
    expect(pinned.json()).toMatchObject({ id: record.recipe.id, hash: record.recipe.hash });
    expect(Object.keys((pinned.json() as { recipe: object }).recipe)).not.toContain('derived');

    const again = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: record.input.signal, recipe: record.recipe } });
    expect(again.statusCode).toBe(200);
    expect((again.json() as { id: string }).id).toBe(job.id);

    const tampered = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: record.input.signal, recipe: { ...record.recipe, overlap: 0.25 } } });
    expect(tampered.statusCode).toBe(422);
    expect(tampered.json()).toMatchObject({ pointer: '/recipe/hash' });

    const otherShape = { ...record.recipe, derived: { ...(record.recipe.derived as object), segmentSamples: 512 } };
    const misfit = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: record.input.signal, recipe: otherShape } });
    expect(misfit.statusCode).toBe(422);
    expect(misfit.json()).toMatchObject({ pointer: '/recipe/derived/segmentSamples' });
  });
});
