import { sha256Hex } from '../common/hash.js';
import { baselineNormalize } from '../dsp/baseline.js';
import { crossSpectralConnectivity } from '../dsp/coherence.js';
import { createMorletPlan, POWER_FACTOR } from '../dsp/morlet.js';
import { phaseConsistency } from '../dsp/phase-consistency.js';
import { createSpectrogramPlan } from '../dsp/spectrogram.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import type { ConnectivityRecipe, SpectrogramRecipe, TimeFrequencyRecipe } from '../recipes/schema.js';
import { channelView, type Signal } from '../signals/signal.js';
import { EngineInputError } from './errors.js';
import { screenGaps } from './gaps.js';
import type { PreparedInput } from './prepare.js';
import type { Attachment, SkippedEpoch, TimeFrequencyResult } from './record.js';

interface Context {
  onProgress?: (fraction: number) => void;
  checkpoint?: () => void;
}

const ALPHA = 0.05;

function attachment(name: string, kind: string, channel: string | null, shape: number[], data: Float64Array | Uint8Array): Attachment {
  const bytes = new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  return { name, kind, channel, shape, dtype: data instanceof Uint8Array ? 'uint8' : 'float64-le', bytes: bytes.byteLength, sha256: sha256Hex(bytes), data };
}

/** DPSS tapers when the recipe names them, else its window (spectrogram and connectivity alike). */
function taperOptions(recipe: SpectrogramRecipe | ConnectivityRecipe) {
  if (recipe.tapers) return { tapers: { timeBandwidth: recipe.tapers.timeBandwidth, ...(recipe.tapers.taperCount !== null ? { taperCount: recipe.tapers.taperCount } : {}) } };
  return { window: recipe.window, ...(recipe.tukeyRatio !== undefined ? { tukeyRatio: recipe.tukeyRatio } : {}) };
}

/** Epochs with gaps are left out (or refuse the job), as for spectra. */
function usableEpochs(signal: Signal, policy: 'reject' | 'skip-epoch'): { used: number[]; skipped: SkippedEpoch[] } {
  const used: number[] = [];
  const skipped: SkippedEpoch[] = [];
  for (let e = 0; e < signal.epochCount; e++) {
    const gap = screenGaps(signal, e, policy);
    if (gap) skipped.push(gap);
    else used.push(e);
  }
  if (used.length === 0) throw new EngineInputError('no-usable-epochs', `all ${signal.epochCount} epoch(s) hold non-finite samples`);
  return { used, skipped };
}

/**
 * Time–frequency power (Morlet or spectrogram) per channel, trial-averaged and optionally baseline
 * normalized, with matrices as binary attachments; or cross-spectral connectivity between pairs.
 */
export function analyzeTimeFrequency(
  signal: Signal,
  resolved: ResolvedRecipe<TimeFrequencyRecipe | ConnectivityRecipe>,
  prepared: PreparedInput,
  context: Context,
): { result: TimeFrequencyResult; attachments: Attachment[] } {
  const { recipe } = resolved;
  const { used, skipped } = usableEpochs(signal, recipe.nonFinite);
  const warnings = [...resolved.warnings, ...prepared.warnings];
  const base = { estimate: { method: recipe.method, epochsUsed: used.length, epochsSkipped: skipped }, warnings };
  if (recipe.method === 'connectivity') return { result: connectivity(signal, resolved as ResolvedRecipe<ConnectivityRecipe>, used, base), attachments: [] };

  const fs = signal.samplingRate;
  const n = signal.samplesPerEpoch;
  // Times are given relative to the event for events epoching, else to the epoch start.
  const origin = recipe.epoching?.mode === 'events' ? recipe.epoching.beforeSeconds : 0;
  let times: Float64Array;
  let frequencies: Float64Array;
  // Power of one trial, and its complex coefficients when phase consistency goes into the matrices.
  let transform: (x: Float64Array) => { power: Float64Array; re?: Float64Array; im?: Float64Array };
  let edgeMask: Uint8Array | null = null;
  const extra: Partial<NonNullable<TimeFrequencyResult['timeFrequency']>> = {};
  if (recipe.method === 'morlet') {
    const plan = createMorletPlan(n, { samplingRate: fs, frequencies: recipe.frequencies, cycles: recipe.cycles, decimation: recipe.decimation });
    times = plan.times;
    frequencies = plan.frequencies;
    // One set of convolutions gives both; summaries never use the coefficients.
    const withPhase = recipe.phaseConsistency && recipe.output === 'matrix';
    transform = withPhase ? (x) => plan.powerAndCoefficients(x) : (x) => ({ power: plan.power(x) });
    edgeMask = plan.edgeMask;
    Object.assign(extra, { edgeSigmas: plan.edgeSigmas, powerFactor: POWER_FACTOR, cycles: Array.from(plan.cycles) });
  } else {
    const d = resolved.derived;
    const plan = createSpectrogramPlan(n, {
      samplingRate: fs,
      segmentSamples: d.segmentSamples,
      overlapSamples: d.overlapSamples,
      fftLength: d.fftLength,
      detrend: recipe.detrend,
      ...taperOptions(recipe),
    });
    times = plan.times;
    const [lo, hi] = d.frequencyRange;
    const columns = Array.from(plan.frequencies.keys()).filter((k) => plan.frequencies[k]! >= lo && plan.frequencies[k]! <= hi);
    frequencies = Float64Array.from(columns, (k) => plan.frequencies[k]!);
    const full = plan.frequencyCount;
    transform = (x) => {
      const p = plan.compute(x).power;
      if (columns.length === full) return { power: p };
      const out = new Float64Array(plan.timeCount * columns.length);
      for (let t = 0; t < plan.timeCount; t++) columns.forEach((k, j) => (out[t * columns.length + j] = p[t * full + k]!));
      return { power: out };
    };
  }
  const T = times.length;
  const F = frequencies.length;
  const shifted = Float64Array.from(times, (t) => t - origin);
  const attachments: Attachment[] = [];
  if (edgeMask && recipe.output === 'matrix') attachments.push(attachment('edge-mask', 'edgeMask', null, [T, F], edgeMask));
  const channels: TimeFrequencyResult['channels'] = [];
  let baselineInfo: NonNullable<TimeFrequencyResult['timeFrequency']>['baseline'] = null;
  let pcNull: NonNullable<TimeFrequencyResult['timeFrequency']>['phaseConsistencyNull'];
  const total = signal.channels.length * used.length;
  let done = 0;
  signal.channels.forEach((name, c) => {
    const trials: Float64Array[] = [];
    const re: Float64Array[] = [];
    const im: Float64Array[] = [];
    for (const e of used) {
      context.checkpoint?.();
      const w = transform(channelView(signal, e, c));
      trials.push(w.power);
      if (w.re && w.im) {
        re.push(w.re);
        im.push(w.im);
      }
      context.onProgress?.(++done / total);
    }
    let average: Float64Array;
    let perTrial: Float64Array[] | undefined = trials;
    if (recipe.baseline) {
      const r = baselineNormalize(trials, {
        mode: recipe.baseline.mode,
        timeCount: T,
        frequencyCount: F,
        window: { startTime: recipe.baseline.start, endTime: recipe.baseline.end, times: shifted },
        perTrial: recipe.perTrial,
        ...(edgeMask ? { exclude: edgeMask } : {}),
      });
      average = r.average;
      perTrial = r.trials;
      baselineInfo = { start: recipe.baseline.start, end: recipe.baseline.end, mode: recipe.baseline.mode, rows: [r.baselineStart, r.baselineEnd] };
      for (const w of r.warnings) warnings.push(`channel "${name}": baseline: ${w}`);
    } else {
      average = new Float64Array(T * F);
      for (const t of trials) for (let i = 0; i < average.length; i++) average[i]! += t[i]!;
      for (let i = 0; i < average.length; i++) average[i]! /= trials.length;
    }
    const entry: TimeFrequencyResult['channels'][number] = { name };
    if (recipe.summary.length > 0) entry.summary = recipe.summary.map((w) => summarizeWindow(average, shifted, frequencies, edgeMask, w));
    channels.push(entry);
    if (recipe.output === 'matrix') {
      attachments.push(attachment(`power-${c}`, 'power', name, [T, F], average));
      if (recipe.perTrial && perTrial) {
        const stacked = new Float64Array(perTrial.length * T * F);
        perTrial.forEach((t, i) => stacked.set(t, i * T * F));
        attachments.push(attachment(`trials-${c}`, 'trialPower', name, [perTrial.length, T, F], stacked));
      }
      if (re.length > 0) {
        const pc = phaseConsistency(re, im, { alpha: ALPHA, ...(edgeMask ? { exclude: edgeMask } : {}) });
        attachments.push(attachment(`phase-consistency-${c}`, 'phaseConsistency', name, [T, F], pc.values));
        pcNull = { ...pc.null, threshold: pc.threshold, alpha: pc.alpha };
      }
    }
  });
  const result: TimeFrequencyResult = {
    units: { power: recipe.method === 'morlet' ? `${signal.unit}^2` : `${signal.unit}^2/Hz`, normalized: recipe.baseline ? recipe.baseline.mode : 'none', frequency: 'Hz', time: 's' },
    frequencies: Array.from(frequencies),
    channels,
    timeFrequency: {
      method: recipe.method,
      times: Array.from(shifted),
      timeOrigin: origin !== 0 || recipe.epoching?.mode === 'events' ? 'event' : 'epoch-start',
      trials: used.length,
      baseline: baselineInfo,
      ...extra,
      ...(pcNull ? { phaseConsistencyNull: pcNull } : {}),
      attachments: attachments.map(({ data: _data, ...rest }) => rest),
    },
    ...base,
  };
  return { result, attachments };
}

/** Mean of the cells in [low, high) Hz × [start, end) s, leaving out edge cells and undefined values. */
function summarizeWindow(matrix: Float64Array, times: Float64Array, frequencies: Float64Array, mask: Uint8Array | null, w: { name: string; low: number; high: number; start: number; end: number }) {
  const F = frequencies.length;
  let sum = 0;
  let cells = 0;
  for (let t = 0; t < times.length; t++) {
    if (times[t]! < w.start || times[t]! >= w.end) continue;
    for (let k = 0; k < F; k++) {
      if (frequencies[k]! < w.low || frequencies[k]! >= w.high) continue;
      const i = t * F + k;
      if (mask && mask[i]) continue;
      const v = matrix[i]!;
      if (!Number.isFinite(v)) continue;
      sum += v;
      cells++;
    }
  }
  return { name: w.name, low: w.low, high: w.high, start: w.start, end: w.end, value: cells > 0 ? sum / cells : null, cells };
}

function connectivity(signal: Signal, resolved: ResolvedRecipe<ConnectivityRecipe>, used: number[], base: Pick<TimeFrequencyResult, 'estimate' | 'warnings'>): TimeFrequencyResult {
  const { recipe, derived } = resolved;
  if (signal.channels.length < 2) throw new EngineInputError('no-usable-epochs', 'connectivity needs at least two channels', '/signal/channels');
  const index = new Map(signal.channels.map((name, i) => [name, i]));
  const pairs = recipe.pairs?.map(([a, b]) => [index.get(a)!, index.get(b)!] as [number, number]);
  const epochs = used.map((e) => signal.channels.map((_, c) => channelView(signal, e, c)));
  const r = crossSpectralConnectivity(epochs, {
    samplingRate: signal.samplingRate,
    segmentSamples: derived.segmentSamples,
    overlapSamples: derived.overlapSamples,
    fftLength: derived.fftLength,
    detrend: recipe.detrend,
    ...taperOptions(recipe),
    ...(pairs ? { pairs } : {}),
    bands: recipe.bands,
    alpha: ALPHA,
  });
  const [lo, hi] = derived.frequencyRange;
  const keep = Array.from(r.frequencies.keys()).filter((k) => r.frequencies[k]! >= lo && r.frequencies[k]! <= hi);
  const pick = (v: Float64Array) => keep.map((k) => (Number.isFinite(v[k]!) ? v[k]! : null));
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
      // Under independence E[MSC] ≈ 1/n and the level-α threshold is 1 − α^{1/(n−1)} (Carter et al. 1973; REFERENCES.md §7).
      coherenceBias: r.coherenceBias,
      coherenceThreshold: r.coherenceThreshold,
      alpha: r.alpha,
      phaseLockingNull: r.phaseLockingNull ?? null,
      pairs: r.pairs.map(([a, b], p) => ({
        channels: [signal.channels[a]!, signal.channels[b]!],
        coherence: pick(r.coherence[p]!),
        imaginaryCoherency: pick(r.imaginaryCoherency[p]!),
        ...(r.phaseLocking ? { phaseLocking: pick(r.phaseLocking[p]!) } : {}),
        bands: r.bands.map((band) => ({ name: band.name, low: band.low, high: band.high, bins: band.binCount, coherence: band.coherence[p] ?? null, imaginaryCoherency: band.imaginaryCoherency[p] ?? null, phaseLocking: band.phaseLocking?.[p] ?? null })),
      })),
    },
    ...base,
  };
}
