/**
 * Equivalent degrees of freedom (EDOF) of spectral estimates and chi-square confidence intervals.
 */
import { chiSquareQuantile } from './special.js';
import type { AverageKind } from './welch.js';
import { windowEnergy } from './windows.js';

/** Exact mean and variance of the median of n i.i.d. unit exponentials (order-statistic sums). */
function exponentialMedianMoments(n: number): { mean: number; variance: number } {
  // X_(r) = Σ_{i=1..r} Z_i/(n−i+1) with Z_i i.i.d. Exp(1) (Rényi's representation).
  const r = n % 2 === 1 ? (n + 1) / 2 : n / 2;
  let mean = 0;
  let variance = 0;
  for (let i = 1; i <= r; i++) {
    mean += 1 / (n - i + 1);
    variance += 1 / (n - i + 1) ** 2;
  }
  if (n % 2 === 0) {
    // Even n: the median is the midpoint of X_(r) and X_(r+1) = X_(r) + Z_{r+1}/(n−r).
    mean += 0.5 / (n - r);
    variance += 0.25 / (n - r) ** 2;
  }
  return { mean, variance };
}

/**
 * Equivalent degrees of freedom of a Welch estimate at frequencies away from DC and Nyquist.
 *
 * Mean averaging uses Percival & Walden (292b), with h the window scaled to Σh² = 1, N_B
 * segments and shift N = segmentSamples − overlapSamples:
 * ν = 2N_B / (1 + 2·Σ_{m=1}^{N_B−1} (1 − m/N_B)·|Σ_t h_t·h_{t+mN}|²).
 * For Hann at 50 % overlap this is 36N_B²/(19N_B − 1).
 *
 * Median averaging has no closed form under overlap. The median of N_B independent χ²₂/2
 * periodogram values has exactly known mean and variance (exponential order statistics); its
 * moment-matched EDOF 2·mean²/variance is then scaled by the same overlap factor ν_mean/(2N_B)
 * that overlap costs the mean. This is an approximation; it is exact (for Gaussian data and
 * interior bins) without overlap. A seeded Monte Carlo with scipy's median Welch (Hann, 50 %,
 * see test/fixtures/multitaper/welch-median-dof.json) finds it 1.5–2 % conservative (low).
 *
 * @param window - the segment window, length segmentSamples (any scale)
 * @param overlapSamples - samples shared by consecutive segments, 0 ≤ overlapSamples < segmentSamples
 * @param segmentCount - N_B, the number of averaged segments (≥ 1)
 * @param average - how segments were combined
 * @defaultValue average = 'mean'
 * @returns ν, the equivalent degrees of freedom of interior bins (DC and Nyquist bins have half; see {@link perBinDegreesOfFreedom})
 * @throws RangeError naming the offending parameter
 * @see D. B. Percival & A. T. Walden (1993), Spectral Analysis for Physical Applications, eq. (292b).
 * @see P. D. Welch (1967), IEEE Trans. Audio Electroacoust. AU-15(2):70–73.
 */
export function welchDegreesOfFreedom(window: Float64Array, overlapSamples: number, segmentCount: number, average: AverageKind = 'mean'): number {
  const length = window.length;
  if (length < 1) throw new RangeError('window must not be empty');
  if (!Number.isInteger(overlapSamples) || overlapSamples < 0 || overlapSamples >= length) {
    throw new RangeError(`overlapSamples must be an integer in [0, segmentSamples = ${length}), got ${overlapSamples}`);
  }
  if (!Number.isInteger(segmentCount) || segmentCount < 1) {
    throw new RangeError(`segmentCount must be an integer ≥ 1, got ${segmentCount}`);
  }
  if (average !== 'mean' && average !== 'median') throw new RangeError(`average must be 'mean' or 'median', got ${String(average)}`);
  const energy = windowEnergy(window);
  if (!(energy > 0)) throw new RangeError('window must have positive energy');
  const shift = length - overlapSamples;
  let denominator = 1;
  for (let m = 1; m < segmentCount && m * shift < length; m++) {
    let lag = 0;
    for (let t = 0; t + m * shift < length; t++) lag += window[t]! * window[t + m * shift]!;
    lag /= energy;
    denominator += 2 * (1 - m / segmentCount) * lag * lag;
  }
  const meanDof = (2 * segmentCount) / denominator;
  if (average === 'mean') return meanDof;
  const { mean, variance } = exponentialMedianMoments(segmentCount);
  return ((2 * mean * mean) / variance) * (meanDof / (2 * segmentCount));
}

/**
 * EDOF of a weighted sum Σ w_k·Ŝ_k of independent estimates that are each χ²₂ distributed
 * (e.g. orthogonal-taper eigenspectra of white noise): ν = 2(Σw_k)²/Σw_k², by matching the first
 * two moments. Equal weights give 2K; eigenvalue weights w_k = λ_k; adaptive weights w_k = d_k².
 *
 * @param weights - non-negative weights, not all zero
 * @returns ν in (0, 2K]
 * @throws RangeError when no weight is positive
 * @see D. B. Percival & A. T. Walden (1993), ch. 7 (equivalent degrees of freedom of quadratic estimators).
 */
export function weightedDegreesOfFreedom(weights: ArrayLike<number>): number {
  let sum = 0;
  let squares = 0;
  for (let k = 0; k < weights.length; k++) {
    sum += weights[k]!;
    squares += weights[k]! * weights[k]!;
  }
  if (!(squares > 0)) throw new RangeError('weights must contain a positive value');
  return (2 * sum * sum) / squares;
}

/**
 * Spreads an interior-bin EDOF over the one-sided bins 0..floor(fftLength/2): the DFT of real data
 * is real at DC (and at Nyquist for even fftLength), so those bins carry half the degrees of freedom.
 *
 * @param degreesOfFreedom - ν of the interior bins
 * @param fftLength - the transform length
 * @returns per-bin ν
 * @throws RangeError for a non-positive ν or fftLength
 */
export function perBinDegreesOfFreedom(degreesOfFreedom: number, fftLength: number): Float64Array {
  if (!(degreesOfFreedom > 0)) throw new RangeError(`degreesOfFreedom must be positive, got ${degreesOfFreedom}`);
  if (!Number.isInteger(fftLength) || fftLength < 1) throw new RangeError(`fftLength must be an integer ≥ 1, got ${fftLength}`);
  const bins = Math.floor(fftLength / 2) + 1;
  const out = new Float64Array(bins).fill(degreesOfFreedom);
  out[0] = degreesOfFreedom / 2;
  if (fftLength % 2 === 0 && bins > 1) out[bins - 1] = degreesOfFreedom / 2;
  return out;
}

export interface ConfidenceInterval {
  /** ν·Ŝ/χ²_ν(1 − α/2), same unit as the PSD. */
  readonly lower: Float64Array;
  /** ν·Ŝ/χ²_ν(α/2), same unit as the PSD. */
  readonly upper: Float64Array;
}

/**
 * Pointwise chi-square confidence interval of a spectral estimate: ν·Ŝ(f)/S(f) ~ χ²_ν gives
 * [ν·Ŝ/χ²_ν(1−α/2), ν·Ŝ/χ²_ν(α/2)] with α = 1 − level.
 *
 * @param psd - the estimate Ŝ(f) (unit²/Hz)
 * @param degreesOfFreedom - ν, one number for all bins or one per bin (fractional allowed)
 * @param level - coverage probability 1 − α, in (0, 1)
 * @defaultValue level = 0.95
 * @returns lower and upper bounds per bin (unit²/Hz)
 * @throws RangeError when `level` is outside (0, 1), a ν is not positive or the lengths differ
 * @see D. B. Percival & A. T. Walden (1993), ch. 6; J. S. Bendat & A. G. Piersol, Random Data (chi-square intervals).
 */
export function confidenceInterval(psd: Float64Array, degreesOfFreedom: number | Float64Array, level = 0.95): ConfidenceInterval {
  if (!(level > 0 && level < 1)) throw new RangeError(`level must be in (0, 1), got ${level}`);
  if (typeof degreesOfFreedom !== 'number' && degreesOfFreedom.length !== psd.length) {
    throw new RangeError(`degreesOfFreedom has ${degreesOfFreedom.length} values but psd has ${psd.length}`);
  }
  const alpha = 1 - level;
  const lower = new Float64Array(psd.length);
  const upper = new Float64Array(psd.length);
  // Per-bin ν often repeats (scalar, DC/Nyquist halves): compute each quantile pair once.
  const multipliers = new Map<number, [number, number]>();
  for (let i = 0; i < psd.length; i++) {
    const nu = typeof degreesOfFreedom === 'number' ? degreesOfFreedom : degreesOfFreedom[i]!;
    let pair = multipliers.get(nu);
    if (pair === undefined) {
      if (!(nu > 0) || !Number.isFinite(nu)) throw new RangeError(`degreesOfFreedom must be positive and finite, got ${nu} at bin ${i}`);
      pair = [nu / chiSquareQuantile(1 - alpha / 2, nu), nu / chiSquareQuantile(alpha / 2, nu)];
      multipliers.set(nu, pair);
    }
    lower[i] = psd[i]! * pair[0];
    upper[i] = psd[i]! * pair[1];
  }
  return { lower, upper };
}
