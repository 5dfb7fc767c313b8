/**
 * Peak frequency of an oscillation standing above the power-law background.
 */
import { fitPowerLaw, powerLawLog10, type PowerLawFit } from './power-law.js';
import { binsInRange, type FrequencyRange } from './centroid.js';

export interface PeakOptions {
  /** [low, high] in Hz searched for a local maximum */
  range: FrequencyRange;
  /** range of the robust power-law fit. @defaultValue [low/2, 2·high], clipped to the spectrum's positive frequencies */
  backgroundRange?: FrequencyRange;
  /** a background fitted elsewhere; overrides backgroundRange */
  background?: PowerLawFit;
  /** smallest height above the background that counts as a peak, dB. @defaultValue 3 */
  minHeightDb?: number;
}

export interface PeakResult {
  /** interpolated peak frequency, Hz; null when no peak stands above the background */
  frequency: number | null;
  /** interpolated PSD at the peak, unit²/Hz */
  power: number | null;
  /** 10·log10(peak PSD / background PSD) at the peak bin, dB */
  heightDb: number | null;
  /** the background used (for the record) */
  background: PowerLawFit;
  warnings: string[];
}

/**
 * Finds the local maximum in `range` that stands highest above the power-law background and
 * refines it by fitting a parabola through the natural log of the peak bin and its two neighbours:
 * δ = ½·(y₋ − y₊)/(y₋ − 2y₀ + y₊) bins, ln P̂ = y₀ − ¼·(y₋ − y₊)·δ. The neighbours may lie just
 * outside the range. A Gaussian-shaped peak (a parabola in ln P) is recovered exactly.
 *
 * @param frequencies - bin frequencies, Hz, evenly spaced
 * @param psd - one-sided PSD, unit²/Hz
 * @param options - range, backgroundRange, background, minHeightDb
 * @defaultValue minHeightDb = 3
 * @returns frequency (Hz), power (unit²/Hz), heightDb, the background fit and warnings; nulls with a
 *   warning when the range has no local maximum or none is minHeightDb above the background
 * @throws RangeError / TypeError for malformed input or options
 * @see J. O. Smith & X. Serra (1987), "PARSHL", Proc. ICMC, quadratic interpolation of spectral peaks
 *   (citation from memory); peak picking above a fitted 1/f background is common practice.
 */
export function peakFrequency(frequencies: Float64Array, psd: Float64Array, options: PeakOptions): PeakResult {
  const { start, end } = binsInRange(frequencies, psd, options.range);
  const minHeightDb = options.minHeightDb ?? 3;
  if (!Number.isFinite(minHeightDb)) throw new RangeError(`minHeightDb must be finite, got ${minHeightDb}`);
  const [low, high] = options.range;
  const background =
    options.background ??
    fitPowerLaw(frequencies, psd, {
      range: options.backgroundRange ?? [Math.max(low / 2, frequencies.find((f) => f > 0) ?? low), Math.min(2 * high, frequencies[frequencies.length - 1] ?? high)],
    });
  const warnings = [...background.warnings];
  const none = (message: string): PeakResult => ({ frequency: null, power: null, heightDb: null, background, warnings: [...warnings, message] });
  if (background.intercept === null) return none(`no power-law background to compare a peak in [${low}, ${high}] Hz against`);

  let best = -1;
  let bestHeight = -Infinity;
  for (let k = Math.max(start, 1); k < Math.min(end, psd.length - 1); k++) {
    const p = psd[k]!;
    if (!(p > psd[k - 1]! && p >= psd[k + 1]!) || !(psd[k - 1]! > 0 && psd[k + 1]! > 0)) continue;
    const height = 10 * (Math.log10(p) - powerLawLog10(background, frequencies[k]!)!);
    if (height > bestHeight) {
      bestHeight = height;
      best = k;
    }
  }
  if (best < 0) return none(`no local maximum in [${low}, ${high}] Hz`);
  if (bestHeight < minHeightDb) {
    return none(`no peak in [${low}, ${high}] Hz stands ${minHeightDb} dB above the power-law background (highest ${bestHeight.toFixed(2)} dB)`);
  }
  const left = Math.log(psd[best - 1]!),
    centre = Math.log(psd[best]!),
    right = Math.log(psd[best + 1]!);
  const curvature = left - 2 * centre + right;
  const offset = curvature < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (left - right)) / curvature)) : 0;
  const binWidth = frequencies[best + 1]! - frequencies[best]!;
  return {
    frequency: frequencies[best]! + offset * binWidth,
    power: Math.exp(centre - 0.25 * (left - right) * offset),
    heightDb: bestHeight,
    background,
    warnings,
  };
}
