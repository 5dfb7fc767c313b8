import { analyze } from '../../src/engine/analyze.js';
import type { FeatureRecord, FeatureResult, TimeFrequencyResult } from '../../src/engine/record.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe } from '../../src/recipes/resolve.js';
import { demoEpochs, type DemoCondition, type DemoShift } from '../../src/signals/demo-recording.js';
import type { Signal } from '../../src/signals/signal.js';

/** A record of the seeded demo study (invented data: alpha near 10 Hz on O1/Oz/O2, stronger with the eyes closed). */
export function demoRecord(recipe: Record<string, unknown>, condition: DemoCondition = 'eyes-closed', shift: DemoShift = 'late', epochs = 10, seconds = 4): FeatureRecord {
  return recordOf(demoEpochs(condition, shift, epochs, seconds, 20261201), recipe);
}

export function recordOf(signal: Signal, recipe: Record<string, unknown>): FeatureRecord {
  const pinned = normalizeRecipe(recipe);
  return analyze(signal, resolveRecipe(pinned.recipe, pinned.hash, signal), { signalId: 'sig_demo', sha256: 'x', recipeId: pinned.id, mode: 'local' });
}

export function spectral(record: FeatureRecord): FeatureRecord<FeatureResult> {
  return record as FeatureRecord<FeatureResult>;
}

export function timeFrequency(record: FeatureRecord): FeatureRecord<TimeFrequencyResult> {
  return record as FeatureRecord<TimeFrequencyResult>;
}
