/**
 * Mains (line) interference: narrow-band power at the line frequency and its harmonics against
 * the surrounding spectrum.
 */
import { binsInRange } from './centroid.js';

export interface LineNoiseOptions {
  /** mains frequency, Hz: 50 (Europe, most of Africa and Asia) or 60 (the Americas, parts of Japan) */
  lineFrequency: number;
  /** how many multiples to test, the fundamental included. @defaultValue 3 */
  harmonics?: number;
  /** half-width of the line band |f − h| ≤ halfWidth, Hz. @defaultValue 1 */
  halfWidth?: number;
  /** the neighbourhood is halfWidth < |f − h| ≤ halfWidth + neighborhoodWidth, Hz. @defaultValue 4 */
  neighborhoodWidth?: number;
}

export interface LineNoiseHarmonic {
  /** h·lineFrequency, Hz */
  frequency: number;
  /** mean PSD in the line band / mean PSD in the neighbourhood; 1 for a flat spectrum; null when undefined */
  ratio: number | null;
  /** 10·log10(ratio), dB */
  ratioDb: number | null;
  lineBins: number;
  neighborhoodBins: number;
}

export interface LineNoiseResult {
  lineFrequency: number;
  harmonics: LineNoiseHarmonic[];
  /** the fundamental's ratio */
  ratio: number | null;
  /** the largest ratio over the tested harmonics */
  maxRatio: number | null;
  warnings: string[];
}

function meanOver(frequencies: Float64Array, psd: Float64Array, centre: number, inner: number, outer: number): { mean: number; bins: number } {
  // binsInRange validated the spectrum once already; scan the window around the centre.
  let sum = 0,
    bins = 0;
  for (let k = 0; k < frequencies.length; k++) {
    const distance = Math.abs(frequencies[k]! - centre);
    if (inner < 0 ? distance <= outer : distance > inner && distance <= outer) {
      sum += psd[k]!;
      bins++;
    }
  }
  return { mean: bins > 0 ? sum / bins : NaN, bins };
}

/**
 * Line-noise ratio at the mains frequency and its harmonics: the mean PSD within ±halfWidth of
 * each harmonic divided by the mean PSD of the neighbourhood on both sides. Using mean densities
 * (rather than band powers) makes the ratio independent of the chosen widths for a smooth spectrum,
 * so 1 means no line. Harmonics whose neighbourhood passes the last bin are skipped with a warning.
 *
 * @param frequencies - bin frequencies, Hz
 * @param psd - one-sided PSD, unit²/Hz
 * @param options - lineFrequency (Hz), harmonics, halfWidth (Hz), neighborhoodWidth (Hz)
 * @defaultValue harmonics = 3, halfWidth = 1 Hz, neighborhoodWidth = 4 Hz
 * @returns one entry per tested harmonic, the fundamental's ratio, the largest ratio and warnings
 * @throws RangeError / TypeError for malformed input or options
 * @see common practice (mains at 50/60 Hz; the EDF+ specification's prefilter example "N:50Hz").
 */
export function lineNoiseRatio(frequencies: Float64Array, psd: Float64Array, options: LineNoiseOptions): LineNoiseResult {
  const { lineFrequency } = options;
  const harmonics = options.harmonics ?? 3;
  const halfWidth = options.halfWidth ?? 1;
  const neighborhoodWidth = options.neighborhoodWidth ?? 4;
  if (!(lineFrequency > 0) || !Number.isFinite(lineFrequency)) throw new RangeError(`lineFrequency must be a finite number > 0, got ${lineFrequency}`);
  if (!Number.isInteger(harmonics) || harmonics < 1) throw new RangeError(`harmonics must be an integer ≥ 1, got ${harmonics}`);
  if (!(halfWidth > 0)) throw new RangeError(`halfWidth must be > 0, got ${halfWidth}`);
  if (!(neighborhoodWidth > 0)) throw new RangeError(`neighborhoodWidth must be > 0, got ${neighborhoodWidth}`);
  const last = frequencies[frequencies.length - 1] ?? 0;
  binsInRange(frequencies, psd, [0, Math.max(last, 1)]);
  const warnings: string[] = [];
  const results: LineNoiseHarmonic[] = [];
  for (let h = 1; h <= harmonics; h++) {
    const centre = h * lineFrequency;
    if (centre + halfWidth + neighborhoodWidth > last) {
      warnings.push(`harmonic ${h} (${centre} Hz) and its neighbourhood reach past the last bin (${last} Hz): not tested`);
      break;
    }
    const line = meanOver(frequencies, psd, centre, -1, halfWidth);
    const around = meanOver(frequencies, psd, centre, halfWidth, halfWidth + neighborhoodWidth);
    let ratio: number | null = null;
    if (line.bins === 0 || around.bins === 0) {
      warnings.push(`harmonic ${h} (${centre} Hz): the line band or its neighbourhood holds no bin at this resolution`);
    } else if (!(around.mean > 0)) {
      warnings.push(`harmonic ${h} (${centre} Hz): no power in the neighbourhood, ratio undefined`);
    } else {
      ratio = line.mean / around.mean;
    }
    results.push({
      frequency: centre,
      ratio,
      ratioDb: ratio !== null && ratio > 0 ? 10 * Math.log10(ratio) : null,
      lineBins: line.bins,
      neighborhoodBins: around.bins,
    });
  }
  const ratios = results.map((r) => r.ratio).filter((r): r is number => r !== null);
  return {
    lineFrequency,
    harmonics: results,
    ratio: results[0]?.ratio ?? null,
    maxRatio: ratios.length > 0 ? Math.max(...ratios) : null,
    warnings,
  };
}
