/**
 * Spectral centroid, and the frequency-range selection shared by the spectral features.
 *
 * Ranges are closed, [low, high], like the total range of band power: a feature over a range uses
 * every bin with low ≤ f_k ≤ high.
 */

/** [low, high] in Hz. */
export type FrequencyRange = readonly [number, number];

/** Bins start..end−1 of a spectrum. */
export interface BinSpan {
  readonly start: number;
  readonly end: number;
}

/**
 * Validates a spectrum and a range and returns the bins with low ≤ f_k ≤ high.
 *
 * @param frequencies - bin frequencies in Hz, strictly increasing
 * @param psd - one value per bin (unit²/Hz)
 * @param range - [low, high] in Hz, low < high
 * @returns the span of bins inside the range (possibly empty)
 * @throws RangeError / TypeError naming the offending argument
 */
export function binsInRange(frequencies: Float64Array, psd: Float64Array, range: FrequencyRange): BinSpan {
  if (frequencies.length !== psd.length) {
    throw new RangeError(`psd must have one value per frequency (${frequencies.length}), got ${psd.length}`);
  }
  if (!Array.isArray(range) || range.length !== 2) throw new TypeError('range must be [low, high] in Hz');
  const [low, high] = range;
  if (!Number.isFinite(low) || !Number.isFinite(high) || !(low < high)) {
    throw new RangeError(`range must be finite with low < high, got [${low}, ${high}]`);
  }
  for (let k = 1; k < frequencies.length; k++) {
    if (!(frequencies[k]! > frequencies[k - 1]!)) throw new RangeError(`frequencies must be strictly increasing (bin ${k})`);
  }
  let start = 0;
  while (start < frequencies.length && frequencies[start]! < low) start++;
  let end = start;
  while (end < frequencies.length && frequencies[end]! <= high) end++;
  return { start, end };
}

export interface CentroidResult {
  /** Σ f_k·P_k / Σ P_k over the range, Hz; null when the range holds no power */
  frequency: number | null;
  warnings: string[];
}

/**
 * Spectral centroid (power-weighted mean frequency) over a closed range.
 *
 * @param frequencies - bin frequencies, Hz
 * @param psd - one-sided PSD, unit²/Hz
 * @param range - [low, high] in Hz
 * @returns the centroid in Hz, or null with a warning when the range is empty or holds no power
 * @throws RangeError / TypeError for malformed input
 * @see common practice (first spectral moment); e.g. Rampil (1998), Anesthesiology 89:980–1002 (citation from memory).
 */
export function spectralCentroid(frequencies: Float64Array, psd: Float64Array, range: FrequencyRange): CentroidResult {
  const { start, end } = binsInRange(frequencies, psd, range);
  let moment = 0;
  let total = 0;
  for (let k = start; k < end; k++) {
    moment += frequencies[k]! * psd[k]!;
    total += psd[k]!;
  }
  if (!(total > 0)) return { frequency: null, warnings: [`no power in [${range[0]}, ${range[1]}] Hz: centroid undefined`] };
  return { frequency: moment / total, warnings: [] };
}
