/**
 * Single-window (modified) periodogram.
 */
import { detrendInto, type DetrendKind } from './detrend.js';
import { perBinDegreesOfFreedom } from './dof.js';
import { realFftPlan, type RealFftPlan } from './fft.js';
import { requireDetrend, requireFftLength, requireOptions, requireRate, requireSamples } from './checks.js';
import { binFrequencies, oneSidedDensityScale, requireWindowEnergy } from './spectral-core.js';
import { makeWindow, type WindowName } from './windows.js';

export interface PeriodogramOptions {
  /** Hz, finite and > 0 */
  samplingRate: number;
  /** data window over the whole signal (periodic form). @defaultValue 'rectangular' */
  window?: WindowName;
  /** Tukey window only: fraction inside the cosine tapers. @defaultValue 0.5 */
  tukeyRatio?: number;
  /** DFT length ≥ the signal length (zero padding). @defaultValue the signal length */
  fftLength?: number;
  /** trend removed before windowing. @defaultValue 'mean' */
  detrend?: DetrendKind;
}

export interface PeriodogramResult {
  /** k·samplingRate/fftLength, k = 0..floor(fftLength/2), Hz (shared with the plan: do not write) */
  frequencies: Float64Array;
  /** one-sided PSD, unit²/Hz */
  psd: Float64Array;
  /** 2 per bin (χ²₂), 1 at DC and Nyquist, for Gaussian data away from strong leakage */
  degreesOfFreedom: Float64Array;
}

export interface PeriodogramPlan {
  readonly length: number;
  readonly fftLength: number;
  readonly frequencies: Float64Array;
  compute(x: Float64Array): PeriodogramResult;
}

class PeriodogramPlanImpl implements PeriodogramPlan {
  readonly length: number;
  readonly fftLength: number;
  readonly frequencies: Float64Array;
  private readonly window: Float64Array;
  private readonly scale: Float64Array;
  private readonly fft: RealFftPlan;
  private readonly dof: Float64Array;
  private readonly work: Float64Array;
  private readonly re: Float64Array;
  private readonly im: Float64Array;
  private readonly detrend: DetrendKind;

  constructor(length: number, options: PeriodogramOptions) {
    if (!Number.isInteger(length) || length < 1) throw new RangeError(`length must be an integer ≥ 1, got ${length}`);
    requireOptions(options);
    requireRate(options.samplingRate);
    const fftLength = options.fftLength ?? length;
    requireFftLength(fftLength, length, 'the signal length');
    const windowOptions = options.tukeyRatio === undefined ? undefined : { tukeyRatio: options.tukeyRatio };
    this.window = makeWindow(options.window ?? 'rectangular', length, windowOptions);
    const energy = requireWindowEnergy(this.window);
    this.length = length;
    this.fftLength = fftLength;
    this.frequencies = binFrequencies(fftLength, options.samplingRate);
    this.scale = oneSidedDensityScale(fftLength, options.samplingRate, energy);
    this.fft = realFftPlan(fftLength);
    this.dof = perBinDegreesOfFreedom(2, fftLength);
    this.detrend = options.detrend ?? 'mean';
    requireDetrend(this.detrend);
    this.work = new Float64Array(length);
    const bins = (fftLength >> 1) + 1;
    this.re = new Float64Array(bins);
    this.im = new Float64Array(bins);
  }

  compute(x: Float64Array): PeriodogramResult {
    requireSamples(x, this.length);
    const y = detrendInto(x, this.detrend, this.work);
    for (let t = 0; t < this.length; t++) y[t] = y[t]! * this.window[t]!;
    this.fft.forward(y, this.re, this.im);
    const psd = new Float64Array(this.re.length);
    for (let k = 0; k < psd.length; k++) psd[k] = (this.re[k]! * this.re[k]! + this.im[k]! * this.im[k]!) * this.scale[k]!;
    return { frequencies: this.frequencies, psd, degreesOfFreedom: this.dof.slice() };
  }
}

/**
 * A reusable periodogram plan for signals of `length` samples (window, FFT and scratch set up once).
 *
 * @param length - samples per signal (≥ 1)
 * @param options - see {@link PeriodogramOptions}
 * @returns the plan
 * @throws RangeError / TypeError naming the offending option
 */
export function createPeriodogramPlan(length: number, options: PeriodogramOptions): PeriodogramPlan {
  return new PeriodogramPlanImpl(length, options);
}

/**
 * One-sided periodogram density with any data window: P(f_k) = c_k·|Σ_t w_t·y_t·e^{−2πikt/n}|²,
 * c_k = 2/(fs·Σw²) inside and 1/(fs·Σw²) at DC and Nyquist (the Welch factor with one segment),
 * y the detrended signal. Matches scipy.signal.periodogram(x, fs, window, nfft, detrend, scaling='density').
 *
 * @param x - samples (any unit); the PSD is in unit²/Hz
 * @param options - samplingRate (Hz), window, tukeyRatio, fftLength, detrend
 * @returns frequencies (Hz), psd (unit²/Hz) and per-bin degreesOfFreedom
 * @throws RangeError / TypeError naming the offending option
 * @see A. Schuster (1898), Terr. Magn. 3:13–41, the periodogram (citation from memory); P. D. Welch (1967) for the window normalisation.
 */
export function periodogram(x: Float64Array, options: PeriodogramOptions): PeriodogramResult {
  const result = new PeriodogramPlanImpl(x.length, options).compute(x);
  return { ...result, frequencies: result.frequencies.slice() };
}
