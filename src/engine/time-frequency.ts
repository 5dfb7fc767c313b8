import { crossSpectralConnectivity } from '../dsp/coherence.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import type { ConnectivityRecipe, TimeFrequencyRecipe } from '../recipes/schema.js';
import type { SignalDescription } from '../signals/signal.js';
import { EngineInputError } from './errors.js';
import { createLocalRunner, type ChannelRunContext, type ChannelRunner, type ChannelSource } from './channel-runner.js';
import { gapHandling, scanChannels, screenEpochs, watchGaps } from './gaps.js';
import type { PreparedInput } from './prepare.js';
import type { Attachment, TimeFrequencyResult } from './record.js';
import { taperOptions } from '../methods/settings.js';
import { attachment, createChannelWork, NULL_ALPHA, type ChannelOutcome, type ChannelSetup } from './tf-channels.js';

interface Context extends ChannelRunContext {
  /** spreads channels over threads. @defaultValue the calling thread alone */
  channels?: ChannelRunner;
}

/**
 * Time–frequency power (Morlet or spectrogram) per channel, trial-averaged and optionally baseline
 * normalized, with matrices as binary attachments; or cross-spectral connectivity between pairs.
 */
export function analyzeTimeFrequency(
  signal: ChannelSource,
  resolved: ResolvedRecipe<TimeFrequencyRecipe | ConnectivityRecipe>,
  prepared: PreparedInput,
  context: Context,
): { result: TimeFrequencyResult; attachments: Attachment[]; threads?: number } {
  const { recipe } = resolved;
  const policy = gapHandling(recipe.nonFinite, false);
  // Connectivity needs channel pairs, so it keeps the selected channels' rows from this pass.
  const kept: Float64Array[] | null = recipe.method === 'connectivity' ? [] : null;
  // Under `reject` every epoch is used unless a gap refuses the job: looked for as the channels are computed.
  const watched = policy === 'reject' && !kept ? watchGaps(signal) : null;
  const gaps = watched ? [] : scanChannels(signal, policy, kept ? (_c, rows) => kept.push(rows) : undefined);
  const { used, skipped } = watched ? { used: Array.from({ length: signal.epochCount }, (_, e) => e), skipped: [] } : screenEpochs(signal, gaps, policy);
  const warnings = [...resolved.warnings, ...prepared.warnings];
  const base = { estimate: { method: recipe.method, epochsUsed: used.length, epochsSkipped: skipped }, warnings };
  if (recipe.method === 'connectivity') {
    // Resolving refuses a signal with one epoch; epochs left out for gaps or bad spans can still leave one.
    if (used.length < 2)
      throw new EngineInputError('no-usable-epochs', `connectivity needs at least 2 epochs (phase locking is measured across epochs); ${used.length} is left after screening`, '/recipe/epoching');
    return { result: connectivity(signal, kept!, resolved as ResolvedRecipe<ConnectivityRecipe>, used, base), attachments: [] };
  }

  const setup: ChannelSetup = {
    recipe,
    derived: resolved.derived,
    samplingRate: signal.samplingRate,
    samplesPerEpoch: signal.samplesPerEpoch,
    channels: signal.channels,
    used,
  };
  const work = createChannelWork(setup);
  const { shifted, frequencies, edgeMask, extra } = work;
  const T = shifted.length;
  const F = frequencies.length;
  const attachments: Attachment[] = [];
  if (edgeMask && recipe.output === 'matrix') attachments.push(attachment('edge-mask', 'edgeMask', null, [T, F], edgeMask));
  const run = (context.channels ?? createLocalRunner()).run({ kind: 'time-frequency', setup }, watched?.source ?? signal, context, work);
  watched?.check();
  const outcomes = run.outcomes as ChannelOutcome[];
  const threads = run.threads;
  let baselineInfo: NonNullable<TimeFrequencyResult['timeFrequency']>['baseline'] = null;
  let pcNull: NonNullable<TimeFrequencyResult['timeFrequency']>['phaseConsistencyNull'];
  for (const outcome of outcomes) {
    attachments.push(...outcome.attachments);
    warnings.push(...outcome.warnings);
    baselineInfo = outcome.baseline ?? baselineInfo;
    pcNull = outcome.phaseConsistencyNull ?? pcNull;
  }
  const result: TimeFrequencyResult = {
    units: { power: recipe.method === 'morlet' ? `${signal.unit}^2` : `${signal.unit}^2/Hz`, normalized: recipe.baseline ? recipe.baseline.mode : 'none', frequency: 'Hz', time: 's' },
    frequencies: Array.from(frequencies),
    channels: outcomes.map((o) => o.entry),
    timeFrequency: {
      method: recipe.method,
      times: Array.from(shifted),
      timeOrigin: recipe.epoching?.mode === 'events' ? 'event' : 'epoch-start',
      trials: used.length,
      baseline: baselineInfo,
      ...extra,
      ...(pcNull ? { phaseConsistencyNull: pcNull } : {}),
      attachments: attachments.map(({ data: _data, ...rest }) => rest),
    },
    ...base,
  };
  return { result, attachments, threads };
}

function connectivity(
  signal: SignalDescription,
  rows: Float64Array[],
  resolved: ResolvedRecipe<ConnectivityRecipe>,
  used: number[],
  base: Pick<TimeFrequencyResult, 'estimate' | 'warnings'>,
): TimeFrequencyResult {
  const { recipe, derived } = resolved;
  if (signal.channels.length < 2) throw new EngineInputError('no-usable-epochs', 'connectivity needs at least two channels', '/signal/channels');
  const index = new Map(signal.channels.map((name, i) => [name, i]));
  const pairs = recipe.pairs?.map(([a, b]) => [index.get(a)!, index.get(b)!] as [number, number]);
  const n = signal.samplesPerEpoch;
  const epochs = used.map((e) => rows.map((x) => x.subarray(e * n, (e + 1) * n)));
  const r = crossSpectralConnectivity(epochs, {
    samplingRate: signal.samplingRate,
    segmentSamples: derived.segmentSamples,
    overlapSamples: derived.overlapSamples,
    fftLength: derived.fftLength,
    detrend: recipe.detrend,
    ...taperOptions(recipe),
    ...(pairs ? { pairs } : {}),
    bands: recipe.bands,
    alpha: NULL_ALPHA,
  });
  const [lo, hi] = derived.frequencyRange;
  const keep = Array.from(r.frequencies.keys()).filter((k) => r.frequencies[k]! >= lo && r.frequencies[k]! <= hi);
  // 0/0 (a flat channel) is undefined: null in the record, never rounding noise and never NaN.
  const finite = (x: number | undefined) => (x !== undefined && Number.isFinite(x) ? x : null);
  const pick = (v: Float64Array) => keep.map((k) => finite(v[k]));
  const warnings = [...base.warnings];
  for (const c of r.flatChannels) {
    warnings.push(
      `channel ${signal.channels[c]} is flat (${recipe.detrend === 'none' ? 'zero' : 'constant'}) in every analysed segment: its coherence, imaginary coherency and phase locking are undefined (0/0) and reported as null`,
    );
  }
  return {
    units: { coherence: '1', frequency: 'Hz' },
    frequencies: keep.map((k) => r.frequencies[k]!),
    channels: signal.channels.map((name) => ({ name })),
    connectivity: {
      method: r.method,
      epochCount: r.epochCount,
      segmentCount: r.segmentCount,
      taperCount: r.taperCount,
      effectiveSegments: r.effectiveSegments,
      // Under independence E[MSC] ≈ 1/n and the level-α threshold is 1 − α^{1/(n−1)} (Carter et al. 1973; docs/references.md §7).
      coherenceBias: r.coherenceBias,
      coherenceThreshold: r.coherenceThreshold,
      alpha: r.alpha,
      phaseLockingNull: r.phaseLockingNull ?? null,
      pairs: r.pairs.map(([a, b], p) => ({
        channels: [signal.channels[a]!, signal.channels[b]!],
        coherence: pick(r.coherence[p]!),
        imaginaryCoherency: pick(r.imaginaryCoherency[p]!),
        ...(r.phaseLocking ? { phaseLocking: pick(r.phaseLocking[p]!) } : {}),
        bands: r.bands.map((band) => ({
          name: band.name,
          low: band.low,
          high: band.high,
          bins: band.binCount,
          coherence: finite(band.coherence[p]),
          imaginaryCoherency: finite(band.imaginaryCoherency[p]),
          phaseLocking: finite(band.phaseLocking?.[p]),
        })),
      })),
    },
    ...base,
    warnings,
  };
}
