import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/engine/analyze.js';
import { morlet } from '../../src/methods/morlet.js';
import { METHOD_MODULES, methodOf } from '../../src/methods/registry.js';
import type { DomainError } from '../../src/common/errors.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe, type SignalShape } from '../../src/recipes/resolve.js';
import type { MorletRecipe } from '../../src/recipes/schema.js';
import { demoEpochs, demoRecording } from '../../src/signals/demo-recording.js';

const shape = (channels: number, epochs: number, samples: number): SignalShape => ({
  samplingRate: 256,
  samplesPerEpoch: samples,
  epochCount: epochs,
  channels: Array.from({ length: channels }, (_, c) => `C${c}`),
});

function resolve(recipe: unknown, s: SignalShape) {
  const pinned = normalizeRecipe(recipe);
  return resolveRecipe(pinned.recipe, pinned.hash, s);
}

describe("when a job's cost is estimated from the signal's shape", () => {
  const recipes: Record<string, unknown> = {
    welch: { method: 'welch' },
    multitaper: { method: 'multitaper' },
    periodogram: { method: 'periodogram' },
    spectrogram: { method: 'spectrogram' },
    morlet: { method: 'morlet', frequencies: [8, 12] },
    connectivity: { method: 'connectivity' },
  };

  it('should have a recipe here for every registered method', () => {
    expect(Object.keys(recipes).sort()).toEqual(METHOD_MODULES.map((m) => m.name).sort());
  });

  for (const [name, recipe] of Object.entries(recipes)) {
    it(`should count at least the row of one channel the engine reads at a time for ${name} (8 bytes per float64 sample)`, () => {
      const s = shape(8, 10, 1024);
      const { cost } = resolve(recipe, s);
      expect(cost.bytes).toBeGreaterThanOrEqual(8 * 10 * 1024);
      expect(cost.work).toBeGreaterThan(0);
      expect(cost.driver).toMatch(/^\//);
    });

    it(`should grow about linearly with the number of epochs for ${name}`, () => {
      const one = resolve(recipe, shape(4, 10, 1024)).cost;
      const ten = resolve(recipe, shape(4, 100, 1024)).cost;
      expect(ten.work / one.work).toBeGreaterThan(9);
      expect(ten.work / one.work).toBeLessThan(11);
      expect(ten.bytes).toBeGreaterThan(one.bytes);
    });
  }

  // Reading rows from the store, a spectrum job holds one channel's samples at a time: its memory
  // grows with the channel count through per-channel outputs (spectra), not through the samples.
  for (const name of ['welch', 'multitaper', 'periodogram'] as const) {
    it(`should count less than every channel's samples for ${name}`, () => {
      expect(resolve(recipes[name], shape(64, 10, 4096)).cost.bytes).toBeLessThan(8 * 64 * 10 * 4096);
    });
  }

  it('should cost a Welch job of 64 channels under twice one of 8 (short spectra, long rows)', () => {
    const few = resolve(recipes.welch, shape(8, 10, 4096)).cost;
    const many = resolve(recipes.welch, shape(64, 10, 4096)).cost;
    expect(many.bytes).toBeLessThan(2 * few.bytes);
  });

  it('should count the sampled Morlet wavelet, ±6σ_t of complex float64, by hand for 1e-5 Hz at 128 Hz', () => {
    // σ_t = 7/(2π·1e-5) ≈ 111 408 s; M = ⌈6·σ_t·128⌉ = 85 561 698 samples; 2·(2M + 1)·8 bytes ≈ 2.74 GB,
    // the size of the 3 GiB the issue saw the server reach on this recipe.
    const sigma = 7 / (2 * Math.PI * 1e-5);
    const halfWidth = Math.ceil(6 * sigma * 128);
    const recipe = normalizeRecipe({ method: 'morlet', frequencies: [0.00001], output: 'summary', summary: [{ name: 'all', low: 0, high: 1, start: 0, end: 1 }] }).recipe as MorletRecipe;
    const derived = {
      segmentSamples: 256,
      overlapSamples: 0,
      fftLength: 256,
      frequencyResolution: 0.5,
      segmentsPerEpoch: 1,
      frequencyRange: [0, 64] as [number, number],
      nyquist: 64,
      epochSamples: 256,
    };
    const cost = morlet.cost(recipe, derived, { samplingRate: 128, samplesPerEpoch: 256, channels: ['A'] });
    expect(cost.bytes).toBeGreaterThanOrEqual(16 * (2 * halfWidth + 1));
    expect(cost.bytes).toBeGreaterThan(2 * 1024 ** 3);
    expect(cost.driver).toBe('/frequencies');
  });

  it('should refuse a job over the limit as limit-exceeded, and accept it under a larger one', () => {
    const s = shape(64, 1000, 2048);
    expect(() => resolve({ method: 'welch', perEpoch: true, fftLength: 8192 }, s)).toThrow(/MAX_JOB_BYTES/);
    try {
      resolve({ method: 'welch', perEpoch: true, fftLength: 8192 }, s);
    } catch (error) {
      expect((error as DomainError).code).toBe('limit-exceeded');
      expect((error as DomainError).message).toMatch(/MAX_JOB_BYTES = 2\.00 GiB/);
      expect((error as DomainError).pointer).toBe('/perEpoch');
    }
    const pinned = normalizeRecipe({ method: 'welch', perEpoch: true, fftLength: 8192 });
    expect(resolveRecipe(pinned.recipe, pinned.hash, s, { maxJobBytes: 64 * 1024 ** 3 }).cost.bytes).toBeGreaterThan(2 * 1024 ** 3);
  });
});

describe('when the worker resolves a recipe against the loaded signal', () => {
  const recording = demoRecording(4, 20261201);

  it('should refuse bad-span labels the signal does not have, as the HTTP layer does', () => {
    const pinned = normalizeRecipe({ method: 'welch', badSpans: { labels: ['eyes-shut/early'] } });
    expect(() => resolveRecipe(pinned.recipe, pinned.hash, recording)).toThrow(/bad-span label "eyes-shut\/early" is not an event label of the signal; the signal has "eyes-closed\/early"/);
  });

  it('should refuse connectivity on the continuous recording but accept it cut into epochs', () => {
    const whole = normalizeRecipe({ method: 'connectivity' });
    expect(() => resolveRecipe(whole.recipe, whole.hash, recording)).toThrow(/at least 2 epochs/);
    const cut = normalizeRecipe({ method: 'connectivity', epoching: { mode: 'fixed', epochSeconds: 4 } });
    expect(resolveRecipe(cut.recipe, cut.hash, recording).derived.epochSamples).toBe(1024);
  });

  it('should refuse connectivity in the engine when screening leaves one epoch', () => {
    const signal = demoEpochs('eyes-open', 'early', 2, 2, 5);
    const data = signal.data.slice();
    data[3] = Number.NaN; // epoch 0, channel F3
    const gappy = { ...signal, data };
    const pinned = normalizeRecipe({ method: 'connectivity', nonFinite: 'skip-epoch' });
    const resolved = resolveRecipe(pinned.recipe, pinned.hash, gappy);
    expect(() => analyze(gappy, resolved, { signalId: 's', sha256: 'x', recipeId: pinned.id, mode: 'local' })).toThrow(/1 is left after screening/);
  });
});

describe('the registry', () => {
  it('should give every method a module whose name is its recipe method', () => {
    for (const m of METHOD_MODULES) expect(methodOf({ method: m.name } as never).name).toBe(m.name);
  });
});
