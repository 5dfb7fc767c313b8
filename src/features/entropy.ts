/**
 * Normalised spectral entropy.
 */
import { binsInRange, type FrequencyRange } from './centroid.js';

export interface SpectralEntropyResult {
  /** H in [0, 1]: 1 for a flat spectrum, 0 for a single line; null when undefined */
  value: number | null;
  /** N, the bins in the range */
  binCount: number;
  warnings: string[];
}

/**
 * Normalised Shannon entropy of the spectrum over a closed range: p_k = P_k/ΣP and
 * H = −Σ p_k·ln p_k / ln N (0·ln 0 = 0), N the number of bins in the range. The log base cancels.
 *
 * @param frequencies - bin frequencies, Hz
 * @param psd - one-sided PSD, unit²/Hz (non-negative)
 * @param range - [low, high] in Hz
 * @returns value in [0, 1], binCount and warnings; null with a warning for fewer than 2 bins or no power
 * @throws RangeError / TypeError for malformed input
 * @see T. Inouye et al. (1991), Electroencephalogr. Clin. Neurophysiol. 79:204–210 (citation from memory);
 *   C. E. Shannon (1948), Bell Syst. Tech. J. 27:379–423.
 */
export function spectralEntropy(frequencies: Float64Array, psd: Float64Array, range: FrequencyRange): SpectralEntropyResult {
  const { start, end } = binsInRange(frequencies, psd, range);
  const n = end - start;
  if (n < 2) return { value: null, binCount: n, warnings: [`spectral entropy needs at least 2 bins in [${range[0]}, ${range[1]}] Hz, got ${n}`] };
  let total = 0;
  for (let k = start; k < end; k++) {
    if (psd[k]! < 0) throw new RangeError(`psd must be non-negative, got ${psd[k]} at bin ${k}`);
    total += psd[k]!;
  }
  if (!(total > 0)) return { value: null, binCount: n, warnings: [`no power in [${range[0]}, ${range[1]}] Hz: spectral entropy undefined`] };
  let h = 0;
  for (let k = start; k < end; k++) {
    const p = psd[k]! / total;
    if (p > 0) h -= p * Math.log(p);
  }
  return { value: Math.min(1, Math.max(0, h / Math.log(n))), binCount: n, warnings: [] };
}
