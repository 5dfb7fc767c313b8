import { hostname } from 'node:os';
import { canonicalJsonOnce } from '../common/canonical-json.js';
import { sha256Hex } from '../common/hash.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import { methodOf } from '../methods/registry.js';
import type { ConnectivityRecipe, SpectrumRecipe, TimeFrequencyRecipe } from '../recipes/schema.js';
import { analyzeTimeFrequency } from './time-frequency.js';
import type { Attachment } from './record.js';
import { arraySource, type SampleSource } from '../signals/sample-source.js';
import type { Signal, SignalDescription } from '../signals/signal.js';
import { prepareInput } from './prepare.js';
import type { SignalView } from '../signals/view.js';
import type { FeatureRecord, RecordInput } from './record.js';
import type { ChannelRunner } from './channel-runner.js';
import { computeSpectra, summarize } from './spectra.js';
import { ENGINE_NAME, ENGINE_VERSION, RECORD_SCHEMA } from './version.js';

export type ProgressListener = (fraction: number) => void;

export interface AnalyzeContext {
  /** a window, channel subset and bad spans of the stored signal (referenced jobs) */
  view?: SignalView | null;
  signalId: string;
  sha256: string;
  recipeId: string;
  mode: 'embedded' | 'distributed' | 'local';
  onProgress?: ProgressListener;
  /** called between channels; throw from it to abandon the work (cancellation) */
  checkpoint?: () => void;
  /** spreads channels over threads (src/threads); the result does not depend on it. @defaultValue the calling thread alone */
  channels?: ChannelRunner;
}

export function recordInput(signal: SignalDescription, signalId: string, sha256: string): RecordInput {
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
 *
 * The input is read a channel row at a time ({@link SampleSource}): a stored recording is never
 * loaded whole, except by connectivity, which needs the selected channels' epochs together. A
 * `Signal` already in memory is read through {@link arraySource}, with the same result.
 */
export function analyze(input: Signal | SampleSource, resolved: ResolvedRecipe, context: AnalyzeContext): FeatureRecord {
  const started = performance.now();
  const original = 'readRow' in input ? input : arraySource(input);
  const prepared = prepareInput(original, resolved.recipe, context.view ?? null);
  const signal = prepared.signal;
  let result: FeatureRecord['result'];
  let attachments: Attachment[] = [];
  let threads: number | undefined;
  if (methodOf(resolved.recipe).path === 'spectrum') {
    const spectrum = resolved as ResolvedRecipe<SpectrumRecipe>;
    const spectra = computeSpectra(signal, spectrum, context, prepared);
    threads = spectra.threads;
    spectra.warnings.unshift(...prepared.warnings);
    result = summarize(signal, spectrum, spectra);
  } else {
    ({ result, attachments, threads } = analyzeTimeFrequency(signal, resolved as ResolvedRecipe<TimeFrequencyRecipe | ConnectivityRecipe>, prepared, context));
  }
  if (prepared.epoching) result.epoching = prepared.epoching;
  return {
    schema: RECORD_SCHEMA,
    engineVersion: ENGINE_VERSION,
    recipe: { ...resolved.recipe, id: context.recipeId, hash: resolved.hash, derived: resolved.derived },
    input: { ...recordInput(original, context.signalId, context.sha256), ...(context.view ? { view: context.view } : {}) },
    result,
    resultHash: sha256Hex(canonicalJsonOnce(result)),
    ...(attachments.length > 0 ? { attachments } : {}),
    provenance: {
      engine: ENGINE_NAME,
      engineVersion: ENGINE_VERSION,
      computedAt: new Date().toISOString(),
      durationMs: Math.round((performance.now() - started) * 1000) / 1000,
      host: hostname(),
      mode: context.mode,
      ...(threads !== undefined ? { threads } : {}),
    },
  };
}
