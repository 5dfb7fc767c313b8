/**
 * Short-time power spectral density (spectrogram): one Welch-scaled periodogram per window
 * position, with a single data window or with DPSS tapers (multitaper spectrogram).
 *
 * Conventions (segment positions, centre times, one-sided density scaling) follow
 * scipy.signal.spectrogram(x, fs, window, nperseg, noverlap, nfft, detrend, scaling='density',
 * mode='psd'), so results can be checked against it.
 */
import type { DetrendKind } from './detrend.js';
import { complexFftPlan, type ComplexFftPlan } from './fft.js';
import type { WindowName } from './windows.js';
import { requireDetrend, requireFftLength, requireOptions, requireRate, requireSamples } from './checks.js';
import { binFrequencies, oneSidedDensityScale, resolveTapers, segmentCount, splitRealPair, taperSegment, type ResolvedTapers, type TaperSpec } from './spectral-core.js';

/** DPSS tapers for a multitaper spectrogram. */
export type SpectrogramTapers = TaperSpec;

export interface SpectrogramOptions {
  /** Hz, finite and > 0 */
  samplingRate: number;
  /** samples per window position, integer ≥ 1 and ≤ the signal length */
  segmentSamples: number;
  /** samples shared by consecutive windows, integer in [0, segmentSamples). The step is segmentSamples − overlapSamples. */
  overlapSamples: number;
  /** DFT length ≥ segmentSamples. @defaultValue segmentSamples */
  fftLength?: number;
  /** data window: a name (periodic form) or the samples themselves. Not with `tapers`. @defaultValue 'hann' */
  window?: WindowName | Float64Array;
  /** Tukey window only: fraction inside the cosine tapers. @defaultValue 0.5 */
  tukeyRatio?: number;
  /** DPSS tapers instead of `window`: the eigenspectra are averaged with equal weights. */
  tapers?: SpectrogramTapers;
  /** trend removed from each window before tapering. @defaultValue 'mean' */
  detrend?: DetrendKind;
}

export interface SpectrogramResult {
  /** centre of each window, (start + segmentSamples/2)/samplingRate, s (as scipy) */
  times: Float64Array;
  /** k·samplingRate/fftLength, k = 0..floor(fftLength/2), Hz */
  frequencies: Float64Array;
  /** one-sided PSD in unit²/Hz, row-major [time][frequency]: power[t·frequencyCount + k] */
  power: Float64Array;
  timeCount: number;
  frequencyCount: number;
  /** 1 for a single window, K for DPSS tapers */
  taperCount: number;
  /** λ_k of the DPSS tapers; empty for a single window */
  concentrations: Float64Array;
  /** χ² degrees of freedom of an interior bin of Gaussian data: 2 per taper (halved at DC and Nyquist) */
  degreesOfFreedom: number;
}

export interface SpectrogramPlan {
  /** samples per analysed signal */
  readonly length: number;
  readonly times: Float64Array;
  readonly frequencies: Float64Array;
  readonly timeCount: number;
  readonly frequencyCount: number;
  compute(x: Float64Array, out?: Float64Array): SpectrogramResult;
}

class SpectrogramPlanImpl implements SpectrogramPlan {
  readonly length: number;
  readonly times: Float64Array;
  readonly frequencies: Float64Array;
  readonly timeCount: number;
  readonly frequencyCount: number;
  private readonly segmentSamples: number;
  private readonly step: number;
  private readonly fftLength: number;
  private readonly detrend: DetrendKind;
  private readonly resolved: ResolvedTapers;
  private readonly scale: Float64Array;
  private readonly fft: ComplexFftPlan;
  private readonly re: Float64Array;
  private readonly im: Float64Array;
  private readonly scratch: Float64Array;
  private readonly spectra: { re: Float64Array; im: Float64Array };

  constructor(length: number, options: SpectrogramOptions) {
    requireOptions(options);
    const { samplingRate, segmentSamples, overlapSamples } = options;
    requireRate(samplingRate);
    if (!Number.isInteger(length) || length < 1) throw new RangeError(`length must be an integer ≥ 1, got ${length}`);
    const count = segmentCount(length, segmentSamples, overlapSamples);
    if (count === 0) throw new RangeError(`segmentSamples (${segmentSamples}) must not exceed the signal length (${length})`);
    const fftLength = options.fftLength ?? segmentSamples;
    requireFftLength(fftLength, segmentSamples, 'segmentSamples');
    this.detrend = options.detrend ?? 'mean';
    requireDetrend(this.detrend);
    this.resolved = resolveTapers(segmentSamples, options.window, options.tukeyRatio, options.tapers);
    this.length = length;
    this.segmentSamples = segmentSamples;
    this.step = segmentSamples - overlapSamples;
    this.fftLength = fftLength;
    this.timeCount = count;
    this.frequencyCount = (fftLength >> 1) + 1;
    this.frequencies = binFrequencies(fftLength, samplingRate);
    this.times = new Float64Array(count);
    for (let s = 0; s < count; s++) this.times[s] = (s * this.step + segmentSamples / 2) / samplingRate;
    this.scale = oneSidedDensityScale(fftLength, samplingRate, this.resolved.energy);
    this.fft = complexFftPlan(fftLength);
    this.re = new Float64Array(fftLength);
    this.im = new Float64Array(fftLength);
    this.scratch = new Float64Array(segmentSamples);
    this.spectra = { re: new Float64Array(2 * this.frequencyCount), im: new Float64Array(2 * this.frequencyCount) };
  }

  compute(x: Float64Array, out?: Float64Array): SpectrogramResult {
    requireSamples(x, this.length);
    const bins = this.frequencyCount;
    const size = this.timeCount * bins;
    if (out !== undefined && (!(out instanceof Float64Array) || out.length < size)) {
      throw new RangeError(`out must be a Float64Array of at least ${size} elements`);
    }
    const power = out ?? new Float64Array(size);
    power.fill(0, 0, size);
    const { tapers } = this.resolved;
    const K = tapers.length;
    const total = this.timeCount * K;
    const { re, im, spectra } = this;
    // Sequence j is (window j / K, taper j % K); two sequences share each complex transform.
    for (let j = 0; j < total; j += 2) {
      taperSegment(x, Math.floor(j / K) * this.step, tapers[j % K]!, this.detrend, this.scratch, re);
      const paired = j + 1 < total;
      if (paired) taperSegment(x, Math.floor((j + 1) / K) * this.step, tapers[(j + 1) % K]!, this.detrend, this.scratch, im);
      else im.fill(0);
      this.fft.transform(re, im);
      splitRealPair(re, im, this.fftLength, bins, spectra, 0, paired ? spectra : undefined, bins);
      for (let p = 0; p < (paired ? 2 : 1); p++) {
        const row = Math.floor((j + p) / K) * bins;
        const offset = p * bins;
        for (let k = 0; k < bins; k++) {
          const a = spectra.re[offset + k]!,
            b = spectra.im[offset + k]!;
          power[row + k] = power[row + k]! + a * a + b * b;
        }
      }
    }
    for (let t = 0; t < this.timeCount; t++) {
      const row = t * bins;
      for (let k = 0; k < bins; k++) power[row + k] = (power[row + k]! * this.scale[k]!) / K;
    }
    return {
      times: this.times.slice(),
      frequencies: this.frequencies.slice(),
      power,
      timeCount: this.timeCount,
      frequencyCount: bins,
      taperCount: K,
      concentrations: this.resolved.concentrations.slice(),
      degreesOfFreedom: 2 * K,
    };
  }
}

/**
 * A reusable spectrogram plan for signals of `length` samples: window or tapers, FFT plan and
 * scratch memory are set up once. Not re-entrant: use one plan per thread.
 *
 * @param length - samples per signal, integer ≥ segmentSamples
 * @param options - see {@link SpectrogramOptions}
 * @returns the plan; `compute(x, out?)` returns a {@link SpectrogramResult}
 * @throws RangeError / TypeError naming the offending option
 * @see scipy.signal.spectrogram (scaling='density', mode='psd'); Welch (1967), IEEE Trans. Audio
 *   Electroacoust. AU-15(2):70–73; Thomson (1982), Proc. IEEE 70(9):1055–1096 for the DPSS variant
 */
export function createSpectrogramPlan(length: number, options: SpectrogramOptions): SpectrogramPlan {
  return new SpectrogramPlanImpl(length, options);
}

/**
 * Short-time one-sided power spectral density.
 *
 * Window s covers x[s·step … s·step + segmentSamples), step = segmentSamples − overlapSamples, for
 * s = 0..floor((n − segmentSamples)/step); trailing samples that do not fill a window are dropped.
 * Each window is detrended, tapered and transformed with fftLength points; its PSD is
 * c_k·|X_k|² with c_k = 2/(fs·Σw²) inside and 1/(fs·Σw²) at DC and Nyquist (Welch's density
 * scaling), so Σ_k PSD_k·Δf is the window's tapered mean square. With DPSS tapers (unit energy)
 * the K eigenspectra are averaged with equal weights.
 *
 * @param x - samples, any unit; the PSD is in unit²/Hz
 * @param options - samplingRate (Hz), segmentSamples, overlapSamples, fftLength, window or tapers,
 *   tukeyRatio, detrend; defaults in {@link SpectrogramOptions}
 * @defaultValue window 'hann', detrend 'mean', fftLength = segmentSamples
 * @returns times (s, window centres), frequencies (Hz), power [time][frequency] (unit²/Hz), counts,
 *   taperCount, concentrations, degreesOfFreedom
 * @throws RangeError / TypeError naming the offending option
 * @see scipy.signal.spectrogram(x, fs, window, nperseg, noverlap, nfft, detrend, scaling='density', mode='psd')
 */
export function spectrogram(x: Float64Array, options: SpectrogramOptions): SpectrogramResult {
  if (!(x instanceof Float64Array)) throw new TypeError('x must be a Float64Array');
  return new SpectrogramPlanImpl(x.length, options).compute(x);
}
