/**
 * Welch's averaged modified periodogram: one-sided power spectral density.
 *
 * Reference: P. D. Welch (1967), "The use of fast Fourier transform for the estimation of power
 * spectra: a method based on time averaging over short, modified periodograms", IEEE Trans. Audio
 * Electroacoust. AU-15(2):70–73. Conventions (segmentation, scaling, median correction) follow
 * scipy.signal.welch with scaling='density', so results can be checked against it.
 */

import type { DetrendKind } from './detrend.js';
import { complexFftPlan, type ComplexFftPlan } from './fft.js';
import { requireDetrend, requireFftLength, requireInteger, requireOptions, requireRate, requireSegmenting } from './checks.js';
import { binFrequencies, NoSegmentsLeftError, oneSidedDensityScale, requireWindowEnergy, taperSegmentPair } from './spectral-core.js';

// The shared spectral core, under the names this module has always exported.
export { binFrequencies as welchFrequencies, NoSegmentsLeftError, oneSidedDensityScale, segmentCount } from './spectral-core.js';

export type AverageKind = 'mean' | 'median';
const AVERAGE_KINDS: readonly AverageKind[] = ['mean', 'median'];

export interface WelchOptions {
  /** sampling rate in Hz, finite and > 0 */
  samplingRate: number;
  /** samples per segment, integer ≥ 1 */
  segmentSamples: number;
  /** samples shared by consecutive segments, integer in [0, segmentSamples) */
  overlapSamples: number;
  /** DFT length, integer ≥ segmentSamples; segments are zero-padded to it */
  fftLength: number;
  /** taper of length segmentSamples */
  window: Float64Array;
  /** trend removed from each segment before tapering */
  detrend: DetrendKind;
  /** how segment periodograms are combined; median is divided by {@link medianBias} */
  average: AverageKind;
  /**
   * Optional filter on segments, called in order with the signal being estimated, the segment's first
   * sample index and one past its last; segments for which it returns false are skipped and counted
   * as rejected.
   * @defaultValue undefined: every segment is used
   */
  acceptSegment?: (x: Float64Array, start: number, end: number) => boolean;
}

export interface WelchResult {
  /** bin frequencies in Hz, k·samplingRate/fftLength for k = 0..floor(fftLength/2) */
  frequencies: Float64Array;
  /** one-sided PSD in unit²/Hz, one value per frequency */
  psd: Float64Array;
  /** segments averaged */
  segmentCount: number;
  /** segments skipped by `acceptSegment` */
  rejectedSegments: number;
}

/** A reusable plan: caches window energy, FFT plan and scratch buffers. */
export interface WelchPlan {
  /** floor(fftLength/2) + 1 */
  readonly binCount: number;
  /** bin frequencies in Hz (shared; do not modify) */
  readonly frequencies: Float64Array;
  /** PSD of x (unit²/Hz) into `out` when given (length ≥ binCount), else a new array; allocates nothing else once warm */
  compute(x: Float64Array, out?: Float64Array): { psd: Float64Array; segmentCount: number; rejectedSegments: number };
}

/**
 * Bias of the sample median of `count` independent χ²₂/2 (exponential) periodogram values,
 * relative to their mean: b(n) = 1 + Σ_{i=1}^{⌊(n−1)/2⌋} (1/(2i+1) − 1/(2i)).
 * The median average is divided by it, as scipy.signal.welch(average='median') does.
 *
 * @param count - number of averaged segments, integer ≥ 1
 * @returns b(count); 1 for count ≤ 2, tending to ln 2 as count grows
 * @throws RangeError when `count` is not an integer ≥ 1
 * @see B. Allen et al. (2012), "FINDCHIRP: an algorithm for detection of gravitational waves from
 *   inspiraling compact binaries", Phys. Rev. D 85, 122006, appendix B (as cited by scipy)
 */
export function medianBias(count: number): number {
  requireInteger(count, 'count', 1);
  let bias = 1;
  for (let i = 1; i <= (count - 1) >> 1; i++) bias += 1 / (2 * i + 1) - 1 / (2 * i);
  return bias;
}

function validate(options: WelchOptions): void {
  requireOptions(options);
  const { samplingRate, segmentSamples, overlapSamples, fftLength, window, detrend, average, acceptSegment } = options;
  requireRate(samplingRate);
  requireSegmenting(segmentSamples, overlapSamples);
  requireFftLength(fftLength, segmentSamples, 'segmentSamples');
  if (!(window instanceof Float64Array)) throw new TypeError('window must be a Float64Array');
  if (window.length !== segmentSamples) {
    throw new RangeError(`window length must equal segmentSamples (${segmentSamples}), got ${window.length}`);
  }
  requireDetrend(detrend);
  if (!AVERAGE_KINDS.includes(average)) {
    throw new TypeError(`average must be one of ${AVERAGE_KINDS.join(', ')}, got ${String(average)}`);
  }
  if (acceptSegment !== undefined && typeof acceptSegment !== 'function') {
    throw new TypeError('acceptSegment must be a function when given');
  }
}

/** k-th smallest of a[base..base+n) (k counted from base), reordering that range; Hoare's selection with median-of-three. */
function select(a: Float64Array, base: number, n: number, k: number): number {
  let lo = base,
    hi = base + n - 1;
  const target = base + k;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // order a[lo] ≤ a[mid] ≤ a[hi] so the pivot is never an extreme
    if (a[mid]! < a[lo]!) swap(a, mid, lo);
    if (a[hi]! < a[lo]!) swap(a, hi, lo);
    if (a[hi]! < a[mid]!) swap(a, hi, mid);
    const pivot = a[mid]!;
    let i = lo,
      j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        swap(a, i, j);
        i++;
        j--;
      }
    }
    if (target <= j) hi = j;
    else if (target >= i) lo = i;
    else return a[target]!;
  }
  return a[target]!;
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i]!;
  a[i] = a[j]!;
  a[j] = t;
}

/** Median of a[base..base+n) as numpy.median (mean of the two middle values for even n); reorders the range. */
function median(a: Float64Array, base: number, n: number): number {
  const upper = select(a, base, n, n >> 1);
  if (n % 2 === 1) return upper;
  // after selection every element before the middle is ≤ upper; the lower middle is their maximum
  let lower = a[base]!;
  for (let i = base + 1; i < base + (n >> 1); i++) if (a[i]! > lower) lower = a[i]!;
  return 0.5 * (lower + upper);
}

class WelchPlanImpl implements WelchPlan {
  readonly binCount: number;
  readonly frequencies: Float64Array;
  private readonly segmentSamples: number;
  private readonly step: number;
  private readonly fftLength: number;
  private readonly window: Float64Array;
  private readonly detrend: DetrendKind;
  private readonly average: AverageKind;
  private readonly acceptSegment: ((x: Float64Array, start: number, end: number) => boolean) | undefined;
  private readonly scale: Float64Array;
  private readonly fft: ComplexFftPlan;
  private readonly re: Float64Array;
  private readonly im: Float64Array;
  private readonly power: Float64Array;
  private readonly starts: number[] = [];
  private readonly fit = new Float64Array(2);
  private segmentPower = new Float64Array(0);

  constructor(options: WelchOptions) {
    validate(options);
    const { samplingRate, segmentSamples, overlapSamples, fftLength } = options;
    this.segmentSamples = segmentSamples;
    this.step = segmentSamples - overlapSamples;
    this.fftLength = fftLength;
    // a private copy: later changes to the caller's array must not change this plan's results
    this.window = options.window.slice();
    const energy = requireWindowEnergy(this.window);
    this.detrend = options.detrend;
    this.average = options.average;
    this.acceptSegment = options.acceptSegment;
    this.binCount = (fftLength >> 1) + 1;
    this.frequencies = binFrequencies(fftLength, samplingRate);
    this.scale = oneSidedDensityScale(fftLength, samplingRate, energy);
    this.fft = complexFftPlan(fftLength);
    this.re = new Float64Array(fftLength);
    this.im = new Float64Array(fftLength);
    this.power = new Float64Array(fftLength);
  }

  compute(x: Float64Array, out?: Float64Array): { psd: Float64Array; segmentCount: number; rejectedSegments: number } {
    if (!(x instanceof Float64Array)) throw new TypeError('x must be a Float64Array');
    if (x.length < this.segmentSamples) {
      throw new RangeError(`segmentSamples (${this.segmentSamples}) must not exceed the signal length (${x.length})`);
    }
    const bins = this.binCount;
    if (out !== undefined && (!(out instanceof Float64Array) || out.length < bins)) {
      throw new RangeError(`out must be a Float64Array of at least ${bins} elements`);
    }
    const starts = this.starts;
    starts.length = 0;
    const total = Math.floor((x.length - this.segmentSamples + this.step) / this.step);
    for (let s = 0; s < total; s++) {
      const start = s * this.step;
      if (this.acceptSegment === undefined || this.acceptSegment(x, start, start + this.segmentSamples)) starts.push(start);
    }
    const count = starts.length;
    if (count === 0) throw new NoSegmentsLeftError(total);
    const psd = out ?? new Float64Array(bins);
    if (this.average === 'mean') this.meanPower(x, psd);
    else this.medianPower(x, psd);
    const scale = this.scale;
    const norm = this.average === 'mean' ? 1 / count : 1 / medianBias(count);
    for (let k = 0; k < bins; k++) psd[k] = psd[k]! * scale[k]! * norm;
    return { psd, segmentCount: count, rejectedSegments: total - count };
  }

  /**
   * Two real segments a, b go through one complex DFT as z = a + i·b. Then
   * |A_k|² + |B_k|² = (|Z_k|² + |Z_{n−k}|²)/2, so the sum over segments needs only |Z|² per pair.
   * Rounding in a shared DFT scales with the larger segment; the tests bound the effect on a
   * 1e4-times-smaller neighbour at 1e-9 relative.
   */
  private meanPower(x: Float64Array, psd: Float64Array): void {
    const n = this.fftLength;
    const { re, im, power, starts } = this;
    power.fill(0);
    for (let s = 0; s < starts.length; s += 2) {
      this.taperPair(x, starts[s]!, s + 1 < starts.length ? starts[s + 1]! : -1);
      this.fft.transform(re, im);
      for (let k = 0; k < n; k++) power[k] = power[k]! + re[k]! * re[k]! + im[k]! * im[k]!;
    }
    psd[0] = power[0]!;
    for (let k = 1; k < this.binCount; k++) psd[k] = 0.5 * (power[k]! + power[n - k]!);
  }

  private medianPower(x: Float64Array, psd: Float64Array): void {
    const n = this.fftLength;
    const bins = this.binCount;
    const { re, im, starts } = this;
    const count = starts.length;
    if (this.segmentPower.length < count * bins) this.segmentPower = new Float64Array(count * bins);
    // bin-major, so each bin's values are contiguous for the selection
    const stored = this.segmentPower;
    for (let s = 0; s < count; s += 2) {
      const paired = s + 1 < count;
      this.taperPair(x, starts[s]!, paired ? starts[s + 1]! : -1);
      this.fft.transform(re, im);
      for (let k = 0; k < bins; k++) {
        const m = k === 0 ? 0 : n - k;
        const zr = re[k]!,
          zi = im[k]!,
          yr = re[m]!,
          yi = im[m]!;
        // A_k = (Z_k + conj Z_{n−k})/2, B_k = (Z_k − conj Z_{n−k})/(2i)
        const ar = zr + yr,
          ai = zi - yi,
          br = zr - yr,
          bi = zi + yi;
        const at = k * count + s;
        stored[at] = 0.25 * (ar * ar + ai * ai);
        if (paired) stored[at + 1] = 0.25 * (br * br + bi * bi);
      }
    }
    for (let k = 0; k < bins; k++) psd[k] = median(stored, k * count, count);
  }

  /** Segment a into `re` and segment b into `im` (zeros when b < 0), detrended, tapered and zero-padded. */
  private taperPair(x: Float64Array, a: number, b: number): void {
    taperSegmentPair(x, a, b, this.window, this.detrend, this.fit, this.re, this.im);
  }
}

/**
 * Build a reusable Welch plan; `compute` then allocates only its result (or none, given `out`).
 *
 * @param options - see {@link WelchOptions}; every field is validated here
 * @returns a plan with `binCount = floor(fftLength/2)+1`, `frequencies` in Hz and `compute(x, out?)`
 *   returning the one-sided PSD in unit²/Hz (x in unit), the number of averaged segments and the
 *   number rejected by `acceptSegment`
 * @throws RangeError for out-of-range numbers, a window whose length is not segmentSamples, a
 *   signal shorter than segmentSamples, or (from compute, as {@link NoSegmentsLeftError}) when every
 *   segment is rejected
 * @throws TypeError for a window that is not a Float64Array, or an unknown detrend or average
 * @see Welch (1967), IEEE Trans. Audio Electroacoust. AU-15(2):70–73; scipy.signal.welch
 */
export function createWelchPlan(options: WelchOptions): WelchPlan {
  return new WelchPlanImpl(options);
}

/**
 * One-sided power spectral density by Welch's method (convenience around {@link createWelchPlan}).
 *
 * @param x - samples, in any unit
 * @param options - see {@link WelchOptions}
 * @returns frequencies (Hz), PSD (unit²/Hz), averaged and rejected segment counts
 * @throws RangeError / TypeError as {@link createWelchPlan}
 * @see Welch (1967); scipy.signal.welch(x, fs, window, nperseg, noverlap, nfft, detrend,
 *   scaling='density', average)
 */
export function welch(x: Float64Array, options: WelchOptions): WelchResult {
  const plan = createWelchPlan(options);
  const { psd, segmentCount: used, rejectedSegments } = plan.compute(x);
  return { frequencies: plan.frequencies, psd, segmentCount: used, rejectedSegments };
}
