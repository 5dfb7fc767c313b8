/**
 * The shared core of every spectral estimator: one-sided bin frequencies, segmenting, detrending
 * and tapering a segment, splitting two real transforms that shared one complex FFT, and the
 * one-sided density scaling. Welch, multitaper, periodogram, spectrogram and coherence build on it,
 * as one private helper sits behind the public routines of a scientific library.
 *
 * Conventions follow scipy.signal (scaling='density'), so every estimator can be checked against it.
 */
import { requireInteger, requireRate, requireSegmenting } from './checks.js';
import { detrendInto, lineFit, type DetrendKind } from './detrend.js';
import { cachedDpss, defaultTaperCount } from './dpss.js';
import { makeWindow, WINDOW_NAMES, windowEnergy, type WindowName } from './windows.js';

/**
 * A segment filter refused every segment, so there is nothing to average. A type of its own so
 * that callers recognise the case without reading the wording.
 */
export class NoSegmentsLeftError extends RangeError {
  override readonly name = 'NoSegmentsLeftError';
  constructor(readonly total: number) {
    super(`acceptSegment rejected all ${total} segments: nothing to average`);
  }
}

/**
 * Frequencies of the one-sided DFT bins.
 *
 * @param fftLength - DFT length n, integer ≥ 1
 * @param samplingRate - Hz, finite and > 0
 * @returns f_k = k·samplingRate/n in Hz for k = 0..floor(n/2) (as scipy.fft.rfftfreq)
 * @throws RangeError for a bad `fftLength` or `samplingRate`
 */
export function binFrequencies(fftLength: number, samplingRate: number): Float64Array {
  requireInteger(fftLength, 'fftLength', 1);
  requireRate(samplingRate);
  const f = new Float64Array((fftLength >> 1) + 1);
  for (let k = 0; k < f.length; k++) f[k] = (k * samplingRate) / fftLength;
  return f;
}

/**
 * Number of whole segments in a record.
 *
 * @param length - samples in the record, integer ≥ 0
 * @param segmentSamples - samples per segment, integer ≥ 1
 * @param overlapSamples - integer in [0, segmentSamples)
 * @returns floor((length − overlap)/(segmentSamples − overlap)) when length ≥ segmentSamples, else 0;
 *   trailing samples that do not fill a segment are dropped, as scipy.signal.welch does
 * @throws RangeError for non-integer or out-of-range arguments
 */
export function segmentCount(length: number, segmentSamples: number, overlapSamples: number): number {
  requireInteger(length, 'length', 0);
  requireSegmenting(segmentSamples, overlapSamples);
  if (length < segmentSamples) return 0;
  return Math.floor((length - overlapSamples) / (segmentSamples - overlapSamples));
}

/**
 * Per-bin factor turning |X_k|² into a one-sided power spectral density.
 *
 * @param fftLength - DFT length n, integer ≥ 1
 * @param samplingRate - Hz, finite and > 0
 * @param windowEnergy - Σw² of the taper, finite and > 0 (1 for unit-energy DPSS tapers)
 * @returns for k = 0..floor(n/2): 2/(fs·Σw²) for 0 < k < n/2 and 1/(fs·Σw²) at DC and, for even n,
 *   at Nyquist; for odd n every k ≥ 1 is doubled (no Nyquist bin), as scipy.signal.welch
 * @throws RangeError for bad arguments
 * @see Welch (1967); scipy.signal.welch, scaling='density'
 */
export function oneSidedDensityScale(fftLength: number, samplingRate: number, windowEnergy: number): Float64Array {
  requireInteger(fftLength, 'fftLength', 1);
  requireRate(samplingRate);
  if (!Number.isFinite(windowEnergy) || windowEnergy <= 0) {
    throw new RangeError(`windowEnergy must be a finite number > 0, got ${windowEnergy}`);
  }
  const bins = (fftLength >> 1) + 1;
  const single = 1 / (samplingRate * windowEnergy);
  const scale = new Float64Array(bins).fill(2 * single);
  scale[0] = single;
  if (fftLength % 2 === 0) scale[bins - 1] = single;
  return scale;
}

/**
 * x[start..start+taper.length) detrended (over that window alone), multiplied by the taper and
 * zero-padded to target.length. `scratch` holds at least taper.length samples.
 */
export function taperSegment(x: Float64Array, start: number, taper: Float64Array, detrend: DetrendKind, scratch: Float64Array, target: Float64Array): void {
  const len = taper.length;
  const segment = detrendInto(x.subarray(start, start + len), detrend, scratch);
  for (let j = 0; j < len; j++) target[j] = segment[j]! * taper[j]!;
  target.fill(0, len);
}

/**
 * Detrends and tapers segment x[a..a+n) into `re` and x[b..b+n) into `im` (zeros when b < 0),
 * zero-padded to their length, n = window.length. Both segments share each loop, which halves the
 * loop overhead of Welch's hot path. `fit` is a scratch pair for the line fit.
 */
export function taperSegmentPair(x: Float64Array, a: number, b: number, window: Float64Array, detrend: DetrendKind, fit: Float64Array, re: Float64Array, im: Float64Array): void {
  const len = window.length;
  const w = window;
  const single = b < 0;
  const bb = single ? a : b;
  let meanA = 0,
    meanB = 0,
    slopeA = 0,
    slopeB = 0;
  if (detrend === 'mean') {
    let sumA = 0,
      sumB = 0;
    for (let j = 0; j < len; j++) {
      sumA += x[a + j]!;
      sumB += x[bb + j]!;
    }
    meanA = sumA / len;
    meanB = sumB / len;
  } else if (detrend === 'linear') {
    lineFit(x, a, len, fit);
    meanA = fit[0]!;
    slopeA = fit[1]!;
    lineFit(x, bb, len, fit);
    meanB = fit[0]!;
    slopeB = fit[1]!;
  }
  if (slopeA === 0 && slopeB === 0) {
    for (let j = 0; j < len; j++) {
      const wj = w[j]!;
      re[j] = (x[a + j]! - meanA) * wj;
      im[j] = (x[bb + j]! - meanB) * wj;
    }
  } else {
    const centre = (len - 1) / 2;
    for (let j = 0; j < len; j++) {
      const wj = w[j]!,
        t = j - centre;
      re[j] = (x[a + j]! - meanA - slopeA * t) * wj;
      im[j] = (x[bb + j]! - meanB - slopeB * t) * wj;
    }
  }
  re.fill(0, len);
  im.fill(0, single ? 0 : len);
}

/**
 * Complex one-sided spectra of two real sequences that were loaded as re (first) and im (second)
 * and transformed together: A_k = (Z_k + conj Z_{n−k})/2, B_k = (Z_k − conj Z_{n−k})/(2i).
 * Writes bins 0..bins−1 of A at a[aOffset…] and, when `b` is given, of B at b[bOffset…].
 */
export function splitRealPair(
  re: Float64Array,
  im: Float64Array,
  n: number,
  bins: number,
  a: { re: Float64Array; im: Float64Array },
  aOffset: number,
  b?: { re: Float64Array; im: Float64Array },
  bOffset = 0,
): void {
  for (let k = 0; k < bins; k++) {
    const m = k === 0 ? 0 : n - k;
    const zr = re[k]!,
      zi = im[k]!,
      yr = re[m]!,
      yi = im[m]!;
    a.re[aOffset + k] = 0.5 * (zr + yr);
    a.im[aOffset + k] = 0.5 * (zi - yi);
    if (b !== undefined) {
      b.re[bOffset + k] = 0.5 * (zi + yi);
      b.im[bOffset + k] = 0.5 * (yr - zr);
    }
  }
}

/** DPSS tapers for a multitaper spectrogram or cross-spectrum. */
export interface TaperSpec {
  /** NW over one window of segmentSamples; the half-bandwidth is NW·samplingRate/segmentSamples Hz */
  timeBandwidth: number;
  /** K. @defaultValue max(1, floor(2·NW) − 1) */
  taperCount?: number;
}

/** Tapers resolved from the options: a single window or K DPSS tapers, each with energy Σw². */
export interface ResolvedTapers {
  tapers: Float64Array[];
  /** Σw² of each taper (all equal: 1 for DPSS) */
  energy: number;
  concentrations: Float64Array;
}

/**
 * The window or DPSS tapers named by `window` / `tapers` for segments of `segmentSamples`.
 *
 * @throws TypeError for both or an unknown window; RangeError for a window of the wrong length or no energy
 */
export function resolveTapers(segmentSamples: number, window: WindowName | Float64Array | undefined, tukeyRatio: number | undefined, tapers: TaperSpec | undefined): ResolvedTapers {
  if (tapers !== undefined) {
    if (window !== undefined) throw new TypeError('give either window or tapers, not both');
    if (tapers === null || typeof tapers !== 'object') throw new TypeError('tapers must be an object { timeBandwidth, taperCount? }');
    const { timeBandwidth } = tapers;
    const count = tapers.taperCount ?? defaultTaperCount(timeBandwidth);
    const set = cachedDpss(segmentSamples, timeBandwidth, count);
    return { tapers: set.tapers, energy: 1, concentrations: set.concentrations.slice() };
  }
  let w: Float64Array;
  if (window instanceof Float64Array) {
    if (window.length !== segmentSamples) throw new RangeError(`window length must equal segmentSamples (${segmentSamples}), got ${window.length}`);
    w = window.slice();
  } else {
    const name = window ?? 'hann';
    if (!(WINDOW_NAMES as readonly string[]).includes(name)) throw new TypeError(`window must be one of ${WINDOW_NAMES.join(', ')} or a Float64Array, got ${String(name)}`);
    w = makeWindow(name, segmentSamples, tukeyRatio === undefined ? undefined : { tukeyRatio });
  }
  return { tapers: [w], energy: requireWindowEnergy(w), concentrations: new Float64Array(0) };
}

/** Σw² of a window, refused when it is not finite and positive (a window of zeros scales nothing). */
export function requireWindowEnergy(window: Float64Array): number {
  const energy = windowEnergy(window);
  if (!Number.isFinite(energy) || energy <= 0) throw new RangeError(`window must have finite, non-zero energy Σw², got ${energy}`);
  return energy;
}
