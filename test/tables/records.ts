/** Records of the invented demo recording, computed once per test file, for the table tests. */
import { analyze } from '../../src/engine/analyze.js';
import type { FeatureRecord } from '../../src/engine/record.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe } from '../../src/recipes/resolve.js';
import { demoEpochs, demoRecording } from '../../src/signals/demo-recording.js';
import type { Signal } from '../../src/signals/signal.js';
import type { SignalView } from '../../src/signals/view.js';

export function recordOf(signal: Signal, recipe: unknown, view: SignalView | null = null): FeatureRecord {
  const pinned = normalizeRecipe(recipe);
  return analyze(signal, resolveRecipe(pinned.recipe, pinned.hash, signal), { signalId: 'sig_demo', sha256: 'x', recipeId: pinned.id, mode: 'local', view });
}

/** 8 blocks of 6 s (eyes-open/eyes-closed × early/late), 8 channels at 256 Hz. */
export const recording = (): Signal => demoRecording(6, 7);

/** Welch over 2-s epochs cut around the block onsets, with every feature, ratios, confidence and perEpoch. */
export function fullWelchRecord(): FeatureRecord {
  return recordOf(recording(), {
    method: 'welch',
    segmentSeconds: 1,
    perEpoch: true,
    confidence: 0.95,
    ratios: [{ numerator: 'theta', denominator: 'beta' }],
    features: { peakFrequency: {}, centroid: {}, spectralEdge: { percentiles: [50, 90, 97.5] }, entropy: {}, powerLaw: {}, lineNoise: {}, quality: {} },
    epoching: { mode: 'events', labels: ['eyes-closed/early', 'eyes-open/early'], beforeSeconds: 0, afterSeconds: 2 },
  });
}

/** Uploaded epochs (no time line), mean only. */
export function epochsRecord(): FeatureRecord {
  return recordOf(demoEpochs('eyes-closed', 'late', 3, 2, 11), { method: 'multitaper' });
}

export function morletSummaryRecord(): FeatureRecord {
  return recordOf(recording(), {
    method: 'morlet',
    frequencies: [6, 10, 20],
    output: 'summary',
    summary: [
      { name: 'alpha', low: 8, high: 13, start: 0.5, end: 1.5 },
      { name: 'theta', low: 4, high: 8, start: 0.5, end: 1.5 },
    ],
    epoching: { mode: 'events', labels: ['eyes-closed/early', 'eyes-closed/late'], beforeSeconds: 0, afterSeconds: 2 },
  });
}

export function connectivityRecord(): FeatureRecord {
  return recordOf(recording(), {
    method: 'connectivity',
    pairs: [
      ['O1', 'O2'],
      ['F3', 'Oz'],
    ],
    epoching: { mode: 'fixed', epochSeconds: 2 },
  });
}
