/**
 * Spectral edge frequencies (SEF): the frequency below which a given percentage of the power in a range lies.
 */
import { binsInRange, type FrequencyRange } from './centroid.js';

export interface SpectralEdgeOptions {
  /** [low, high] in Hz */
  range: FrequencyRange;
  /** percentages in [0, 100]. @defaultValue [50, 95] */
  percentiles?: readonly number[];
}

export interface SpectralEdge {
  percentile: number;
  /** Hz; null when the range holds no power */
  frequency: number | null;
}

export interface SpectralEdgeResult {
  edges: SpectralEdge[];
  /** trapezoid integral of the PSD over the range's bins, unit² */
  totalPower: number;
  warnings: string[];
}

/**
 * Spectral edge frequencies over a closed range.
 *
 * Rule: the cumulative power C_j is the trapezoid integral of the PSD from the first bin in the
 * range to bin j (C at the first bin is 0); SEF_x is found by linear interpolation of frequency
 * against C at C = (x/100)·C_last, taking the first crossing where C is flat. Only bins inside
 * [low, high] enter: the range edges are not interpolated. With this rule a flat PSD on
 * [0, 50] Hz gives SEF95 = 47.5 Hz exactly, and PSD ∝ 1/f on [1, 40] Hz tends to 40^0.95 as the
 * bins get finer.
 *
 * @param frequencies - bin frequencies, Hz
 * @param psd - one-sided PSD, unit²/Hz
 * @param options - range (Hz), percentiles
 * @defaultValue percentiles = [50, 95]
 * @returns one edge per percentile (Hz), the total power (unit²) and warnings
 * @throws RangeError / TypeError for malformed input or percentiles outside [0, 100]
 * @see I. J. Rampil (1998), "A primer for EEG signal processing in anesthesia", Anesthesiology 89:980–1002 (citation from memory).
 */
export function spectralEdge(frequencies: Float64Array, psd: Float64Array, options: SpectralEdgeOptions): SpectralEdgeResult {
  const percentiles = options.percentiles ?? [50, 95];
  for (const p of percentiles) {
    if (!(p >= 0 && p <= 100)) throw new RangeError(`percentiles must lie in [0, 100], got ${p}`);
  }
  const { start, end } = binsInRange(frequencies, psd, options.range);
  const cumulative = new Float64Array(Math.max(end - start, 0));
  for (let k = start + 1; k < end; k++) {
    const j = k - start;
    cumulative[j] = cumulative[j - 1]! + 0.5 * (psd[k]! + psd[k - 1]!) * (frequencies[k]! - frequencies[k - 1]!);
  }
  const total = cumulative.length > 0 ? cumulative[cumulative.length - 1]! : 0;
  if (!(total > 0)) {
    return {
      edges: percentiles.map((percentile) => ({ percentile, frequency: null })),
      totalPower: 0,
      warnings: [`no power in [${options.range[0]}, ${options.range[1]}] Hz (${end - start} bins): spectral edge undefined`],
    };
  }
  const edges = percentiles.map((percentile) => {
    const target = (percentile / 100) * total;
    let j = 0;
    while (j < cumulative.length - 1 && cumulative[j]! < target) j++;
    if (j === 0) return { percentile, frequency: frequencies[start]! };
    const c0 = cumulative[j - 1]!,
      c1 = cumulative[j]!;
    const f0 = frequencies[start + j - 1]!,
      f1 = frequencies[start + j]!;
    return { percentile, frequency: f0 + ((target - c0) / (c1 - c0)) * (f1 - f0) };
  });
  return { edges, totalPower: total, warnings: [] };
}
