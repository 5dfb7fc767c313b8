/**
 * Periodic (DFT-even) data windows and their figures of merit.
 *
 * Reference: F. J. Harris (1978), "On the use of windows for harmonic analysis with the discrete
 * Fourier transform", Proc. IEEE 66(1):51–83. The values match scipy.signal.get_window(name, length,
 * fftbins=True).
 */

export const WINDOW_NAMES = ['rectangular', 'hann', 'hamming', 'blackman', 'blackman-harris', 'flat-top', 'tukey'] as const;
export type WindowName = (typeof WINDOW_NAMES)[number];

export interface WindowOptions {
  /** Tukey window: fraction of the window inside the cosine tapers, 0 (rectangular) … 1 (Hann). @defaultValue 0.5 */
  tukeyRatio?: number;
}

export interface WindowFigures {
  /** Σw/N (Harris: coherent gain) */
  coherentGain: number;
  /** equivalent noise bandwidth N·Σw²/(Σw)², in bins */
  noiseBandwidthBins: number;
  /** −20·log10(|W(½ bin)|/W(0)), in dB */
  scallopLossDb: number;
  /** Σw² */
  energy: number;
  /** Σw */
  sum: number;
}

/**
 * Coefficients a_k of w[n] = Σ_k (−1)^k·a_k·cos(2πkn/N). Hann, Hamming, Blackman and the 4-term
 * Blackman–Harris are Harris (1978); the flat-top is the 5-term one scipy.signal.windows.flattop uses.
 */
const COSINE_SUMS: Readonly<Record<Exclude<WindowName, 'tukey'>, readonly number[]>> = {
  rectangular: [1],
  hann: [0.5, 0.5],
  hamming: [0.54, 0.46],
  blackman: [0.42, 0.5, 0.08],
  'blackman-harris': [0.35875, 0.48829, 0.14128, 0.01168],
  'flat-top': [0.21557895, 0.41663158, 0.277263158, 0.083578947, 0.006947368],
};

const CACHE_LIMIT = 64;
const cache = new Map<string, Float64Array>();

function cosineSum(coefficients: readonly number[], length: number): Float64Array {
  const w = new Float64Array(length);
  for (let n = 0; n < length; n++) {
    let value = 0;
    for (let k = 0; k < coefficients.length; k++) {
      // cos is even: folding k·n mod N into [0, N/2] makes w[n] = w[N−n] hold to the last bit
      const r = (k * n) % length;
      const angle = (2 * Math.PI * Math.min(r, length - r)) / length;
      value += (k % 2 === 0 ? 1 : -1) * coefficients[k]! * Math.cos(angle);
    }
    w[n] = value;
  }
  return w;
}

/** Periodic Tukey: the symmetric one of length+1, last sample dropped (as scipy with sym=False). */
function tukey(length: number, ratio: number): Float64Array {
  if (ratio <= 0) return new Float64Array(length).fill(1);
  if (ratio >= 1) return cosineSum(COSINE_SUMS.hann, length);
  const m = length + 1;
  const width = Math.floor((ratio * (m - 1)) / 2);
  const w = new Float64Array(length);
  for (let n = 0; n < length; n++) {
    if (n <= width) {
      w[n] = 0.5 * (1 + Math.cos(Math.PI * (-1 + (2 * n) / ratio / (m - 1))));
    } else if (n >= m - width - 1) {
      w[n] = 0.5 * (1 + Math.cos(Math.PI * (-2 / ratio + 1 + (2 * n) / ratio / (m - 1))));
    } else {
      w[n] = 1;
    }
  }
  return w;
}

/**
 * A periodic (DFT-even) window, as scipy.signal.get_window(name, length, fftbins=True).
 *
 * @param name - one of {@link WINDOW_NAMES}
 * @param length - number of samples N ≥ 1
 * @param options - `tukeyRatio` for the Tukey window (fraction in [0, 1]); @defaultValue `{ tukeyRatio: 0.5 }`
 * @returns a fresh copy of a cached window, so callers may modify it without harming others
 * @throws TypeError when `name` is not a window name
 * @throws RangeError when `length` is not an integer ≥ 1 or `tukeyRatio` is outside [0, 1]
 * @see Harris (1978), Proc. IEEE 66(1):51–83
 */
export function makeWindow(name: WindowName, length: number, options?: WindowOptions): Float64Array {
  if (!(WINDOW_NAMES as readonly string[]).includes(name)) {
    throw new TypeError(`window name must be one of ${WINDOW_NAMES.join(', ')}, got ${String(name)}`);
  }
  if (!Number.isInteger(length) || length < 1) {
    throw new RangeError(`window length must be an integer ≥ 1, got ${length}`);
  }
  const ratio = options?.tukeyRatio ?? 0.5;
  if (name === 'tukey' && !(Number.isFinite(ratio) && ratio >= 0 && ratio <= 1)) {
    throw new RangeError(`tukeyRatio must be within [0, 1], got ${ratio}`);
  }
  const key = name === 'tukey' ? `${name}:${length}:${ratio}` : `${name}:${length}`;
  let w = cache.get(key);
  if (w === undefined) {
    // scipy returns all ones for a single sample, whatever the window.
    if (length === 1) w = new Float64Array([1]);
    else w = name === 'tukey' ? tukey(length, ratio) : cosineSum(COSINE_SUMS[name], length);
    if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value!);
    cache.set(key, w);
  }
  return w.slice();
}

/**
 * Figures of merit of a window (Harris 1978, Table I definitions).
 *
 * @param window - the window samples w[0..N−1]; N ≥ 1 and Σw ≠ 0
 * @returns coherent gain Σw/N, equivalent noise bandwidth N·Σw²/(Σw)² in bins, scallop loss
 *   −20·log10(|Σ w[n]·e^{−iπn/N}| / Σw) in dB, energy Σw² and sum Σw
 * @throws RangeError when the window is empty or sums to zero
 * @see Harris (1978), Proc. IEEE 66(1):51–83
 */
/** Σw², the energy that density scaling divides by (summed in index order, the same everywhere). */
export function windowEnergy(window: ArrayLike<number>): number {
  let energy = 0;
  for (let i = 0; i < window.length; i++) energy += window[i]! * window[i]!;
  return energy;
}

export function windowFigures(window: Float64Array): WindowFigures {
  const n = window.length;
  if (n < 1) throw new RangeError('window must have at least one sample');
  let sum = 0,
    energy = 0,
    halfRe = 0,
    halfIm = 0;
  for (let i = 0; i < n; i++) {
    const w = window[i]!;
    sum += w;
    energy += w * w;
    const angle = (-Math.PI * i) / n;
    halfRe += w * Math.cos(angle);
    halfIm += w * Math.sin(angle);
  }
  if (sum === 0 || !Number.isFinite(sum)) throw new RangeError(`window must have a finite non-zero sum, got ${sum}`);
  return {
    coherentGain: sum / n,
    noiseBandwidthBins: (n * energy) / (sum * sum),
    scallopLossDb: -20 * Math.log10(Math.hypot(halfRe, halfIm) / Math.abs(sum)),
    energy,
    sum,
  };
}
