/**
 * Complex Morlet wavelet transform by FFT convolution, and the time–frequency power it gives.
 *
 * ψ_f(t) = exp(2πi·f·t)·exp(−t²/(2σ_t²)), σ_t = n_c/(2πf), σ_f = 1/(2πσ_t) = f/n_c, with n_c the
 * number of cycles. Each wavelet is sampled at t = m/fs for |m| ≤ M = ceil(SUPPORT_SIGMAS·σ_t·fs)
 * and divided by G = Σ_m exp(−(m/fs)²/(2σ_t²)), which makes its discrete-time Fourier transform
 * exactly 1 at f (unit gain at the centre frequency).
 *
 * Power. With w = x ∗ ψ̃_f (the unit-gain wavelet), a sinusoid A·cos(2πft + φ) gives
 * w(t) ≈ (A/2)·e^{i(2πft+φ)}: the wavelet passes the positive-frequency half and rejects the
 * negative one (its gain at −f is exp(−2n_c²) before truncation). Power is defined as
 * P(t, f) = POWER_FACTOR·|w(t, f)|² = 2·|w|², which is A²/2 for that sinusoid: the mean square of
 * the sinusoid, the same quantity a one-sided PSD integrates to over the sinusoid's line.
 *
 * Computation. w[n] = Σ_{m<N} x[m]·ψ̃[n − m] for an epoch of N samples, zero outside it (the
 * definition, with the full ±M wavelet and its G). Only lags |n − m| ≤ N − 1 occur, so a wavelet
 * longer than the epoch (M ≥ N) is cut to its central ±(N − 1) samples without changing a single
 * term; with R = min(M, N − 1) one circular convolution of period L ≥ N + R gives every w[n] free of
 * aliases (see the plan's constructor). With decimation d and d dividing L, the outputs w[i·d] are
 * read from an L/d-point inverse transform of the product folded onto L/d bins (see foldSpectrum).
 *
 * References: C. Tallon-Baudry, O. Bertrand, C. Delpuech & J. Pernier (1996), J. Neurosci.
 * 16:4240–4249 (σ_f = 1/(2πσ_t), constant f/σ_f; from memory); M. X Cohen (2019), NeuroImage
 * 199:81–86 (parameterisation by FWHM = 2√(2 ln 2)·σ).
 */
import { complexFftPlan, realFftPlan, type ComplexFftPlan, type RealFftPlan } from './fft.js';
import { requireRate } from './checks.js';

/** The wavelet is sampled over ±SUPPORT_SIGMAS·σ_t; the envelope there is exp(−18) ≈ 1.5e−8 of its peak. */
export const SUPPORT_SIGMAS = 6;

/** P = POWER_FACTOR·|w|² maps the unit-gain coefficient of A·cos(2πft) to A²/2. */
export const POWER_FACTOR = 2;

/** Default edge criterion: a time is marked when [t − k·σ_t, t + k·σ_t] leaves the epoch, k = 3. */
export const DEFAULT_EDGE_SIGMAS = 3;

/** Log-spaced frequencies f_i = low·(high/low)^{i/(count−1)}, i = 0..count−1. */
export interface LogFrequencyRange {
  /** Hz, > 0 */
  low: number;
  /** Hz, > low (or = low when count is 1) */
  high: number;
  /** integer ≥ 1 */
  count: number;
}

/** Cycles growing linearly with frequency: `low` at the lowest frequency, `high` at the highest. */
export interface CycleRange {
  low: number;
  high: number;
}

export interface MorletOptions {
  /** Hz, finite and > 0 */
  samplingRate: number;
  /** centre frequencies in Hz, each in (0, samplingRate/2]: a list or a log-spaced range */
  frequencies: ArrayLike<number> | LogFrequencyRange;
  /** n_c: fixed, or linear in frequency from low at min f to high at max f. @defaultValue 7 */
  cycles?: number | CycleRange;
  /** k of the edge mask. @defaultValue {@link DEFAULT_EDGE_SIGMAS} (3) */
  edgeSigmas?: number;
  /** keep every d-th time sample (t = i·d/fs). @defaultValue 1 */
  decimation?: number;
}

export interface MorletWavelet {
  frequency: number;
  cycles: number;
  /** n_c/(2πf), s */
  sigmaTime: number;
  /** f/n_c, Hz: the standard deviation of the amplitude spectrum (the power spectrum's is σ_f/√2) */
  sigmaFrequency: number;
  /** M: samples either side of the centre */
  halfWidth: number;
  /** ψ̃[m + M] for m = −M..M, unit gain at `frequency` */
  re: Float64Array;
  im: Float64Array;
  /** G = Σ_m exp(−(m/fs)²/(2σ_t²)), the divisor that gives unit gain */
  gain: number;
}

export interface MorletPlan {
  readonly length: number;
  readonly samplingRate: number;
  readonly frequencies: Float64Array;
  readonly cycles: Float64Array;
  readonly sigmaTime: Float64Array;
  readonly sigmaFrequency: Float64Array;
  /** output times i·decimation/samplingRate, s, from the first sample of the epoch */
  readonly times: Float64Array;
  readonly timeCount: number;
  readonly frequencyCount: number;
  readonly decimation: number;
  readonly edgeSigmas: number;
  /** 1 where the wavelet's ±edgeSigmas·σ_t overhangs the epoch, [time][frequency] */
  readonly edgeMask: Uint8Array;
  /**
   * per frequency, the length of its inverse transform (L, or L/d when the decimation d folds the
   * product): each call does one such transform per frequency, most of its cost (bench/morlet.ts)
   */
  readonly inverseLengths: Int32Array;
  /**
   * P = 2·|w|², unit², [time][frequency]: power[i·frequencyCount + j]. With `accumulate`, P is
   * added to what `out` holds (out[k] + P, the same addition a separate sum of trials makes).
   * @throws RangeError when `out` has fewer than timeCount·frequencyCount elements; TypeError when
   *   `accumulate` is given without `out`
   */
  power(x: Float64Array, out?: Float64Array, accumulate?: boolean): Float64Array;
  /** unit-gain coefficients w (no factor 2), [time][frequency]; A·cos(2πft+φ) gives ≈ (A/2)e^{i(2πft+φ)} */
  coefficients(x: Float64Array): { re: Float64Array; im: Float64Array };
  /** power(x) and coefficients(x) from one set of convolutions (the same numbers as the two calls). */
  powerAndCoefficients(x: Float64Array): { power: Float64Array; re: Float64Array; im: Float64Array };
}

export interface MorletResult {
  frequencies: Float64Array;
  cycles: Float64Array;
  sigmaTime: Float64Array;
  sigmaFrequency: Float64Array;
  times: Float64Array;
  timeCount: number;
  frequencyCount: number;
  /** 2·|w|², unit², [time][frequency] */
  power: Float64Array;
  edgeMask: Uint8Array;
  edgeSigmas: number;
  powerFactor: number;
}

/**
 * Log-spaced frequencies.
 *
 * @param low - Hz, finite and > 0
 * @param high - Hz, ≥ low
 * @param count - integer ≥ 1; 1 gives [low]
 * @returns f_i = low·(high/low)^{i/(count−1)}, with the end points exact
 * @throws RangeError naming the offending argument
 */
export function logFrequencies(low: number, high: number, count: number): Float64Array {
  if (!(low > 0) || !Number.isFinite(low)) throw new RangeError(`frequencies.low must be a finite number > 0 Hz, got ${low}`);
  if (!(high >= low) || !Number.isFinite(high)) throw new RangeError(`frequencies.high must be a finite number ≥ low (${low}), got ${high}`);
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`frequencies.count must be an integer ≥ 1, got ${count}`);
  if (count > 1 && high === low) throw new RangeError('frequencies.high must exceed low when count > 1');
  const f = new Float64Array(count);
  for (let i = 0; i < count; i++) f[i] = i === count - 1 && count > 1 ? high : low * (high / low) ** (count > 1 ? i / (count - 1) : 0);
  return f;
}

function checkWaveletArguments(frequency: number, cycles: number, samplingRate: number): void {
  requireRate(samplingRate);
  if (!(frequency > 0) || !(frequency <= samplingRate / 2)) {
    throw new RangeError(`frequency must be in (0, samplingRate/2 = ${samplingRate / 2}] Hz, got ${frequency}`);
  }
  if (!(cycles > 0) || !Number.isFinite(cycles)) throw new RangeError(`cycles must be a finite number > 0, got ${cycles}`);
}

/**
 * The sampled, unit-gain complex Morlet wavelet.
 *
 * @param frequency - centre frequency f, Hz, in (0, samplingRate/2]
 * @param cycles - n_c > 0
 * @param samplingRate - Hz
 * @returns samples ψ̃[m] = exp(2πi·f·m/fs)·exp(−(m/fs)²/(2σ_t²))/G for |m| ≤ M = ceil(6·σ_t·fs),
 *   with σ_t, σ_f, M and G
 * @throws RangeError naming the offending argument
 * @see Tallon-Baudry et al. (1996), J. Neurosci. 16:4240–4249
 */
export function morletWavelet(frequency: number, cycles: number, samplingRate: number): MorletWavelet {
  checkWaveletArguments(frequency, cycles, samplingRate);
  const sigmaTime = cycles / (2 * Math.PI * frequency);
  const halfWidth = Math.ceil(SUPPORT_SIGMAS * sigmaTime * samplingRate);
  const size = 2 * halfWidth + 1;
  const re = new Float64Array(size);
  const im = new Float64Array(size);
  let gain = 0;
  for (let m = -halfWidth; m <= halfWidth; m++) {
    const t = m / samplingRate;
    const envelope = Math.exp(-(t * t) / (2 * sigmaTime * sigmaTime));
    gain += envelope;
    // the angle from the integer sample index keeps ψ̃[−m] = conj ψ̃[m] exactly
    const angle = (2 * Math.PI * frequency * m) / samplingRate;
    re[m + halfWidth] = envelope * Math.cos(angle);
    im[m + halfWidth] = envelope * Math.sin(angle);
  }
  for (let j = 0; j < size; j++) {
    re[j] = re[j]! / gain;
    im[j] = im[j]! / gain;
  }
  return { frequency, cycles, sigmaTime, sigmaFrequency: frequency / cycles, halfWidth, re, im, gain };
}

/**
 * Smallest m·2^a ≥ n with m ∈ {1, 3, 5, 9}: lengths the mixed-radix FFT does at its best speed, spaced
 * at most 4/3 apart, so frequencies with similar wavelet lengths share one transform of the signal.
 */
function transformLength(n: number): number {
  let best = Infinity;
  for (const m of [1, 3, 5, 9]) {
    let size = m;
    while (size < n) size *= 2;
    best = Math.min(best, size);
  }
  return best;
}

/**
 * Transform length L ≥ n when only every d-th output is read, and the fold: d when d divides L (the
 * outputs then come from an L/d-point inverse, see foldSpectrum), else 1. L is transformLength(n)
 * when d divides it, else d·transformLength(ceil(n/d)) unless that is over twice as long. The fold-1
 * fallback only happens when d ≥ n (checked for n ≤ 6000): then a single output, index 0, is read, so
 * the output stride `step` exceeds 1 only when there is one output time.
 */
function foldedLength(n: number, d: number): { size: number; fold: number } {
  const plain = transformLength(n);
  if (plain % d === 0) return { size: plain, fold: d };
  const folded = d * transformLength(Math.ceil(n / d));
  return folded <= 2 * plain ? { size: folded, fold: d } : { size: plain, fold: 1 };
}

/**
 * Bytes of wavelet spectra kept per thread, oldest dropped first. Counted in bytes, not entries: one
 * spectrum of a long continuous epoch can be 8 MB (2^20 points), a typical 40-frequency plan's
 * spectra about 0.5 MB in all. A plan keeps its own spectra whatever the cache drops.
 */
export const SPECTRUM_CACHE_BYTES = 64 * 1024 * 1024;
const spectrumCache = new Map<string, Float64Array>();
let spectrumCacheBytes = 0;

/** Bytes the wavelet-spectrum cache of this thread holds now (never above SPECTRUM_CACHE_BYTES unless one spectrum is larger). */
export function waveletCacheBytes(): number {
  return spectrumCacheBytes;
}

/**
 * DFT (length L = fftLength), divided by L, of the central part of the wavelet laid out around
 * index 0: h[k mod L] = ψ̃[k] for |k| ≤ kept (kept ≤ M, 2·kept < L, so nothing overlaps). The samples are
 * those of the full ±M wavelet, G included: only the lags beyond `kept` are left out. Cached per
 * (fftLength, kept, fs, f, n_c).
 *
 * The DFT is real: ψ̃[−k] = conj ψ̃[k] makes h conjugate-symmetric about 0, so H[k] = conj H[k]
 * (common practice: the DFT of a Hermitian sequence is real). Only the real part is kept; the
 * imaginary part the FFT returns is rounding.
 */
function waveletSpectrum(fftLength: number, kept: number, samplingRate: number, frequency: number, cycles: number): Float64Array {
  const key = `${fftLength}|${kept}|${samplingRate}|${frequency}|${cycles}`;
  let entry = spectrumCache.get(key);
  if (entry === undefined) {
    const wavelet = morletWavelet(frequency, cycles, samplingRate);
    const M = wavelet.halfWidth;
    const re = new Float64Array(fftLength);
    const im = new Float64Array(fftLength);
    for (let k = -kept; k <= kept; k++) {
      const at = k < 0 ? k + fftLength : k;
      re[at] = wavelet.re[k + M]!;
      im[at] = wavelet.im[k + M]!;
    }
    complexFftPlan(fftLength).transform(re, im);
    // the inverse transform is unscaled: 1/L goes in here, once
    for (let k = 0; k < fftLength; k++) re[k] = re[k]! / fftLength;
    entry = re;
    for (const [oldest, spectrum] of spectrumCache) {
      if (spectrumCacheBytes + entry.byteLength <= SPECTRUM_CACHE_BYTES) break;
      spectrumCache.delete(oldest);
      spectrumCacheBytes -= spectrum.byteLength;
    }
    spectrumCache.set(key, entry);
    spectrumCacheBytes += entry.byteLength;
  }
  return entry;
}

function resolveFrequencies(frequencies: MorletOptions['frequencies']): Float64Array {
  if (frequencies === null || typeof frequencies !== 'object') throw new TypeError('frequencies must be a list or { low, high, count }');
  if ('count' in frequencies && !('length' in frequencies)) {
    return logFrequencies(frequencies.low, frequencies.high, frequencies.count);
  }
  const list = Float64Array.from(frequencies as ArrayLike<number>);
  if (list.length === 0) throw new RangeError('frequencies must not be empty');
  return list;
}

function resolveCycles(cycles: MorletOptions['cycles'], frequencies: Float64Array): Float64Array {
  const spec = cycles ?? 7;
  const out = new Float64Array(frequencies.length);
  if (typeof spec === 'number') return out.fill(spec);
  if (spec === null || typeof spec !== 'object') throw new TypeError('cycles must be a number or { low, high }');
  let fMin = Infinity,
    fMax = -Infinity;
  for (const f of frequencies) {
    fMin = Math.min(fMin, f);
    fMax = Math.max(fMax, f);
  }
  for (let j = 0; j < frequencies.length; j++) {
    const share = fMax > fMin ? (frequencies[j]! - fMin) / (fMax - fMin) : 0;
    out[j] = spec.low + (spec.high - spec.low) * share;
  }
  return out;
}

interface SignalSpectrum {
  readonly real: RealFftPlan;
  readonly re: Float64Array;
  readonly im: Float64Array;
}

interface FrequencyWork {
  /** L */
  readonly size: number;
  /** H/L (real) */
  readonly spectrum: Float64Array;
  readonly signal: SignalSpectrum;
  /** d when every d-th output comes from an L/d-point inverse of the folded product, else 1 */
  readonly fold: number;
  /** plan of length L/fold */
  readonly inverse: ComplexFftPlan;
  /** w[i·d] is the inverse's output i·step (decimation/fold) */
  readonly step: number;
}

class MorletPlanImpl implements MorletPlan {
  readonly length: number;
  readonly samplingRate: number;
  readonly frequencies: Float64Array;
  readonly cycles: Float64Array;
  readonly sigmaTime: Float64Array;
  readonly sigmaFrequency: Float64Array;
  readonly times: Float64Array;
  readonly timeCount: number;
  readonly frequencyCount: number;
  readonly decimation: number;
  readonly edgeSigmas: number;
  readonly edgeMask: Uint8Array;
  readonly inverseLengths: Int32Array;
  private readonly work: FrequencyWork[] = [];
  /**
   * distinct transform lengths, each with its real plan and bins 0..floor(L/2) of the signal's
   * spectrum (filled per call; the rest follow from X[L − k] = conj X[k], x being real)
   */
  private readonly signalSpectra = new Map<number, SignalSpectrum>();
  private readonly workRe: Float64Array;
  private readonly workIm: Float64Array;
  /** the full-length product before it is folded (decimation > 1) */
  private readonly foldRe: Float64Array;
  private readonly foldIm: Float64Array;
  /** the second frequency of a pair in power() */
  private readonly pairRe: Float64Array;
  private readonly pairIm: Float64Array;

  constructor(length: number, options: MorletOptions) {
    if (options === null || typeof options !== 'object') throw new TypeError('options must be an object');
    if (!Number.isInteger(length) || length < 1) throw new RangeError(`length must be an integer ≥ 1, got ${length}`);
    const { samplingRate } = options;
    requireRate(samplingRate);
    const decimation = options.decimation ?? 1;
    if (!Number.isInteger(decimation) || decimation < 1) throw new RangeError(`decimation must be an integer ≥ 1, got ${decimation}`);
    const edgeSigmas = options.edgeSigmas ?? DEFAULT_EDGE_SIGMAS;
    if (!(edgeSigmas >= 0) || !Number.isFinite(edgeSigmas)) throw new RangeError(`edgeSigmas must be a finite number ≥ 0, got ${edgeSigmas}`);
    this.length = length;
    this.samplingRate = samplingRate;
    this.decimation = decimation;
    this.edgeSigmas = edgeSigmas;
    this.frequencies = resolveFrequencies(options.frequencies);
    this.cycles = resolveCycles(options.cycles, this.frequencies);
    const F = this.frequencies.length;
    this.frequencyCount = F;
    this.sigmaTime = new Float64Array(F);
    this.sigmaFrequency = new Float64Array(F);
    this.timeCount = Math.floor((length - 1) / decimation) + 1;
    this.times = new Float64Array(this.timeCount);
    for (let i = 0; i < this.timeCount; i++) this.times[i] = (i * decimation) / samplingRate;
    this.edgeMask = new Uint8Array(this.timeCount * F);
    this.inverseLengths = new Int32Array(F);
    let longest = 0,
      longestFolded = 0;
    for (let j = 0; j < F; j++) {
      const f = this.frequencies[j]!,
        c = this.cycles[j]!;
      checkWaveletArguments(f, c, samplingRate);
      const sigma = c / (2 * Math.PI * f);
      this.sigmaTime[j] = sigma;
      this.sigmaFrequency[j] = f / c;
      const halfWidth = Math.ceil(SUPPORT_SIGMAS * sigma * samplingRate);
      // Output n < length is Σ_m x[m]·ψ̃[n − m] over m < length, so only lags |n − m| ≤ length − 1
      // ever meet the signal: lags beyond R = min(M, length − 1) can be left out exactly. With the
      // kernel at h[k mod L] = ψ̃[k], |k| ≤ R, the circular sum at n adds the lag n − m and its images
      // n − m ± L; for L ≥ length + R every image has |n − m ± L| > R, where h is zero.
      const kept = Math.min(halfWidth, length - 1);
      const { size, fold } = foldedLength(length + kept, decimation);
      let signal = this.signalSpectra.get(size);
      if (signal === undefined) {
        const bins = (size >> 1) + 1;
        signal = { real: realFftPlan(size), re: new Float64Array(bins), im: new Float64Array(bins) };
        this.signalSpectra.set(size, signal);
      }
      this.work.push({
        size,
        spectrum: waveletSpectrum(size, kept, samplingRate, f, c),
        signal,
        fold,
        inverse: complexFftPlan(size / fold),
        step: decimation / fold,
      });
      this.inverseLengths[j] = size / fold;
      longest = Math.max(longest, size / fold);
      if (fold > 1) longestFolded = Math.max(longestFolded, size);
      const reach = edgeSigmas * sigma * samplingRate;
      for (let i = 0; i < this.timeCount; i++) {
        const n = i * decimation;
        if (n < reach || length - 1 - n < reach) this.edgeMask[i * F + j] = 1;
      }
    }
    this.workRe = new Float64Array(longest);
    this.workIm = new Float64Array(longest);
    this.foldRe = new Float64Array(longestFolded);
    this.foldIm = new Float64Array(longestFolded);
    this.pairRe = new Float64Array(longest);
    this.pairIm = new Float64Array(longest);
  }

  private checkSignal(x: Float64Array): void {
    if (!(x instanceof Float64Array)) throw new TypeError('x must be a Float64Array');
    if (x.length !== this.length) throw new RangeError(`x must have ${this.length} samples, got ${x.length}`);
  }

  /** The signal's spectrum at every transform length in use, once per call. */
  private transformSignal(x: Float64Array): void {
    for (const s of this.signalSpectra.values()) s.real.forward(x, s.re, s.im);
  }

  /**
   * Frequency j's convolution (after transformSignal): w[i·decimation] at re/im[i·step], i < timeCount,
   * and the step. Elements past (timeCount − 1)·step are left unspecified.
   */
  private convolve(j: number, re = this.workRe, im = this.workIm): number {
    const w = this.work[j]!;
    if (w.fold === 1) {
      multiplyHermitian(w.size, w.signal.re, w.signal.im, w.spectrum, re, im);
    } else {
      multiplyHermitian(w.size, w.signal.re, w.signal.im, w.spectrum, this.foldRe, this.foldIm);
      foldSpectrum(this.foldRe, this.foldIm, w.size / w.fold, w.fold, re, im);
    }
    // only outputs i·step, i < timeCount, are read: a prefix of the inverse transform
    w.inverse.transform(re, im, true, (this.timeCount - 1) * w.step + 1);
    return w.step;
  }

  power(x: Float64Array, out?: Float64Array, accumulate = false): Float64Array {
    this.checkSignal(x);
    if (accumulate && out === undefined) throw new TypeError('accumulate needs an out array to add to');
    const F = this.frequencyCount,
      T = this.timeCount;
    if (out !== undefined && (!(out instanceof Float64Array) || out.length < T * F)) {
      throw new RangeError(`out must be a Float64Array of at least ${T * F} elements`);
    }
    const power = out ?? new Float64Array(T * F);
    this.transformSignal(x);
    let j = 0;
    for (; j + 1 < F; j += 2) {
      const step = this.convolve(j);
      const step1 = this.convolve(j + 1, this.pairRe, this.pairIm);
      writePowerPair(this.workRe, this.workIm, step, this.pairRe, this.pairIm, step1, T, power, j, F, accumulate ? 1 : 0);
    }
    if (j < F) writePower(this.workRe, this.workIm, this.convolve(j), T, power, j, F, accumulate ? 1 : 0);
    return power;
  }

  coefficients(x: Float64Array): { re: Float64Array; im: Float64Array } {
    this.checkSignal(x);
    const F = this.frequencyCount,
      T = this.timeCount;
    const outRe = new Float64Array(T * F);
    const outIm = new Float64Array(T * F);
    this.transformSignal(x);
    for (let j = 0; j < F; j++) writeCoefficients(this.workRe, this.workIm, this.convolve(j), T, outRe, outIm, j, F);
    return { re: outRe, im: outIm };
  }

  powerAndCoefficients(x: Float64Array): { power: Float64Array; re: Float64Array; im: Float64Array } {
    this.checkSignal(x);
    const F = this.frequencyCount,
      T = this.timeCount;
    const power = new Float64Array(T * F);
    const outRe = new Float64Array(T * F);
    const outIm = new Float64Array(T * F);
    this.transformSignal(x);
    for (let j = 0; j < F; j++) {
      const step = this.convolve(j);
      writePower(this.workRe, this.workIm, step, T, power, j, F, 0);
      writeCoefficients(this.workRe, this.workIm, step, T, outRe, outIm, j, F);
    }
    return { power, re: outRe, im: outIm };
  }
}

/**
 * Y[k] = X[k]·H[k] for k = 0..size−1, from bins 0..floor(size/2) of the spectrum X of a real signal
 * (X[size − k] = conj X[k] gives the rest) and a real H.
 */
function multiplyHermitian(size: number, xr: Float64Array, xi: Float64Array, h: Float64Array, yr: Float64Array, yi: Float64Array): void {
  yr[0] = xr[0]! * h[0]!;
  yi[0] = xi[0]! * h[0]!;
  // bins k and size − k share X[k] (the second conjugated)
  let k = 1;
  for (let m = size - 1; k < m; k++, m--) {
    const a = xr[k]!,
      b = xi[k]!,
      g = h[k]!,
      q = h[m]!;
    yr[k] = a * g;
    yi[k] = b * g;
    yr[m] = a * q;
    yi[m] = -b * q;
  }
  // the Nyquist bin of an even length
  if (k === size - k) {
    yr[k] = xr[k]! * h[k]!;
    yi[k] = xi[k]! * h[k]!;
  }
}

/**
 * Z[q] = Σ_{r<d} Y[q + r·P], q < P = L/d. Every d-th output of the L-point inverse DFT of Y is the
 * P-point inverse DFT of Z: Σ_k Y[k]·e^{2πi·k·id/L} = Σ_q Z[q]·e^{2πi·q·i/P}, since
 * e^{2πi·(q + rP)·id/L} = e^{2πi·q·i/P} (common practice: decimation in time of the inverse DFT).
 */
function foldSpectrum(yr: Float64Array, yi: Float64Array, P: number, d: number, zr: Float64Array, zi: Float64Array): void {
  zr.set(yr.subarray(0, P));
  zi.set(yi.subarray(0, P));
  for (let r = 1, base = P; r < d; r++, base += P) {
    for (let q = 0; q < P; q++) {
      zr[q] = zr[q]! + yr[base + q]!;
      zi[q] = zi[q]! + yi[base + q]!;
    }
  }
}

/**
 * out[i·F + j] = 2·|w|² at re/im[i·step], i < T; with keep = 1 added to out[i·F + j] instead.
 */
function writePower(re: Float64Array, im: Float64Array, step: number, T: number, out: Float64Array, j: number, F: number, keep: 0 | 1): void {
  // two loops rather than a test per element: the test cost the plain kernel about 3 %
  if (keep === 0) for (let i = 0, n = 0, at = j; i < T; i++, n += step, at += F) out[at] = POWER_FACTOR * (re[n]! * re[n]! + im[n]! * im[n]!);
  else for (let i = 0, n = 0, at = j; i < T; i++, n += step, at += F) out[at]! += POWER_FACTOR * (re[n]! * re[n]! + im[n]! * im[n]!);
}

/**
 * writePower for frequencies j and j + 1 at once: two neighbours in each row of `out` per store
 * pass, half the scattered cache lines of two single passes.
 */
function writePowerPair(re: Float64Array, im: Float64Array, step: number, re1: Float64Array, im1: Float64Array, step1: number, T: number, out: Float64Array, j: number, F: number, keep: 0 | 1): void {
  if (keep === 0) {
    for (let i = 0, n = 0, n1 = 0, at = j; i < T; i++, n += step, n1 += step1, at += F) {
      out[at] = POWER_FACTOR * (re[n]! * re[n]! + im[n]! * im[n]!);
      out[at + 1] = POWER_FACTOR * (re1[n1]! * re1[n1]! + im1[n1]! * im1[n1]!);
    }
    return;
  }
  for (let i = 0, n = 0, n1 = 0, at = j; i < T; i++, n += step, n1 += step1, at += F) {
    out[at]! += POWER_FACTOR * (re[n]! * re[n]! + im[n]! * im[n]!);
    out[at + 1]! += POWER_FACTOR * (re1[n1]! * re1[n1]! + im1[n1]! * im1[n1]!);
  }
}

/** outRe/outIm[i·F + j] = w at re/im[i·step], i < T */
function writeCoefficients(re: Float64Array, im: Float64Array, step: number, T: number, outRe: Float64Array, outIm: Float64Array, j: number, F: number): void {
  for (let i = 0, n = 0, at = j; i < T; i++, n += step, at += F) {
    outRe[at] = re[n]!;
    outIm[at] = im[n]!;
  }
}

/**
 * A reusable Morlet plan for signals of `length` samples. Wavelet spectra are cached per
 * (transform length, kept lags, fs, f, n_c) across plans; each call transforms the signal once per
 * distinct transform length (frequencies whose wavelets need about the same padding share one), then
 * does one inverse transform per frequency (L/d points when the decimation d divides L). Not
 * re-entrant: use one plan per thread.
 *
 * @param length - samples per epoch, integer ≥ 1
 * @param options - see {@link MorletOptions}
 * @returns the plan, with frequencies, cycles, σ_t (s), σ_f (Hz), times (s), edge mask,
 *   `power(x, out?, accumulate?)` (2·|w|², unit², [time][frequency]), `coefficients(x)` (unit-gain w)
 *   and `powerAndCoefficients(x)` (both from one set of convolutions)
 * @throws RangeError / TypeError naming the offending option
 * @see Tallon-Baudry et al. (1996), J. Neurosci. 16:4240–4249; Cohen (2019), NeuroImage 199:81–86
 */
export function createMorletPlan(length: number, options: MorletOptions): MorletPlan {
  return new MorletPlanImpl(length, options);
}

/**
 * Morlet wavelet power of one signal: P(t, f) = 2·|(x ∗ ψ̃_f)(t)|², which equals A²/2 for a
 * sinusoid of amplitude A at f (see the module note for the normalisation).
 *
 * @param x - samples, any unit; power is in unit²
 * @param options - samplingRate (Hz), frequencies (list or log range, Hz), cycles (fixed or
 *   linear in f), edgeSigmas, decimation; see {@link MorletOptions}
 * @defaultValue cycles 7, edgeSigmas 3, decimation 1
 * @returns frequencies, cycles, σ_t, σ_f, times, power and edgeMask ([time][frequency]), edgeSigmas,
 *   powerFactor (2)
 * @throws RangeError / TypeError naming the offending option
 * @see Tallon-Baudry et al. (1996), J. Neurosci. 16:4240–4249
 */
export function morletPower(x: Float64Array, options: MorletOptions): MorletResult {
  if (!(x instanceof Float64Array)) throw new TypeError('x must be a Float64Array');
  const plan = new MorletPlanImpl(x.length, options);
  return {
    frequencies: plan.frequencies,
    cycles: plan.cycles,
    sigmaTime: plan.sigmaTime,
    sigmaFrequency: plan.sigmaFrequency,
    times: plan.times,
    timeCount: plan.timeCount,
    frequencyCount: plan.frequencyCount,
    power: plan.power(x),
    edgeMask: plan.edgeMask,
    edgeSigmas: plan.edgeSigmas,
    powerFactor: POWER_FACTOR,
  };
}
