import { hostname } from 'node:os';
import { hashCanonical } from '../common/hash.js';
import { createWelchPlan, welchFrequencies } from '../dsp/welch.js';
import { makeWindow } from '../dsp/windows.js';
import { bandPowers, bandRatios } from '../features/bands.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import { channelView, type Signal } from '../signals/signal.js';
import { EngineInputError } from './errors.js';
import type { ChannelFeatures, FeatureRecord, FeatureResult, RecordInput, SkippedEpoch } from './record.js';
import { ENGINE_NAME, ENGINE_VERSION, RECORD_SCHEMA } from './version.js';

export type ProgressListener = (fraction: number) => void;

export interface AnalyzeContext {
  signalId: string;
  sha256: string;
  recipeId: string;
  mode: 'embedded' | 'distributed' | 'local';
  onProgress?: ProgressListener;
  /** called between channels; throw from it to abandon the work (cancellation) */
  checkpoint?: () => void;
}

/** Spectra of every used epoch for every channel: spectra[epoch][channel] over all bins 0..⌊n/2⌋. */
export interface Spectra {
  frequencies: Float64Array;
  usedEpochs: number[];
  skipped: SkippedEpoch[];
  spectra: Float64Array[][];
}

/**
 * Computes the spectrum of every channel of every epoch, each epoch segmented on its own.
 * Deterministic: the same signal and resolved recipe give the same bits in every mode.
 */
export function computeSpectra(signal: Signal, resolved: ResolvedRecipe, context: Pick<AnalyzeContext, 'onProgress' | 'checkpoint'> = {}): Spectra {
  const { recipe, derived } = resolved;
  const window = makeWindow(recipe.window, derived.segmentSamples, recipe.tukeyRatio === undefined ? {} : { tukeyRatio: recipe.tukeyRatio });
  const plan = createWelchPlan({
    samplingRate: signal.samplingRate,
    segmentSamples: derived.segmentSamples,
    overlapSamples: derived.overlapSamples,
    fftLength: derived.fftLength,
    window,
    detrend: recipe.detrend,
    average: recipe.average,
  });
  const { usedEpochs, skipped } = selectEpochs(signal, recipe.nonFinite);
  const total = usedEpochs.length * signal.channels.length;
  const spectra: Float64Array[][] = [];
  let done = 0;
  for (const e of usedEpochs) {
    const row: Float64Array[] = [];
    for (let c = 0; c < signal.channels.length; c++) {
      context.checkpoint?.();
      row.push(plan.compute(channelView(signal, e, c)).psd);
      done++;
      context.onProgress?.(done / total);
    }
    spectra.push(row);
  }
  return { frequencies: welchFrequencies(derived.fftLength, signal.samplingRate), usedEpochs, skipped, spectra };
}

function selectEpochs(signal: Signal, policy: 'reject' | 'skip-epoch'): { usedEpochs: number[]; skipped: SkippedEpoch[] } {
  const usedEpochs: number[] = [];
  const skipped: SkippedEpoch[] = [];
  const perEpoch = signal.channels.length * signal.samplesPerEpoch;
  for (let e = 0; e < signal.epochCount; e++) {
    const bad = firstNonFinite(signal.data, e * perEpoch, (e + 1) * perEpoch);
    if (bad < 0) {
      usedEpochs.push(e);
      continue;
    }
    const offset = bad - e * perEpoch;
    const where = `channel "${signal.channels[Math.floor(offset / signal.samplesPerEpoch)]}", sample ${offset % signal.samplesPerEpoch}`;
    if (policy === 'reject') {
      throw new EngineInputError('non-finite', `epoch ${e} holds a non-finite sample (${where}); set the recipe's "nonFinite": "skip-epoch" to leave such epochs out`, '/recipe/nonFinite');
    }
    skipped.push({ index: e, reason: 'non-finite', detail: `first non-finite sample at ${where}` });
  }
  if (usedEpochs.length === 0) {
    throw new EngineInputError('no-usable-epochs', `all ${signal.epochCount} epoch(s) hold non-finite samples; nothing is left to analyze`);
  }
  return { usedEpochs, skipped };
}

function firstNonFinite(data: Float64Array, from: number, to: number): number {
  for (let i = from; i < to; i++) if (!Number.isFinite(data[i]!)) return i;
  return -1;
}

/** Turns spectra into the deterministic result: range-limited PSDs, band powers and ratios. */
export function summarize(signal: Signal, resolved: ResolvedRecipe, spectra: Spectra): FeatureResult {
  const { recipe, derived } = resolved;
  const { frequencies } = spectra;
  const [lo, hi] = derived.frequencyRange;
  const inRange: number[] = [];
  for (let k = 0; k < frequencies.length; k++) if (frequencies[k]! >= lo && frequencies[k]! <= hi) inRange.push(k);
  const features = (name: string, psd: Float64Array): ChannelFeatures => {
    const bands = bandPowers(frequencies, psd, recipe.bands, derived.frequencyRange, derived.frequencyResolution);
    return { name, psd: inRange.map((k) => psd[k]!), bands, ratios: bandRatios(bands, recipe.ratios.map((r) => ({ ...r, name: r.name ?? '' }))) };
  };
  const bins = frequencies.length;
  const channels = signal.channels.map((name, c) => {
    const mean = new Float64Array(bins);
    for (const row of spectra.spectra) {
      const psd = row[c]!;
      for (let k = 0; k < bins; k++) mean[k]! += psd[k]!;
    }
    const count = spectra.spectra.length;
    for (let k = 0; k < bins; k++) mean[k]! /= count;
    return features(name, mean);
  });
  const result: FeatureResult = {
    units: { psd: `${signal.unit}^2/Hz`, power: `${signal.unit}^2`, frequency: 'Hz' },
    frequencies: inRange.map((k) => frequencies[k]!),
    channels,
    estimate: {
      method: recipe.method,
      segmentsPerEpoch: derived.segmentsPerEpoch,
      epochsUsed: spectra.usedEpochs.length,
      epochsSkipped: spectra.skipped,
    },
    warnings: [...resolved.warnings],
  };
  if (recipe.perEpoch) {
    result.epochs = spectra.usedEpochs.map((index, i) => ({
      index,
      channels: signal.channels.map((name, c) => features(name, spectra.spectra[i]![c]!)),
    }));
  }
  return result;
}

export function recordInput(signal: Signal, signalId: string, sha256: string): RecordInput {
  return {
    signal: signalId,
    sha256,
    samplingRate: signal.samplingRate,
    channels: [...signal.channels],
    unit: signal.unit,
    epochCount: signal.epochCount,
    samplesPerEpoch: signal.samplesPerEpoch,
  };
}

/**
 * `analyze(signal, recipe) → FeatureRecord`. The only nondeterministic fields are in `provenance`,
 * which the result hash leaves out.
 */
export function analyze(signal: Signal, resolved: ResolvedRecipe, context: AnalyzeContext): FeatureRecord {
  const started = performance.now();
  const spectra = computeSpectra(signal, resolved, context);
  const result = summarize(signal, resolved, spectra);
  return {
    schema: RECORD_SCHEMA,
    engineVersion: ENGINE_VERSION,
    recipe: { ...resolved.recipe, id: context.recipeId, hash: resolved.hash, derived: resolved.derived },
    input: recordInput(signal, context.signalId, context.sha256),
    result,
    resultHash: hashCanonical(result),
    provenance: {
      engine: ENGINE_NAME,
      engineVersion: ENGINE_VERSION,
      computedAt: new Date().toISOString(),
      durationMs: Math.round((performance.now() - started) * 1000) / 1000,
      host: hostname(),
      mode: context.mode,
    },
  };
}
