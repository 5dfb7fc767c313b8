import { confidenceInterval } from '../dsp/dof.js';
import { NoSegmentsLeftError } from '../dsp/welch.js';
import { bandPowers, bandRatios } from '../features/bands.js';
import { qualityFlags } from '../features/quality.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import type { SpectrumRecipe } from '../recipes/schema.js';
import { channelView, type Signal } from '../signals/signal.js';
import { EngineInputError } from './errors.js';
import { gapHandling, screenEpochs } from './gaps.js';
import type { Estimator, SegmentFilter } from '../methods/method.js';
import { methodOf } from '../methods/registry.js';
import type { PreparedInput } from './prepare.js';
import type { ChannelFeatures, ChannelQuality, FeatureResult, SkippedEpoch } from './record.js';
import { computeFeatures } from './spectral-features.js';

/**
 * The spectrum path of the engine (Welch, multitaper, periodogram): which epochs are used, the
 * spectrum of every channel of each, and the deterministic result made from their sums. The
 * time–frequency path lives beside it in time-frequency.ts.
 */

/** Progress and cancellation hooks, called between channels. */
export interface SpectraContext {
  onProgress?: (fraction: number) => void;
  /** throw from it to abandon the work (cancellation) */
  checkpoint?: () => void;
}

/** Sums over the used epochs of every channel's spectrum, and (when asked) each epoch's own. */
export interface Spectra {
  frequencies: Float64Array;
  usedEpochs: number[];
  skipped: SkippedEpoch[];
  /** Σ over used epochs of PSD, per channel */
  psdSums: Float64Array[];
  /** Σ over used epochs of degrees of freedom, per channel (independent epochs add) */
  dofSums: Float64Array[];
  /** perEpoch[i][c]: PSD of used epoch i, channel c (only with recipe.perEpoch) */
  perEpoch: Float64Array[][] | null;
  quality: { index: number; channels: ChannelQuality[] }[] | null;
  /** Welch segments averaged and left out, per channel, over all used epochs */
  segments: { used: number; leftOut: number }[];
  /** per event label (events epoching): Σ PSD per channel and the epoch count */
  groups: Map<string, { count: number; psdSums: Float64Array[] }> | null;
  warnings: string[];
}

/**
 * Computes the spectrum of every channel of every usable epoch, each epoch on its own.
 * Deterministic: the same signal and resolved recipe give the same bits in every mode.
 */
export function computeSpectra(
  signal: Signal,
  resolved: ResolvedRecipe<SpectrumRecipe>,
  context: SpectraContext = {},
  prepared: Pick<PreparedInput, 'badSpans' | 'labels'> = { badSpans: [], labels: null },
): Spectra {
  const { recipe } = resolved;
  const estimator = createEstimator(signal, resolved, segmentFilterFor(signal, resolved, prepared.badSpans));
  const { usedEpochs, skipped, quality } = selectEpochs(signal, resolved);
  const segments = signal.channels.map(() => ({ used: 0, leftOut: 0 }));
  const groups = prepared.labels ? new Map<string, { count: number; psdSums: Float64Array[] }>() : null;
  const channelCount = signal.channels.length;
  const bins = estimator.frequencies.length;
  const psdSums = Array.from({ length: channelCount }, () => new Float64Array(bins));
  const dofSums = Array.from({ length: channelCount }, () => new Float64Array(bins));
  const perEpoch: Float64Array[][] | null = recipe.perEpoch ? [] : null;
  const warnings = new Set<string>(estimator.warnings);
  const total = usedEpochs.length * channelCount;
  let done = 0;
  for (const e of usedEpochs) {
    const row: Float64Array[] = [];
    let group: { count: number; psdSums: Float64Array[] } | undefined;
    if (groups) {
      const label = prepared.labels![e]!;
      group = groups.get(label);
      if (!group) groups.set(label, (group = { count: 0, psdSums: signal.channels.map(() => new Float64Array(bins)) }));
      group.count++;
    }
    for (let c = 0; c < channelCount; c++) {
      context.checkpoint?.();
      let estimate;
      try {
        estimate = estimator.estimate(channelView(signal, e, c));
      } catch (error) {
        if (error instanceof NoSegmentsLeftError) {
          throw new EngineInputError('no-usable-epochs', `channel "${signal.channels[c]}"${signal.epochCount > 1 ? `, epoch ${e}` : ''}: every Welch segment overlaps a bad span or exceeds the peak-to-peak limit`, '/recipe/badSpans');
        }
        throw error;
      }
      segments[c]!.used += estimate.segments.used;
      segments[c]!.leftOut += estimate.segments.leftOut;
      if (group) {
        const g = group.psdSums[c]!;
        for (let k = 0; k < bins; k++) g[k]! += estimate.psd[k]!;
      }
      const sum = psdSums[c]!;
      const dof = dofSums[c]!;
      for (let k = 0; k < bins; k++) {
        sum[k]! += estimate.psd[k]!;
        dof[k]! += estimate.degreesOfFreedom[k]!;
      }
      for (const w of estimate.warnings) warnings.add(`channel "${signal.channels[c]}", epoch ${e}: ${w}`);
      if (perEpoch) row.push(estimate.psd);
      done++;
      context.onProgress?.(done / total);
    }
    perEpoch?.push(row);
  }
  return { frequencies: estimator.frequencies, usedEpochs, skipped, psdSums, dofSums, perEpoch, quality, segments, groups, warnings: [...warnings] };
}

/** The estimator of the recipe's method, set up once for the job. */
function createEstimator(signal: Signal, resolved: ResolvedRecipe<SpectrumRecipe>, filter: SegmentFilter | null): Estimator {
  const method = methodOf(resolved.recipe);
  if (!method.createEstimator) throw new TypeError(`method "${resolved.recipe.method}" gives no spectrum estimator`);
  return method.createEstimator(signal.samplingRate, resolved.recipe, resolved.derived, filter);
}

/**
 * Welch segments of an unepoched signal that overlap a bad span, or whose peak-to-peak amplitude in
 * the channel exceeds the recipe's limit, are left out of that channel's average.
 */
function segmentFilterFor(signal: Signal, resolved: ResolvedRecipe<SpectrumRecipe>, badSpans: [number, number][]): SegmentFilter | null {
  const { recipe } = resolved;
  const limit = recipe.badSpans.peakToPeak;
  if (!methodOf(recipe).leavesOutSegments || recipe.epoching !== null || (badSpans.length === 0 && limit === null)) return null;
  const fs = signal.samplingRate;
  return (x, start, end) => {
    const first = start / fs;
    const last = (end - 1) / fs;
    for (const [a, b] of badSpans) if (first <= b && last >= a) return false;
    return limit === null || peakToPeak(x.subarray(start, end)) <= limit;
  };
}

/** Leaves out epochs with gaps (per `nonFinite`), over the amplitude limit, and (when asked) with flagged channels. */
function selectEpochs(signal: Signal, resolved: ResolvedRecipe<SpectrumRecipe>) {
  const { recipe } = resolved;
  const qualityOptions = recipe.features.quality;
  const quality: { index: number; channels: ChannelQuality[] }[] | null = qualityOptions ? [] : null;
  const limit = recipe.badSpans.peakToPeak;
  const segmentsLeftOut = methodOf(recipe).leavesOutSegments === true;
  // Gaps as bad spans stay in a continuous signal whose Welch segments go round them (segmentFilterFor).
  const segmentsAvoidGaps = segmentsLeftOut && recipe.epoching === null && signal.epochCount === 1;
  const { used, skipped } = screenEpochs(signal, gapHandling(recipe.nonFinite, segmentsAvoidGaps), (e): SkippedEpoch | null => {
    // Without recipe epoching, Welch drops segments (see segmentFilterFor); the other methods drop epochs.
    if (limit !== null && recipe.epoching === null && !segmentsLeftOut) {
      const over = signal.channels.map((name, c) => ({ name, p2p: peakToPeak(channelView(signal, e, c)) })).filter((c) => c.p2p > limit);
      if (over.length > 0) return { index: e, reason: 'amplitude', detail: over.map((c) => `${c.name}: peak-to-peak ${c.p2p}`).join('; ') };
    }
    if (qualityOptions && quality) {
      const channels = signal.channels.map((name, c): ChannelQuality => {
        const q = qualityFlags(channelView(signal, e, c), {
          flatThreshold: qualityOptions.flatThreshold,
          clipRunSamples: qualityOptions.clipRunSamples,
          ...(qualityOptions.maxPeakToPeak === null ? {} : { maxPeakToPeak: qualityOptions.maxPeakToPeak }),
        });
        return { name, flat: q.flat, clipped: q.clipped, excessiveAmplitude: q.excessiveAmplitude, peakToPeak: q.peakToPeak, standardDeviation: q.standardDeviation, longestClipRun: q.longestClipRun };
      });
      quality.push({ index: e, channels });
      const flagged = channels.filter((c) => c.flat || c.clipped || c.excessiveAmplitude);
      if (qualityOptions.dropFlagged && flagged.length > 0) {
        const detail = flagged.map((c) => `${c.name}: ${[c.flat && 'flat', c.clipped && 'clipped', c.excessiveAmplitude && `peak-to-peak ${c.peakToPeak}`].filter(Boolean).join(', ')}`).join('; ');
        return { index: e, reason: 'quality', detail };
      }
    }
    return null;
  });
  return { usedEpochs: used, skipped, quality };
}

function peakToPeak(x: Float64Array): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of x) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return hi - lo;
}

/** Turns spectra into the deterministic result: range-limited PSDs, band powers, ratios and features. */
export function summarize(signal: Signal, resolved: ResolvedRecipe<SpectrumRecipe>, spectra: Spectra): FeatureResult {
  const { recipe, derived } = resolved;
  const { frequencies } = spectra;
  const [lo, hi] = derived.frequencyRange;
  const inRange: number[] = [];
  for (let k = 0; k < frequencies.length; k++) if (frequencies[k]! >= lo && frequencies[k]! <= hi) inRange.push(k);
  const pick = (values: Float64Array) => inRange.map((k) => values[k]!);
  const ratios = recipe.ratios.map((r) => ({ ...r, name: r.name ?? `${r.numerator}/${r.denominator}` }));
  const warnings = [...resolved.warnings, ...spectra.warnings];
  /** Features of one spectrum; their warnings go to the record, prefixed with where they came from. */
  const describe = (where: string, name: string, psd: Float64Array, dof: Float64Array | null): ChannelFeatures => {
    const bands = bandPowers(frequencies, psd, recipe.bands, derived.frequencyRange, derived.frequencyResolution);
    const out: ChannelFeatures = { name, psd: pick(psd), bands, ratios: bandRatios(bands, ratios) };
    if (recipe.confidence !== null && dof) {
      const ci = confidenceInterval(psd, dof, recipe.confidence);
      out.psdLower = pick(ci.lower);
      out.psdUpper = pick(ci.upper);
      out.degreesOfFreedom = pick(dof);
    }
    if (Object.keys(recipe.features).some((k) => k !== 'quality')) {
      const { values, warnings: featureWarnings } = computeFeatures(frequencies, psd, recipe.features, derived.frequencyRange);
      out.features = values;
      for (const w of featureWarnings) warnings.push(`${where}: ${w}`);
    }
    return out;
  };
  const count = spectra.usedEpochs.length;
  const channels = signal.channels.map((name, c) => {
    const mean = spectra.psdSums[c]!.map((v) => v / count);
    return describe(`channel "${name}"`, name, mean, spectra.dofSums[c]!);
  });
  const result: FeatureResult = {
    units: { psd: `${signal.unit}^2/Hz`, power: `${signal.unit}^2`, frequency: 'Hz' },
    frequencies: pick(frequencies),
    channels,
    estimate: {
      method: recipe.method,
      segmentsPerEpoch: derived.segmentsPerEpoch,
      epochsUsed: count,
      epochsSkipped: spectra.skipped,
      segments: signal.channels.map((name, c) => ({ name, ...spectra.segments[c]! })),
      ...(recipe.confidence !== null ? { confidence: recipe.confidence } : {}),
    },
    warnings,
  };
  if (spectra.perEpoch) {
    result.epochs = spectra.usedEpochs.map((index, i) => ({
      index,
      channels: signal.channels.map((name, c) => describe(`epoch ${index}, channel "${name}"`, name, spectra.perEpoch![i]![c]!, null)),
    }));
  }
  if (spectra.quality) result.quality = spectra.quality;
  if (spectra.groups) {
    result.groups = [...spectra.groups.entries()].map(([label, g]) => ({
      label,
      epochs: g.count,
      channels: signal.channels.map((name, c) => describe(`group "${label}", channel "${name}"`, name, g.psdSums[c]!.map((v) => v / g.count), null)),
    }));
  }
  result.warnings = [...new Set(result.warnings)];
  return result;
}
