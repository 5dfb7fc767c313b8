import { confidenceInterval } from '../dsp/dof.js';
import { bandPowers, bandRatios } from '../features/bands.js';
import { qualityFlags, type QualityFlags } from '../features/quality.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import type { SpectrumRecipe } from '../recipes/schema.js';
import type { SignalDescription } from '../signals/signal.js';
import { createLocalRunner, type ChannelRunContext, type ChannelRunner, type ChannelSource } from './channel-runner.js';
import { EngineInputError } from './errors.js';
import { createSpectrumEstimator, peakToPeak, type SpectrumOutcome, type SpectrumSetup } from './spectrum-channels.js';
import { gapHandling, scanChannels, screenEpochs, watchGaps } from './gaps.js';
import { methodOf } from '../methods/registry.js';
import type { PreparedInput } from './prepare.js';
import type { ChannelFeatures, ChannelQuality, FeatureResult, SkippedEpoch } from './record.js';
import { computeFeatures } from './spectral-features.js';

/**
 * The spectrum path of the engine (Welch, multitaper, periodogram): which epochs are used, the
 * spectrum of every channel of each, and the deterministic result made from their sums. The
 * time–frequency path lives beside it in time-frequency.ts.
 */

/** Progress and cancellation hooks, called between epochs of a channel. */
export interface SpectraContext extends ChannelRunContext {
  /** spreads channels over threads; the result does not depend on it. @defaultValue the calling thread alone */
  channels?: ChannelRunner;
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
  /** threads that computed at least one channel */
  threads: number;
}

/**
 * Computes the spectrum of every channel of every usable epoch, each epoch on its own, channels
 * spread by the context's runner. Deterministic: the same signal and resolved recipe give the same
 * bits in every mode and on any number of threads.
 */
export function computeSpectra(
  signal: ChannelSource,
  resolved: ResolvedRecipe<SpectrumRecipe>,
  context: SpectraContext = {},
  prepared: Pick<PreparedInput, 'badSpans' | 'labels'> = { badSpans: [], labels: null },
): Spectra {
  const { recipe } = resolved;
  const { usedEpochs, skipped, quality, source, check } = selectEpochs(signal, resolved);
  const labels = prepared.labels ? usedEpochs.map((e) => prepared.labels![e]!) : null;
  const groupNames = labels ? [...new Set(labels)] : [];
  const setup: SpectrumSetup = {
    recipe,
    derived: resolved.derived,
    samplingRate: signal.samplingRate,
    samplesPerEpoch: signal.samplesPerEpoch,
    channels: signal.channels,
    used: usedEpochs,
    badSpans: prepared.badSpans,
    groupOf: labels ? labels.map((label) => groupNames.indexOf(label)) : null,
    groupCount: groupNames.length,
  };
  const estimator = createSpectrumEstimator(setup);
  const runner = (spreadsChannels(resolved, signal.channels.length) ? context.channels : undefined) ?? createLocalRunner();
  const run = runner.run({ kind: 'spectrum', setup }, source, context, estimator);
  check();
  const outcomes = run.outcomes as SpectrumOutcome[];
  // The first epoch (then channel) with no segment left names the refusal, as when epochs came first.
  let empty: { i: number; c: number } | null = null;
  outcomes.forEach((o, c) => {
    if (o.emptyAt !== null && (empty === null || o.emptyAt < empty.i)) empty = { i: o.emptyAt, c };
  });
  if (empty !== null) {
    const { i, c } = empty as { i: number; c: number };
    throw new EngineInputError(
      'no-usable-epochs',
      `channel "${signal.channels[c]}"${signal.epochCount > 1 ? `, epoch ${usedEpochs[i]}` : ''}: every Welch segment overlaps a bad span or exceeds the peak-to-peak limit`,
      '/recipe/badSpans',
    );
  }
  const warnings = new Set<string>(estimator.warnings);
  // Epoch-major order, as the warnings of one loop over epochs and then channels.
  const located = outcomes.flatMap((o, c) => o.warnings.map(([i, w]) => ({ i, c, w })));
  located.sort((a, b) => a.i - b.i || a.c - b.c);
  for (const { i, c, w } of located) warnings.add(`channel "${signal.channels[c]}", epoch ${usedEpochs[i]}: ${w}`);
  let groups: Spectra['groups'] = null;
  if (labels) {
    groups = new Map(groupNames.map((name, g) => [name, { count: labels.filter((l) => l === name).length, psdSums: outcomes.map((o) => o.groupSums[g]!) }]));
  }
  return {
    frequencies: estimator.frequencies,
    usedEpochs,
    skipped,
    psdSums: outcomes.map((o) => o.psdSum),
    dofSums: outcomes.map((o) => o.dofSum),
    perEpoch: recipe.perEpoch ? usedEpochs.map((_, i) => outcomes.map((o) => o.perEpoch![i]!)) : null,
    quality,
    segments: outcomes.map((o) => o.segments),
    groups,
    warnings: [...warnings],
    threads: run.threads,
  };
}

/**
 * Estimated work (the resolved cost's units, `CostEstimate.work`) of one channel over all its
 * epochs below which a spectrum job keeps its channels on its own thread. Below it, posting a
 * channel to a helper and collecting it costs about what the helper saves. Measured with
 * `analyze()` on 1 and 2 threads (best of 5–200 runs, 8–64 channels of white noise, load average
 * 1.3–2.1 on this 2-core machine), 2 threads / 1 thread: Welch 11k → 1.15, 34k → 1.06, 100k →
 * 0.95 (64 ch) and 1.38 (8 ch), 157k → 0.91, 213k → 0.85–0.91, 660k → 0.75, 3.4M → 0.64;
 * periodogram of 10, 20 and 40 epochs of 250 samples 50k → 1.02, 100k → 0.79, 199k → 0.70 (of
 * one 75,000-sample epoch, 3.0M → 0.97: building the record, not the channels, takes its time);
 * multitaper 24k → 1.62, 52k → 1.05, 114k → 1.00, 245k → 0.85. The W1 Welch job (bench/welch.ts)
 * is 15M per channel.
 */
export const SPREAD_MIN_WORK_PER_CHANNEL = 150_000;

/**
 * Whether a spectrum job's channels go to the context's runner: the method must allow it
 * (`MethodModule.spreadsChannels`) and each channel must hold enough work to pay for its copy.
 * Either way the record is the same bytes.
 */
export function spreadsChannels(resolved: ResolvedRecipe<SpectrumRecipe>, channels: number): boolean {
  return methodOf(resolved.recipe).spreadsChannels === true && resolved.cost.work >= SPREAD_MIN_WORK_PER_CHANNEL * Math.max(1, channels);
}

/**
 * Leaves out epochs with gaps (per `nonFinite`), over the amplitude limit, and (when asked) with
 * flagged channels. One pass over the channels gathers what each epoch's decision needs (its first
 * gap, and per channel its peak-to-peak amplitude and quality flags); the decisions are then taken
 * epoch by epoch, channels in order, as before.
 */
function selectEpochs(signal: ChannelSource, resolved: ResolvedRecipe<SpectrumRecipe>) {
  const { recipe } = resolved;
  const qualityOptions = recipe.features.quality;
  const quality: { index: number; channels: ChannelQuality[] }[] | null = qualityOptions ? [] : null;
  const limit = recipe.badSpans.peakToPeak;
  const segmentsLeftOut = methodOf(recipe).leavesOutSegments === true;
  // Gaps as bad spans stay in a continuous signal whose Welch segments go round them (segmentFilterFor).
  const segmentsAvoidGaps = segmentsLeftOut && recipe.epoching === null && signal.epochCount === 1;
  const policy = gapHandling(recipe.nonFinite, segmentsAvoidGaps);
  // Without recipe epoching, Welch drops segments (see segmentFilterFor); the other methods drop epochs.
  const amplitudeLimit = limit !== null && recipe.epoching === null && !segmentsLeftOut ? limit : null;
  if (policy === 'reject' && amplitudeLimit === null && !qualityOptions) {
    // Every epoch is used unless a gap refuses the job: looked for as the channels are computed.
    const watched = watchGaps(signal);
    return { usedEpochs: Array.from({ length: signal.epochCount }, (_, e) => e), skipped: [], quality, ...watched };
  }
  const C = signal.channels.length;
  const n = signal.samplesPerEpoch;
  const amplitudes = amplitudeLimit !== null ? new Float64Array(signal.epochCount * C) : null;
  const flags: QualityFlags[] | null = qualityOptions ? new Array<QualityFlags>(signal.epochCount * C) : null;
  const flagOptions = qualityOptions && {
    flatThreshold: qualityOptions.flatThreshold,
    clipRunSamples: qualityOptions.clipRunSamples,
    ...(qualityOptions.maxPeakToPeak === null ? {} : { maxPeakToPeak: qualityOptions.maxPeakToPeak }),
  };
  const visit =
    amplitudes || flags
      ? (c: number, rows: Float64Array) => {
          for (let e = 0; e < signal.epochCount; e++) {
            const x = rows.subarray(e * n, (e + 1) * n);
            if (amplitudes) amplitudes[e * C + c] = peakToPeak(x);
            if (flags && flagOptions) flags[e * C + c] = qualityFlags(x, flagOptions);
          }
        }
      : undefined;
  const gaps = scanChannels(signal, policy, visit);
  const { used, skipped } = screenEpochs(signal, gaps, policy, (e): SkippedEpoch | null => {
    if (amplitudes && amplitudeLimit !== null) {
      const over = signal.channels.map((name, c) => ({ name, p2p: amplitudes[e * C + c]! })).filter((c) => c.p2p > amplitudeLimit);
      if (over.length > 0) return { index: e, reason: 'amplitude', detail: over.map((c) => `${c.name}: peak-to-peak ${c.p2p}`).join('; ') };
    }
    if (qualityOptions && quality && flags) {
      const channels = signal.channels.map((name, c): ChannelQuality => {
        const q = flags[e * C + c]!;
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
  return { usedEpochs: used, skipped, quality, source: signal, check: () => {} };
}

/** Turns spectra into the deterministic result: range-limited PSDs, band powers, ratios and features. */
export function summarize(signal: SignalDescription, resolved: ResolvedRecipe<SpectrumRecipe>, spectra: Spectra): FeatureResult {
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
      channels: signal.channels.map((name, c) =>
        describe(
          `group "${label}", channel "${name}"`,
          name,
          g.psdSums[c]!.map((v) => v / g.count),
          null,
        ),
      ),
    }));
  }
  result.warnings = [...new Set(result.warnings)];
  return result;
}
