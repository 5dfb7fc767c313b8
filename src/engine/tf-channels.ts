/**
 * The per-channel half of time–frequency power (Morlet or spectrogram): every trial of one channel
 * transformed, trial-averaged or baseline-normalized, summarized, and packed into attachments.
 *
 * A channel's outcome depends only on that channel's trials, so channels can be computed in any
 * order and on any thread: the job's own thread and its helper threads (fan-out.ts) run exactly
 * this code on exactly these inputs, which is why the record is the same bits however many threads
 * computed it.
 */
import { sha256Hex } from '../common/hash.js';
import { baselineNormalize } from '../dsp/baseline.js';
import { phaseConsistency } from '../dsp/phase-consistency.js';
import type { TrialTransform } from '../methods/method.js';
import { methodOf } from '../methods/registry.js';
import type { TimeFrequencyRecipe } from '../recipes/schema.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import type { Attachment, TimeFrequencyResult } from './record.js';

/** Level of the no-effect thresholds in time–frequency records: phase consistency and coherence. */
export const NULL_ALPHA = 0.05;

type TimeFrequencyBlock = NonNullable<TimeFrequencyResult['timeFrequency']>;

/** Everything a thread needs to compute channels: plain data, so it can be posted to a helper. */
export interface ChannelSetup {
  recipe: TimeFrequencyRecipe;
  derived: ResolvedRecipe['derived'];
  samplingRate: number;
  samplesPerEpoch: number;
  /** channel names, in signal order */
  channels: string[];
  /** indices of the epochs that enter (gap-free), in order */
  used: number[];
}

/** The transform of one trial and the axes it produces, built once per thread and job. */
export interface ChannelWork extends TrialTransform {
  /** times relative to the event (events epoching) or the epoch start */
  shifted: Float64Array;
}

export interface ChannelOutcome {
  entry: TimeFrequencyResult['channels'][number];
  attachments: Attachment[];
  warnings: string[];
  baseline: TimeFrequencyBlock['baseline'];
  phaseConsistencyNull?: TimeFrequencyBlock['phaseConsistencyNull'];
}

/**
 * Packs a matrix as an attachment. Float64 NaNs (edge cells, undefined baselines) are first set to
 * the one bit pattern 0x7FF8000000000000: V8 gives a NaN whatever sign the machine code that made
 * it leaves, which differs between the interpreter and optimized code, and the record's bytes and
 * hashes must not depend on how warm a thread was.
 */
export function attachment(name: string, kind: string, channel: string | null, shape: number[], data: Float64Array | Uint8Array): Attachment {
  if (data instanceof Float64Array) canonicalizeNaN(data);
  const bytes = new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  return { name, kind, channel, shape, dtype: data instanceof Uint8Array ? 'uint8' : 'float64-le', bytes: bytes.byteLength, sha256: sha256Hex(bytes), data };
}

function canonicalizeNaN(data: Float64Array): void {
  let words: Uint32Array | null = null;
  for (let i = 0; i < data.length; i++) {
    if (!Number.isNaN(data[i]!)) continue;
    words ??= new Uint32Array(data.buffer, data.byteOffset, data.length * 2);
    // little-endian layout, as the attachment's dtype float64-le says
    words[2 * i] = 0;
    words[2 * i + 1] = 0x7ff80000;
  }
}

/** The plan of the recipe's method, its axes, and the per-trial transform. */
export function createChannelWork(setup: ChannelSetup): ChannelWork {
  const { recipe } = setup;
  const method = methodOf(recipe);
  if (!method.createTrialTransform) throw new TypeError(`method "${recipe.method}" gives no time–frequency transform`);
  const work = method.createTrialTransform(recipe, setup.derived, setup.samplingRate, setup.samplesPerEpoch);
  // Times are given relative to the event for events epoching, else to the epoch start.
  const origin = recipe.epoching?.mode === 'events' ? recipe.epoching.beforeSeconds : 0;
  return { ...work, shifted: Float64Array.from(work.times, (t) => t - origin) };
}

/**
 * One channel: every used trial transformed (`trial(i)` gives the i-th used trial's samples), then
 * baseline-normalized or averaged, summarized and packed. `beforeTrial` runs before each trial
 * (cancellation and progress).
 */
export function computeChannel(setup: ChannelSetup, work: ChannelWork, c: number, trial: (i: number) => Float64Array, beforeTrial: () => void): ChannelOutcome {
  const { recipe } = setup;
  const name = setup.channels[c]!;
  const { shifted, frequencies, edgeMask } = work;
  const T = shifted.length;
  const F = frequencies.length;
  const trials: Float64Array[] = [];
  const re: Float64Array[] = [];
  const im: Float64Array[] = [];
  // A plain trial average needs no trial kept: each trial's power is added to the sum in trial
  // order as it comes (by the transform itself where it can), the same additions as summing the
  // kept trials.
  const keepTrials = Boolean(recipe.baseline) || recipe.perEpoch;
  let average: Float64Array = new Float64Array(T * F);
  for (let i = 0; i < setup.used.length; i++) {
    beforeTrial();
    const w = work.transform(trial(i), keepTrials ? undefined : average);
    if (keepTrials) trials.push(w.power);
    else if (w.power !== average) for (let k = 0; k < average.length; k++) average[k]! += w.power[k]!;
    if (w.re && w.im) {
      re.push(w.re);
      im.push(w.im);
    }
  }
  const warnings: string[] = [];
  let baseline: ChannelOutcome['baseline'] = null;
  let perTrial: Float64Array[] | undefined = trials;
  if (recipe.baseline) {
    const r = baselineNormalize(trials, {
      mode: recipe.baseline.mode,
      timeCount: T,
      frequencyCount: F,
      window: { startTime: recipe.baseline.start, endTime: recipe.baseline.end, times: shifted },
      perTrial: recipe.perEpoch,
      ...(edgeMask ? { exclude: edgeMask } : {}),
    });
    average = r.average;
    perTrial = r.trials;
    baseline = { start: recipe.baseline.start, end: recipe.baseline.end, mode: recipe.baseline.mode, rows: [r.baselineStart, r.baselineEnd] };
    for (const w of r.warnings) warnings.push(`channel "${name}": baseline: ${w}`);
  } else {
    if (keepTrials) for (const t of trials) for (let k = 0; k < average.length; k++) average[k]! += t[k]!;
    for (let k = 0; k < average.length; k++) average[k]! /= setup.used.length;
  }
  const entry: ChannelOutcome['entry'] = { name };
  if (recipe.summary.length > 0) entry.summary = recipe.summary.map((w) => summarizeWindow(average, shifted, frequencies, edgeMask, w));
  const attachments: Attachment[] = [];
  const outcome: ChannelOutcome = { entry, attachments, warnings, baseline };
  if (recipe.output === 'matrix') {
    attachments.push(attachment(`power-${c}`, 'power', name, [T, F], average));
    if (recipe.perEpoch && perTrial) {
      const stacked = new Float64Array(perTrial.length * T * F);
      perTrial.forEach((t, i) => stacked.set(t, i * T * F));
      attachments.push(attachment(`trials-${c}`, 'trialPower', name, [perTrial.length, T, F], stacked));
    }
    if (re.length > 0) {
      const pc = phaseConsistency(re, im, { alpha: NULL_ALPHA, ...(edgeMask ? { exclude: edgeMask } : {}) });
      attachments.push(attachment(`phase-consistency-${c}`, 'phaseConsistency', name, [T, F], pc.values));
      outcome.phaseConsistencyNull = { ...pc.null, threshold: pc.threshold, alpha: pc.alpha };
    }
  }
  return outcome;
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

/** Time–frequency power per channel, for a channel runner. */
export const timeFrequencyKernel = { prepare: createChannelWork, compute: computeChannel };
