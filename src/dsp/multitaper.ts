/**
 * Multitaper power spectral density with DPSS tapers (Thomson 1982).
 */
import { detrendInto, type DetrendKind } from './detrend.js';
import { weightedDegreesOfFreedom } from './dof.js';
import { cachedDpss } from './dpss.js';
import { complexFftPlan, type ComplexFftPlan } from './fft.js';
import { binFrequencies, oneSidedDensityScale } from './spectral-core.js';
import { requireDetrend, requireFftLength, requireOptions, requireRate, requireSamples } from './checks.js';
import { defaultTaperCount } from './dpss.js';

export const TAPER_WEIGHTINGS = ['equal', 'eigenvalue', 'adaptive'] as const;
export type TaperWeighting = (typeof TAPER_WEIGHTINGS)[number];

/** Concentrations below this leak too much broadband power to be trusted (warning). */
export const MIN_CONCENTRATION = 0.9;

export interface MultitaperOptions {
  /** Hz, finite and > 0 */
  samplingRate: number;
  /** NW, the time–half-bandwidth product; the half-bandwidth is NW·samplingRate/length Hz */
  timeBandwidth: number;
  /** K. @defaultValue max(1, floor(2·NW) − 1) */
  taperCount?: number;
  /** how eigenspectra are combined. @defaultValue 'adaptive' */
  weighting?: TaperWeighting;
  /** DFT length ≥ the signal length (zero padding). @defaultValue the signal length */
  fftLength?: number;
  /** trend removed from the whole signal before tapering. @defaultValue 'mean' */
  detrend?: DetrendKind;
  /** adaptive: stop when max_f |S_new − S|/S_new falls below this. @defaultValue 1e-8 */
  adaptiveTolerance?: number;
  /** adaptive: iteration cap; reaching it adds a warning. @defaultValue 100 */
  adaptiveMaxIterations?: number;
}

export interface MultitaperResult {
  /** bin frequencies k·samplingRate/fftLength, k = 0..floor(fftLength/2), Hz (shared with the plan: do not write) */
  frequencies: Float64Array;
  /** one-sided PSD, unit²/Hz; bins 1..N/2−1 doubled, DC and Nyquist not */
  psd: Float64Array;
  /** equivalent degrees of freedom per bin: 2K (equal), 2(Σλ)²/Σλ² (eigenvalue), 2(Σd²)²/Σd⁴ (adaptive); halved at DC and Nyquist */
  degreesOfFreedom: Float64Array;
  /** λ_k of the tapers used (from a plan: shared with it, do not write) */
  concentrations: Float64Array;
  /** adaptive iterations performed (0 for the other weightings) */
  iterations: number;
  /** from a plan: warnings about this signal only (the plan's own are in plan.warnings); from multitaper(): both */
  warnings: string[];
}

export interface MultitaperPlan {
  /** samples per analysed signal */
  readonly length: number;
  readonly fftLength: number;
  readonly binCount: number;
  readonly frequencies: Float64Array;
  readonly taperCount: number;
  readonly concentrations: Float64Array;
  /** warnings that hold for every signal (taper concentrations) */
  readonly warnings: readonly string[];
  /** Multitaper PSD of `x` (length `length`); reuses the plan's tapers, FFT and scratch memory. */
  compute(x: Float64Array): MultitaperResult;
}

function checkOptions(length: number, options: MultitaperOptions): Required<MultitaperOptions> {
  if (!Number.isInteger(length) || length < 2) throw new RangeError(`length must be an integer ≥ 2, got ${length}`);
  requireOptions(options);
  const { samplingRate, timeBandwidth } = options;
  requireRate(samplingRate);
  if (!(timeBandwidth > 0) || !Number.isFinite(timeBandwidth)) throw new RangeError(`timeBandwidth must be a finite number > 0, got ${timeBandwidth}`);
  const taperCount = options.taperCount ?? defaultTaperCount(timeBandwidth);
  const weighting = options.weighting ?? 'adaptive';
  if (!TAPER_WEIGHTINGS.includes(weighting)) throw new TypeError(`weighting must be one of ${TAPER_WEIGHTINGS.join(', ')}, got ${String(weighting)}`);
  const fftLength = options.fftLength ?? length;
  requireFftLength(fftLength, length, 'the signal length');
  const detrend = options.detrend ?? 'mean';
  requireDetrend(detrend);
  const adaptiveTolerance = options.adaptiveTolerance ?? 1e-8;
  if (!(adaptiveTolerance > 0)) throw new RangeError(`adaptiveTolerance must be > 0, got ${adaptiveTolerance}`);
  const adaptiveMaxIterations = options.adaptiveMaxIterations ?? 100;
  if (!Number.isInteger(adaptiveMaxIterations) || adaptiveMaxIterations < 1) {
    throw new RangeError(`adaptiveMaxIterations must be an integer ≥ 1, got ${adaptiveMaxIterations}`);
  }
  return {
    samplingRate,
    timeBandwidth,
    taperCount,
    weighting,
    fftLength,
    detrend,
    adaptiveTolerance,
    adaptiveMaxIterations,
  };
}

class MultitaperPlanImpl implements MultitaperPlan {
  readonly length: number;
  readonly fftLength: number;
  readonly binCount: number;
  readonly frequencies: Float64Array;
  readonly taperCount: number;
  readonly concentrations: Float64Array;
  readonly warnings: readonly string[];
  private readonly settings: Required<MultitaperOptions>;
  private readonly tapers: Float64Array[];
  private readonly fft: ComplexFftPlan;
  private readonly scale: Float64Array;
  private readonly detrended: Float64Array;
  private readonly re: Float64Array;
  private readonly im: Float64Array;
  /** |Y_k(f)|², taper-major: eigen[k·binCount + b] */
  private readonly eigen: Float64Array;
  private readonly weights: Float64Array;

  constructor(length: number, options: MultitaperOptions) {
    this.settings = checkOptions(length, options);
    const { samplingRate, timeBandwidth, taperCount, fftLength } = this.settings;
    const { tapers, concentrations } = cachedDpss(length, timeBandwidth, taperCount);
    this.length = length;
    this.fftLength = fftLength;
    this.binCount = (fftLength >> 1) + 1;
    this.frequencies = binFrequencies(fftLength, samplingRate);
    this.taperCount = taperCount;
    this.tapers = tapers;
    this.concentrations = concentrations.slice();
    // The tapers have unit energy, so the Welch density factor applies with Σw² = 1.
    this.scale = oneSidedDensityScale(fftLength, samplingRate, 1);
    this.fft = complexFftPlan(fftLength);
    this.detrended = new Float64Array(length);
    this.re = new Float64Array(fftLength);
    this.im = new Float64Array(fftLength);
    this.eigen = new Float64Array(taperCount * this.binCount);
    this.weights = new Float64Array(taperCount);
    const warnings: string[] = [];
    concentrations.forEach((lambda, k) => {
      if (lambda < MIN_CONCENTRATION) {
        warnings.push(`taper ${k} has concentration ${lambda.toFixed(4)} < ${MIN_CONCENTRATION}: its broadband leakage is high; use fewer tapers or a larger timeBandwidth`);
      }
    });
    this.warnings = Object.freeze(warnings);
  }

  compute(x: Float64Array): MultitaperResult {
    requireSamples(x, this.length);
    const y = detrendInto(x, this.settings.detrend, this.detrended);
    this.eigenspectra(y);
    const bins = this.binCount;
    const psd = new Float64Array(bins);
    const dof = new Float64Array(bins);
    const warnings: string[] = [];
    let iterations = 0;
    switch (this.settings.weighting) {
      case 'equal':
        this.combine(psd, this.weights.fill(1));
        dof.fill(2 * this.taperCount);
        break;
      case 'eigenvalue':
        this.weights.set(this.concentrations);
        this.combine(psd, this.weights);
        dof.fill(weightedDegreesOfFreedom(this.concentrations));
        break;
      case 'adaptive':
        iterations = this.adaptive(y, psd, dof, warnings);
        break;
    }
    for (let b = 0; b < bins; b++) psd[b] = psd[b]! * this.scale[b]!;
    dof[0] = dof[0]! / 2;
    if (this.fftLength % 2 === 0) dof[bins - 1] = dof[bins - 1]! / 2;
    return { frequencies: this.frequencies, psd, degreesOfFreedom: dof, concentrations: this.concentrations, iterations, warnings };
  }

  /** Fills `eigen` with |DFT(h_k·y)|², two tapers per complex transform (real and imaginary parts). */
  private eigenspectra(y: Float64Array): void {
    const n = this.fftLength;
    const bins = this.binCount;
    const { re, im, eigen } = this;
    for (let k = 0; k < this.taperCount; k += 2) {
      const a = this.tapers[k]!;
      const b = k + 1 < this.taperCount ? this.tapers[k + 1]! : undefined;
      for (let t = 0; t < this.length; t++) {
        re[t] = a[t]! * y[t]!;
        im[t] = b === undefined ? 0 : b[t]! * y[t]!;
      }
      re.fill(0, this.length);
      im.fill(0, this.length);
      this.fft.transform(re, im);
      // Z = A + iB with A, B the transforms of real sequences: A_j = (Z_j + conj Z_{n−j})/2, B_j = (Z_j − conj Z_{n−j})/(2i).
      for (let j = 0; j < bins; j++) {
        const mirror = j === 0 ? 0 : n - j;
        const zr = re[j]!,
          zi = im[j]!,
          wr = re[mirror]!,
          wi = im[mirror]!;
        const ar = zr + wr,
          ai = zi - wi;
        eigen[k * bins + j] = 0.25 * (ar * ar + ai * ai);
        if (b !== undefined) {
          const br = zi + wi,
            bi = wr - zr;
          eigen[(k + 1) * bins + j] = 0.25 * (br * br + bi * bi);
        }
      }
    }
  }

  /** psd[b] = Σ_k w_k·eigen_k[b] / Σ_k w_k (raw |Y|² units). */
  private combine(psd: Float64Array, weights: Float64Array): void {
    const bins = this.binCount;
    let total = 0;
    for (let k = 0; k < this.taperCount; k++) total += weights[k]!;
    psd.fill(0);
    for (let k = 0; k < this.taperCount; k++) {
      const w = weights[k]! / total;
      const offset = k * bins;
      for (let b = 0; b < bins; b++) psd[b] = psd[b]! + w * this.eigen[offset + b]!;
    }
  }

  /**
   * Thomson's adaptive weights, in P&W's form: d_k = √λ_k·S/(λ_k·S + (1 − λ_k)·σ²),
   * S = Σ d_k²·Ŝ_k / Σ d_k², from S = (Ŝ_0 + Ŝ_1)/2, where σ² is the mean square of the
   * detrended signal (the broadband leakage bound). Works in raw |Y|² units, where white noise of
   * variance σ² has expected eigenspectra σ² (unit-energy tapers).
   */
  private adaptive(y: Float64Array, psd: Float64Array, dof: Float64Array, warnings: string[]): number {
    const K = this.taperCount;
    const bins = this.binCount;
    const { eigen, concentrations } = this;
    let variance = 0;
    for (let t = 0; t < y.length; t++) variance += y[t]! * y[t]!;
    variance /= y.length;
    if (K === 1 || variance === 0) {
      this.combine(psd, this.weights.fill(1));
      dof.fill(2 * K);
      return 0;
    }
    for (let b = 0; b < bins; b++) {
      let start = 0.5 * (eigen[b]! + eigen[bins + b]!);
      if (start === 0) {
        for (let k = 0; k < K; k++) start += eigen[k * bins + b]! / K;
      }
      psd[b] = start;
    }
    const { adaptiveTolerance, adaptiveMaxIterations } = this.settings;
    let iterations = 0;
    let change = Infinity;
    while (iterations < adaptiveMaxIterations) {
      change = 0;
      for (let b = 0; b < bins; b++) {
        const s = psd[b]!;
        let num = 0,
          den = 0,
          den2 = 0;
        for (let k = 0; k < K; k++) {
          const lambda = concentrations[k]!;
          const d = (Math.sqrt(lambda) * s) / (lambda * s + (1 - lambda) * variance);
          const d2 = d * d;
          num += d2 * eigen[k * bins + b]!;
          den += d2;
          den2 += d2 * d2;
        }
        const next = den > 0 ? num / den : 0;
        if (next > 0) change = Math.max(change, Math.abs(next - s) / next);
        psd[b] = next;
        dof[b] = den > 0 ? (2 * den * den) / den2 : 2 * K;
      }
      iterations++;
      if (change < adaptiveTolerance) break;
    }
    if (!(change < adaptiveTolerance)) {
      warnings.push(`adaptive weighting did not converge in ${adaptiveMaxIterations} iterations (largest relative change ${change.toExponential(2)} > tolerance ${adaptiveTolerance})`);
    }
    return iterations;
  }
}

/**
 * A reusable multitaper plan for signals of `length` samples: tapers (cached per length, NW, K),
 * FFT plan and scratch memory are set up once, so the per-signal cost is K·FFT plus the weighting.
 * Not re-entrant: use one plan per thread.
 *
 * @param length - samples per signal (≥ 2)
 * @param options - see {@link MultitaperOptions}
 * @returns the plan
 * @throws RangeError / TypeError naming the offending option
 * @see D. J. Thomson (1982), "Spectrum estimation and harmonic analysis", Proc. IEEE 70(9):1055–1096.
 */
export function createMultitaperPlan(length: number, options: MultitaperOptions): MultitaperPlan {
  return new MultitaperPlanImpl(length, options);
}

/**
 * Multitaper one-sided power spectral density.
 *
 * Each DPSS taper h_k gives an eigenspectrum Ŝ_k(f) = c_f·|Σ_t h_k[t]·y[t]·e^{−2πift}|², with y the
 * detrended signal and c_f the Welch one-sided density factor for a unit-energy window (2/fs inside,
 * 1/fs at DC and Nyquist), so that Σ_f S(f)·Δf equals the tapered mean square. The eigenspectra are
 * combined with equal weights, with weights λ_k, or with Thomson's adaptive weights. Concentrations
 * below {@link MIN_CONCENTRATION} produce a warning.
 *
 * @param x - samples (any unit); the PSD is in unit²/Hz
 * @param options - samplingRate (Hz), timeBandwidth (NW), taperCount (K), weighting, fftLength,
 *   detrend, adaptiveTolerance, adaptiveMaxIterations; see {@link MultitaperOptions} for defaults
 * @returns frequencies (Hz), psd, per-bin degreesOfFreedom, concentrations, iterations and warnings
 * @throws RangeError / TypeError naming the offending option
 * @see D. J. Thomson (1982), Proc. IEEE 70(9):1055–1096.
 * @see D. B. Percival & A. T. Walden (1993), Spectral Analysis for Physical Applications, ch. 7–8.
 */
export function multitaper(x: Float64Array, options: MultitaperOptions): MultitaperResult {
  const plan = new MultitaperPlanImpl(x.length, options);
  const result = plan.compute(x);
  return { ...result, frequencies: result.frequencies.slice(), concentrations: result.concentrations.slice(), warnings: [...plan.warnings, ...result.warnings] };
}
