import { describe, expect, it } from 'vitest';
import type { DomainError } from '../../src/common/errors.js';
import { isRecipeRefusal } from '../../src/recipes/errors.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe } from '../../src/recipes/resolve.js';

describe('normalizeRecipe', () => {
  it('should fill every default and give spelled-out defaults the same hash', () => {
    const short = normalizeRecipe({ method: 'welch' });
    const long = normalizeRecipe({ method: 'welch', window: 'hann', segmentSeconds: 2, overlap: 0.5, detrend: 'mean', average: 'mean', fftLength: null, perEpoch: false });
    expect(long.hash).toBe(short.hash);
    expect(short.id).toBe(`rcp_${short.hash.slice(0, 32)}`);
    expect(short.recipe).toMatchObject({ schema: 'rhythmetric.recipe/1', window: 'hann', bands: [{ name: 'delta', low: 1, high: 4 }, {}, {}, {}, { name: 'gamma', low: 30, high: 45 }] });
    expect(Object.isFrozen(short.recipe)).toBe(true);
    expect(Object.isFrozen((short.recipe as { bands: unknown[] }).bands[0])).toBe(true);
  });

  it('should not depend on the order of keys', () => {
    expect(normalizeRecipe({ overlap: 0.25, method: 'welch', window: 'blackman' }).hash).toBe(normalizeRecipe({ window: 'blackman', method: 'welch', overlap: 0.25 }).hash);
  });

  it('should refuse a misspelt setting, naming it, instead of using a default', () => {
    try {
      normalizeRecipe({ method: 'welch', overlapp: 0.25 });
      expect.unreachable();
    } catch (error) {
      expect(isRecipeRefusal(error)).toBe(true);
      expect((error as Error).message).toContain('"overlapp"');
    }
  });

  it('should refuse a recipe of another format version', () => {
    expect(() => normalizeRecipe({ method: 'welch', schema: 'rhythmetric.recipe/2' })).toThrow(expect.objectContaining({ code: 'invalid-recipe', pointer: '/schema' }));
  });

  it('should refuse duplicate band names and a ratio of a missing band', () => {
    expect(() =>
      normalizeRecipe({
        method: 'welch',
        bands: [
          { name: 'a', low: 1, high: 2 },
          { name: 'a', low: 2, high: 3 },
        ],
      }),
    ).toThrow(/used twice/);
    expect(() => normalizeRecipe({ method: 'welch', ratios: [{ numerator: 'alpha', denominator: 'mu' }] })).toThrow(/"mu" is not a band/);
  });
});

describe('resolveRecipe', () => {
  const { recipe, hash } = normalizeRecipe({ method: 'welch' });

  it('should derive sample counts by the documented formulas', () => {
    const r = resolveRecipe(recipe, hash, { samplingRate: 500, samplesPerEpoch: 5000 });
    // segmentSamples = round(2 s · 500 Hz); overlapSamples = ⌊0.5 · 1000⌋; ⌊(5000 − 500) / 500⌋ segments.
    expect(r.derived).toEqual({ segmentSamples: 1000, overlapSamples: 500, fftLength: 1000, frequencyResolution: 0.5, segmentsPerEpoch: 9, frequencyRange: [0, 250], nyquist: 250 });
    expect(r.warnings).toEqual([]);
  });

  it('should warn when a segment is rounded and when samples are left over', () => {
    const odd = normalizeRecipe({ method: 'welch', segmentSeconds: 0.3, bands: [{ name: 'x', low: 5, high: 20 }] });
    const r = resolveRecipe(odd.recipe, odd.hash, { samplingRate: 256, samplesPerEpoch: 1000 });
    expect(r.derived.segmentSamples).toBe(77);
    expect(r.warnings.join('\n')).toMatch(/rounded to 77 samples/);
    expect(r.warnings.join('\n')).toMatch(/do not fill a segment/);
  });

  it('should refuse an fftLength above the configured limit', () => {
    const big = normalizeRecipe({ method: 'welch', fftLength: 4096 });
    expect(() => resolveRecipe(big.recipe, big.hash, { samplingRate: 500, samplesPerEpoch: 5000 }, { maxFftLength: 2048, maxOutputValues: 1e9 })).toThrow(/limit of 2048/);
  });

  it('should accept an fftLength that is not a power of two and use it as given', () => {
    const r = normalizeRecipe({ method: 'welch', fftLength: 1001 });
    expect(resolveRecipe(r.recipe, r.hash, { samplingRate: 500, samplesPerEpoch: 5000 }).derived.fftLength).toBe(1001);
  });
});

describe('when a time–frequency recipe would produce too much', () => {
  it('should refuse it before any work starts, saying how to shrink it', () => {
    const tf = normalizeRecipe({ method: 'morlet', frequencies: { low: 2, high: 100, count: 100 } });
    const shape = { samplingRate: 500, samplesPerEpoch: 500 * 60, channels: Array.from({ length: 64 }, (_, i) => `E${i}`) };
    // 64 channels × 30 000 times × 100 frequencies = 192 M values.
    expect(() => resolveRecipe(tf.recipe, tf.hash, shape)).toThrow(/192000000 values .* use decimation/);
    const small = normalizeRecipe({ method: 'morlet', frequencies: { low: 2, high: 100, count: 100 }, decimation: 10 });
    expect(() => resolveRecipe(small.recipe, small.hash, shape)).not.toThrow();
  });
});

describe('when a recipe holds text that canonical JSON (RFC 8785) cannot write', () => {
  it('should refuse it with the pointer of the text instead of failing to hash it', () => {
    try {
      normalizeRecipe({ method: 'welch', bands: [{ name: 'a\ud800', low: 1, high: 4 }] });
      expect.unreachable();
    } catch (error) {
      expect(isRecipeRefusal(error)).toBe(true);
      expect((error as DomainError).pointer).toBe('/bands/0/name');
    }
  });
});
