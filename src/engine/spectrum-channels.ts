/**
 * The per-channel half of the spectrum path (Welch, multitaper, periodogram): every used epoch of
 * one channel estimated, and the sums the record is made from. A channel's outcome depends only on
 * that channel's samples, so channels can be computed in any order and on any thread; the sums run
 * over epochs in epoch order, the same additions as when all channels were done in one loop.
 */
import { NoSegmentsLeftError } from '../dsp/welch.js';
import type { Estimator, SegmentFilter } from '../methods/method.js';
import { methodOf } from '../methods/registry.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import type { SpectrumRecipe } from '../recipes/schema.js';

/** Everything a thread needs to estimate channels: plain data, so it can be posted to a helper. */
export interface SpectrumSetup {
  recipe: SpectrumRecipe;
  derived: ResolvedRecipe['derived'];
  samplingRate: number;
  samplesPerEpoch: number;
  /** channel names, in signal order */
  channels: string[];
  /** indices of the epochs that enter, in order */
  used: number[];
  /** [start, end] s of an unepoched signal that Welch segments must not overlap */
  badSpans: [number, number][];
  /** per used epoch, the index of its event label in the record's group order; null without labels */
  groupOf: number[] | null;
  groupCount: number;
}

export interface SpectrumOutcome {
  /** Σ over used epochs of PSD */
  psdSum: Float64Array;
  /** Σ over used epochs of degrees of freedom (independent epochs add) */
  dofSum: Float64Array;
  segments: { used: number; leftOut: number };
  /** Σ PSD per event label, in group order */
  groupSums: Float64Array[];
  /** each used epoch's own PSD (only with recipe.perEpoch) */
  perEpoch: Float64Array[] | null;
  /** estimator warnings, with the used-epoch position they came from */
  warnings: [number, string][];
  /** the used-epoch position where every Welch segment was left out; the sums stop there */
  emptyAt: number | null;
}

/** The estimator of the recipe's method, set up once per thread and job. */
export function createSpectrumEstimator(setup: SpectrumSetup): Estimator {
  const method = methodOf(setup.recipe);
  if (!method.createEstimator) throw new TypeError(`method "${setup.recipe.method}" gives no spectrum estimator`);
  return method.createEstimator(setup.samplingRate, setup.recipe, setup.derived, segmentFilterFor(setup));
}

/**
 * Welch segments of an unepoched signal that overlap a bad span, or whose peak-to-peak amplitude in
 * the channel exceeds the recipe's limit, are left out of that channel's average.
 */
function segmentFilterFor({ recipe, samplingRate: fs, badSpans }: SpectrumSetup): SegmentFilter | null {
  const limit = recipe.badSpans.peakToPeak;
  if (!methodOf(recipe).leavesOutSegments || recipe.epoching !== null || (badSpans.length === 0 && limit === null)) return null;
  return (x, start, end) => {
    const first = start / fs;
    const last = (end - 1) / fs;
    for (const [a, b] of badSpans) if (first <= b && last >= a) return false;
    return limit === null || peakToPeak(x.subarray(start, end)) <= limit;
  };
}

export function peakToPeak(x: Float64Array): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of x) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return hi - lo;
}

/** One channel: every used epoch estimated and summed in epoch order. */
export function computeSpectrumChannel(setup: SpectrumSetup, estimator: Estimator, _c: number, trial: (i: number) => Float64Array, beforeTrial: () => void): SpectrumOutcome {
  const bins = estimator.frequencies.length;
  const psdSum = new Float64Array(bins);
  const dofSum = new Float64Array(bins);
  const groupSums = Array.from({ length: setup.groupCount }, () => new Float64Array(bins));
  const outcome: SpectrumOutcome = { psdSum, dofSum, segments: { used: 0, leftOut: 0 }, groupSums, perEpoch: setup.recipe.perEpoch ? [] : null, warnings: [], emptyAt: null };
  for (let i = 0; i < setup.used.length; i++) {
    beforeTrial();
    let estimate;
    try {
      estimate = estimator.estimate(trial(i));
    } catch (error) {
      if (!(error instanceof NoSegmentsLeftError)) throw error;
      outcome.emptyAt = i;
      return outcome;
    }
    outcome.segments.used += estimate.segments.used;
    outcome.segments.leftOut += estimate.segments.leftOut;
    if (setup.groupOf) {
      const g = groupSums[setup.groupOf[i]!]!;
      for (let k = 0; k < bins; k++) g[k]! += estimate.psd[k]!;
    }
    for (let k = 0; k < bins; k++) {
      psdSum[k]! += estimate.psd[k]!;
      dofSum[k]! += estimate.degreesOfFreedom[k]!;
    }
    for (const w of estimate.warnings) outcome.warnings.push([i, w]);
    outcome.perEpoch?.push(estimate.psd);
  }
  return outcome;
}

/** Spectra per channel, for a channel runner. */
export const spectrumKernel = { prepare: createSpectrumEstimator, compute: computeSpectrumChannel };
