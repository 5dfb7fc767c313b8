import { describe, expect, it } from 'vitest';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { renameDeprecated } from '../../src/recipes/renames.js';

// Issue 10 "one word per idea": the old names stay accepted for one version and must pin the same
// recipe (same canonical JSON, hash and id), so records do not depend on which spelling was used.
describe('when a recipe uses a setting name deprecated in 0.3.0', () => {
  it.each([
    ['perTrial', { method: 'morlet', perTrial: true }, { method: 'morlet', perEpoch: true }, '/perTrial'],
    ['windowSeconds', { method: 'spectrogram', windowSeconds: 0.5 }, { method: 'spectrogram', segmentSeconds: 0.5 }, '/windowSeconds'],
    ['epoching.lengthSeconds', { method: 'welch', epoching: { mode: 'fixed', lengthSeconds: 4 } }, { method: 'welch', epoching: { mode: 'fixed', epochSeconds: 4 } }, '/epoching/lengthSeconds'],
    [
      'features.lineNoise.neighbourhoodWidth',
      { method: 'welch', features: { lineNoise: { neighbourhoodWidth: 3 } } },
      { method: 'welch', features: { lineNoise: { neighborhoodWidth: 3 } } },
      '/features/lineNoise/neighbourhoodWidth',
    ],
  ])('should give %s the same recipe id and hash as its new name, and name it as deprecated', (_name, old, renamed, pointer) => {
    const before = normalizeRecipe(old);
    const after = normalizeRecipe(renamed);
    expect(before.id).toBe(after.id);
    expect(before.hash).toBe(after.hash);
    expect(before.recipe).toEqual(after.recipe);
    const { deprecations } = renameDeprecated(old);
    expect(deprecations.map((d) => d.pointer)).toEqual([pointer]);
    expect(renameDeprecated(renamed).deprecations).toEqual([]);
  });

  it("should leave the caller's object as it was", () => {
    const old = { method: 'welch', epoching: { mode: 'fixed', lengthSeconds: 4 } };
    renameDeprecated(old);
    expect(old).toEqual({ method: 'welch', epoching: { mode: 'fixed', lengthSeconds: 4 } });
  });

  it('should refuse a recipe that gives both the old and the new name, pointing at the old one', () => {
    expect(() => normalizeRecipe({ method: 'morlet', perTrial: true, perEpoch: false })).toThrow(expect.objectContaining({ pointer: '/perTrial' }));
  });
});
