/**
 * The power-law (1/f^β) background of a spectrum: a straight line in log10 power against log10 frequency.
 */
import { binsInRange, type FrequencyRange } from './centroid.js';

export interface PowerLawOptions {
  /** [low, high] in Hz; bins at f ≤ 0 are never used */
  range: FrequencyRange;
  /** down-weight peaks with Tukey's bisquare (IRLS); false gives ordinary least squares. @defaultValue true */
  robust?: boolean;
  /** IRLS iteration cap. @defaultValue 50 */
  maxIterations?: number;
}

export interface PowerLawFit {
  /** log10 PSD (log10 unit²/Hz) of the line at 1 Hz; null when the fit failed */
  intercept: number | null;
  /** d log10 PSD / d log10 f, i.e. −β for PSD ∝ f^−β; null when the fit failed */
  slope: number | null;
  /** 1 − SS_res/SS_tot of log10 PSD over every used bin (unweighted, so peaks lower it) */
  rSquared: number | null;
  /** root-mean-square residual over every used bin, in log10 units (decades) */
  residualRms: number | null;
  /** bins used: inside the range with f > 0 and PSD > 0 */
  binCount: number;
  /** fraction of used bins with a non-zero final robust weight (1 for ordinary least squares) */
  inlierFraction: number | null;
  warnings: string[];
}

// Bisquare tuning constant: 95 % Gaussian efficiency (common practice in robust regression).
const BISQUARE = 4.685;
// 1/Φ⁻¹(3/4): makes the median absolute residual a consistent scale for Gaussian residuals.
const MAD_SCALE = 1.482602218505602;
// With the scale at 1.4826·median|r|, every bin below the median residual keeps a weight, so at least
// half of the bins always count; a line resting on fewer than two thirds of them is reported.
const MIN_INLIER_FRACTION = 2 / 3;

function median(values: Float64Array): number {
  const sorted = values.slice().sort();
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
}

function weightedLine(x: Float64Array, y: Float64Array, w: Float64Array): { intercept: number; slope: number } | null {
  let sw = 0,
    sx = 0,
    sy = 0;
  for (let i = 0; i < x.length; i++) {
    sw += w[i]!;
    sx += w[i]! * x[i]!;
    sy += w[i]! * y[i]!;
  }
  if (!(sw > 0)) return null;
  const mx = sx / sw,
    my = sy / sw;
  let sxx = 0,
    sxy = 0;
  for (let i = 0; i < x.length; i++) {
    const dx = x[i]! - mx;
    sxx += w[i]! * dx * dx;
    sxy += w[i]! * dx * (y[i]! - my);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  return { intercept: my - slope * mx, slope };
}

const failed = (binCount: number, warnings: string[]): PowerLawFit => ({
  intercept: null,
  slope: null,
  rSquared: null,
  residualRms: null,
  binCount,
  inlierFraction: null,
  warnings,
});

/**
 * Fits log10 P(f) = intercept + slope·log10 f over a frequency range.
 *
 * With `robust` (the default) the line is found by iteratively reweighted least squares with
 * Tukey's bisquare weights on residuals scaled by 1.4826·MAD, so that oscillatory peaks (alpha,
 * beta, line noise) do not pull the line up. Goodness of fit is reported unweighted over all used bins.
 *
 * @param frequencies - bin frequencies, Hz
 * @param psd - one-sided PSD, unit²/Hz
 * @param options - range (Hz), robust, maxIterations
 * @returns intercept (log10 unit²/Hz at 1 Hz), slope (−β), rSquared, residualRms (decades), binCount,
 *   inlierFraction and warnings; nulls with a warning when fewer than 3 usable bins remain
 * @throws RangeError / TypeError for malformed input or options
 * @see P. W. Holland & R. E. Welsch (1977), "Robust regression using iteratively reweighted least-squares",
 *   Commun. Statist. A6:813–827 (citation from memory); 1/f fitting of log–log spectra is common practice.
 */
export function fitPowerLaw(frequencies: Float64Array, psd: Float64Array, options: PowerLawOptions): PowerLawFit {
  const { start, end } = binsInRange(frequencies, psd, options.range);
  const robust = options.robust ?? true;
  const maxIterations = options.maxIterations ?? 50;
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new RangeError(`maxIterations must be an integer ≥ 1, got ${maxIterations}`);
  const warnings: string[] = [];
  const xs: number[] = [];
  const ys: number[] = [];
  let skipped = 0;
  for (let k = start; k < end; k++) {
    const f = frequencies[k]!,
      p = psd[k]!;
    if (f > 0 && p > 0 && Number.isFinite(p)) {
      xs.push(Math.log10(f));
      ys.push(Math.log10(p));
    } else skipped++;
  }
  if (skipped > 0) warnings.push(`power-law fit skipped ${skipped} bin(s) with f ≤ 0 or non-positive power`);
  const n = xs.length;
  if (n < 3) return failed(n, [...warnings, `power-law fit needs at least 3 usable bins in [${options.range[0]}, ${options.range[1]}] Hz, got ${n}`]);
  const x = Float64Array.from(xs),
    y = Float64Array.from(ys);
  const w = new Float64Array(n).fill(1);
  let line = weightedLine(x, y, w)!;
  const residual = new Float64Array(n);
  let collapsed = false;
  if (robust) {
    for (let iteration = 0; iteration < maxIterations; iteration++) {
      for (let i = 0; i < n; i++) residual[i] = y[i]! - line.intercept - line.slope * x[i]!;
      // The scale is taken about zero, like the residuals the weights divide. Taken about the median
      // residual instead, a line lifted evenly by one peak (every other residual the same offset)
      // has a near-zero scale, and every bin, the offset ones included, was weighted to zero.
      // A floor keeps an exact power law (zero residuals) from turning rounding noise into outliers.
      const scale = Math.max(MAD_SCALE * median(residual.map(Math.abs)), 1e-9);
      let change = 0;
      for (let i = 0; i < n; i++) {
        const u = residual[i]! / (BISQUARE * scale);
        const weight = Math.abs(u) < 1 ? (1 - u * u) ** 2 : 0;
        change = Math.max(change, Math.abs(weight - w[i]!));
        w[i] = weight;
      }
      const next = weightedLine(x, y, w);
      if (next === null) {
        collapsed = true;
        break;
      }
      line = next;
      if (change < 1e-10) break;
    }
  }
  let meanY = 0;
  for (let i = 0; i < n; i++) meanY += y[i]! / n;
  let ssRes = 0,
    ssTot = 0,
    inliers = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i]! - line.intercept - line.slope * x[i]!;
    ssRes += r * r;
    ssTot += (y[i]! - meanY) ** 2;
    if (w[i]! > 0) inliers++;
  }
  if (collapsed) {
    warnings.push('the robust power-law fit weighted too few bins to draw a line; the line is the last one it could draw');
  } else if (robust && inliers < MIN_INLIER_FRACTION * n) {
    warnings.push(`the robust power-law fit kept only ${inliers} of ${n} bins (fewer than two thirds): the spectrum is far from a power law in [${options.range[0]}, ${options.range[1]}] Hz`);
  }
  return {
    intercept: line.intercept,
    slope: line.slope,
    rSquared: ssTot > 0 ? 1 - ssRes / ssTot : ssRes === 0 ? 1 : 0,
    residualRms: Math.sqrt(ssRes / n),
    binCount: n,
    inlierFraction: robust ? inliers / n : 1,
    warnings,
  };
}

/**
 * The fitted line at frequency f: intercept + slope·log10 f (log10 unit²/Hz).
 *
 * @param fit - a successful {@link fitPowerLaw} result
 * @param frequency - Hz, > 0
 * @returns log10 PSD of the background, or null when the fit failed
 */
export function powerLawLog10(fit: PowerLawFit, frequency: number): number | null {
  if (fit.intercept === null || fit.slope === null || !(frequency > 0)) return null;
  return fit.intercept + fit.slope * Math.log10(frequency);
}
