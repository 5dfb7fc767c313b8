/**
 * Cross-spectral connectivity between channel pairs: magnitude-squared coherence, the imaginary part
 * of coherency, and the phase-locking value across epochs, from Welch (one window) or multitaper
 * (DPSS) cross-spectra.
 *
 * For channels i, j with tapered segment spectra X_i, the cross-spectrum is S_ij = Σ X_i·conj(X_j)
 * over every segment, taper and epoch (Nolte et al. 2004's convention: Im S_ij > 0 when j lags i by
 * less than half a cycle). Then
 * - coherence (MSC): C_ij = |S_ij|²/(S_ii·S_jj), as scipy.signal.coherence;
 * - imaginary coherency: Im S_ij/√(S_ii·S_jj) (Nolte et al. 2004), in [−1, 1], blind to zero-lag mixing;
 * - phase-locking value: |(1/E)·Σ_e S_ij,e/|S_ij,e|| over E epochs, S_ij,e the cross-spectrum of epoch e
 *   alone (Lachaux et al. 1999, with the phase difference taken from each epoch's cross-spectrum).
 * Scale factors (density, one-sided doubling) cancel in all three and are not applied.
 */
import { welchDegreesOfFreedom } from './dof.js';
import { complexFftPlan } from './fft.js';
import { phaseConsistencyNull, type PhaseConsistencyNull } from './phase-consistency.js';
import { requireDetrend, requireRate } from './checks.js';
import type { SpectrogramOptions } from './spectrogram.js';
import { binFrequencies, resolveTapers, segmentCount, splitRealPair, taperSegment } from './spectral-core.js';

/** A frequency band, half-open: low ≤ f < high (Hz), as DESIGN.md's band power. */
export interface ConnectivityBand {
  name: string;
  low: number;
  high: number;
}

/**
 * The segment, window or taper and detrend settings are the spectrogram's (segments of each epoch;
 * `tapers` gives multitaper cross-spectra with equal taper weights), plus the pairs, bands and level.
 */
export interface ConnectivityOptions extends SpectrogramOptions {
  /** channel index pairs [i, j], i ≠ j. @defaultValue every pair i < j, in order */
  pairs?: readonly (readonly [number, number])[];
  /** bands to average over; each must hold at least one bin. @defaultValue none */
  bands?: readonly ConnectivityBand[];
  /** level of the reported coherence threshold. @defaultValue 0.05 */
  alpha?: number;
}

export interface ConnectivityBandResult extends ConnectivityBand {
  /** bins averaged (low ≤ f < high) */
  binCount: number;
  /** per pair: mean over the band's bins of the per-bin values */
  coherence: Float64Array;
  imaginaryCoherency: Float64Array;
  /** undefined with fewer than two epochs */
  phaseLocking: Float64Array | undefined;
}

export interface ConnectivityResult {
  method: 'welch' | 'multitaper';
  /** k·samplingRate/fftLength, k = 0..floor(fftLength/2), Hz */
  frequencies: Float64Array;
  pairs: [number, number][];
  /** per pair, per frequency */
  coherence: Float64Array[];
  imaginaryCoherency: Float64Array[];
  /** per pair, per frequency; undefined with fewer than two epochs */
  phaseLocking: Float64Array[] | undefined;
  bands: ConnectivityBandResult[];
  epochCount: number;
  /** segments per epoch × epochs */
  segmentCount: number;
  taperCount: number;
  /**
   * n, the number of independent segment spectra the averages are worth: without overlap exactly
   * segments × tapers; with overlap (Welch) epochs·ν/2 with ν Welch's equivalent degrees of freedom
   * (Percival & Walden 292b; for multitaper the overlap factor of taper 0 is applied to every taper)
   */
  effectiveSegments: number;
  /** E[Ĉ] ≈ 1/n under independence (Carter et al. 1973; exact for non-overlapped segments of Gaussian data) */
  coherenceBias: number;
  /** 1 − α^{1/(n−1)}: the level-α threshold of Ĉ under independence (Carter 1987) */
  coherenceThreshold: number;
  alpha: number;
  /** the phase-locking value's expectation under no locking, over epochs; undefined with one epoch */
  phaseLockingNull: PhaseConsistencyNull | undefined;
  /**
   * channels that vanish in every analysed segment (constant with detrend mean or linear, zero with
   * none): their pairs' values are 0/0 and come out NaN, never rounding noise
   */
  flatChannels: number[];
}

/**
 * Whether the detrended segment is exactly zero in exact arithmetic: constant samples with a mean or
 * linear detrend, zeros without one. Such a segment's spectrum is set to exact zeros, because the
 * paired real FFT would otherwise lend it rounding noise from its partner channel.
 */
function segmentVanishes(x: Float64Array, start: number, length: number, detrend: string): boolean {
  const first = detrend === 'none' ? 0 : x[start]!;
  for (let t = start; t < start + length; t++) if (x[t] !== first) return false;
  return true;
}

function checkEpochs(epochs: readonly (readonly Float64Array[])[]): { channels: number; length: number } {
  if (!Array.isArray(epochs) || epochs.length === 0) throw new RangeError('epochs must hold at least one epoch of channels');
  const first = epochs[0]!;
  if (!Array.isArray(first) || first.length < 2) throw new RangeError('each epoch must hold at least two channels');
  const channels = first.length;
  const length = first[0]!.length;
  epochs.forEach((epoch, e) => {
    if (!Array.isArray(epoch) || epoch.length !== channels) throw new RangeError(`epochs[${e}] must hold ${channels} channels`);
    epoch.forEach((x, c) => {
      if (!(x instanceof Float64Array) || x.length !== length) throw new RangeError(`epochs[${e}][${c}] must be a Float64Array of ${length} samples`);
    });
  });
  return { channels, length };
}

function resolvePairs(pairs: ConnectivityOptions['pairs'], channels: number): [number, number][] {
  if (pairs === undefined) {
    const all: [number, number][] = [];
    for (let i = 0; i < channels; i++) for (let j = i + 1; j < channels; j++) all.push([i, j]);
    return all;
  }
  if (!Array.isArray(pairs) || pairs.length === 0) throw new RangeError('pairs must be a non-empty list of [i, j]');
  return pairs.map(([i, j], p) => {
    if (!Number.isInteger(i) || !Number.isInteger(j) || i < 0 || j < 0 || i >= channels || j >= channels || i === j) {
      throw new RangeError(`pairs[${p}] must be two different channel indices in [0, ${channels}), got [${i}, ${j}]`);
    }
    return [i, j];
  });
}

function zeroSpectrum(spectra: { re: Float64Array; im: Float64Array }, channel: number, bins: number): void {
  spectra.re.fill(0, channel * bins, (channel + 1) * bins);
  spectra.im.fill(0, channel * bins, (channel + 1) * bins);
}

/** Mean of each pair's per-bin values over low ≤ f < high; NaN when a bin's value is undefined. */
function bandMeans(values: Float64Array[], first: number, end: number): Float64Array {
  return Float64Array.from(values, (v) => {
    let sum = 0;
    for (let k = first; k < end; k++) sum += v[k]!;
    return sum / (end - first);
  });
}

/**
 * Coherence, imaginary coherency and phase-locking value between channel pairs.
 *
 * Every epoch is cut into segments (segmentSamples, overlapSamples), each detrended, tapered (a
 * window, or K DPSS tapers) and transformed; cross- and auto-spectra are summed over segments, tapers
 * and epochs. Memory is per pair and frequency, not per segment, so long recordings stream.
 *
 * @param epochs - epoch × channel samples (one epoch for a continuous recording), all of one length
 * @param options - see {@link ConnectivityOptions}
 * @defaultValue window 'hann', detrend 'mean', fftLength = segmentSamples, all pairs, alpha 0.05
 * @returns frequencies (Hz), pairs, per-pair coherence, imaginaryCoherency and phaseLocking per
 *   frequency and per band, counts (epochs, segments, tapers, effective segments), the coherence bias
 *   and threshold under independence, and the phase-locking null expectation
 * @throws RangeError / TypeError naming the offending input or option
 * @see G. C. Carter, C. H. Knapp & A. H. Nuttall (1973), IEEE Trans. Audio Electroacoust. AU-21(4):337–344;
 *   G. Nolte et al. (2004), Clin. Neurophysiol. 115:2292–2307; J.-P. Lachaux et al. (1999), Hum. Brain
 *   Mapp. 8:194–208; scipy.signal.coherence
 */
export function crossSpectralConnectivity(epochs: readonly (readonly Float64Array[])[], options: ConnectivityOptions): ConnectivityResult {
  if (options === null || typeof options !== 'object') throw new TypeError('options must be an object');
  const { channels, length } = checkEpochs(epochs);
  const { samplingRate, segmentSamples, overlapSamples } = options;
  requireRate(samplingRate);
  const perEpoch = segmentCount(length, segmentSamples, overlapSamples);
  if (perEpoch === 0) throw new RangeError(`segmentSamples (${segmentSamples}) must not exceed the epoch length (${length})`);
  const fftLength = options.fftLength ?? segmentSamples;
  if (!Number.isInteger(fftLength) || fftLength < segmentSamples) throw new RangeError(`fftLength must be an integer ≥ segmentSamples (${segmentSamples}), got ${fftLength}`);
  const detrend = options.detrend ?? 'mean';
  requireDetrend(detrend);
  const alpha = options.alpha ?? 0.05;
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`alpha must be in (0, 1), got ${alpha}`);
  const { tapers } = resolveTapers(segmentSamples, options.window, options.tukeyRatio, options.tapers);
  const pairs = resolvePairs(options.pairs, channels);
  const frequencies = binFrequencies(fftLength, samplingRate);
  const bins = frequencies.length;
  const bands = (options.bands ?? []).map((band, b) => {
    if (!(band.low < band.high)) throw new RangeError(`bands[${b}].low must be < high, got ${band.low} and ${band.high}`);
    let first = bins,
      end = 0;
    for (let k = 0; k < bins; k++)
      if (frequencies[k]! >= band.low && frequencies[k]! < band.high) {
        first = Math.min(first, k);
        end = k + 1;
      }
    if (end <= first) throw new RangeError(`bands[${b}] (${band.name}: ${band.low}–${band.high} Hz) holds no frequency bin; the resolution is ${samplingRate / fftLength} Hz`);
    return { band, first, end };
  });

  const P = pairs.length,
    E = epochs.length,
    K = tapers.length;
  const fft = complexFftPlan(fftLength);
  const re = new Float64Array(fftLength),
    im = new Float64Array(fftLength),
    scratch = new Float64Array(segmentSamples);
  // spectra of every channel for one (segment, taper): channel-major [c·bins + k]
  const spectra = { re: new Float64Array(channels * bins), im: new Float64Array(channels * bins) };
  const auto = new Float64Array(channels * bins);
  const crossRe = new Float64Array(P * bins),
    crossIm = new Float64Array(P * bins);
  const epochRe = new Float64Array(P * bins),
    epochIm = new Float64Array(P * bins);
  const lockRe = new Float64Array(P * bins),
    lockIm = new Float64Array(P * bins),
    lockCount = new Float64Array(P * bins);
  const step = segmentSamples - overlapSamples;
  const vanishes = new Uint8Array(channels),
    live = new Uint8Array(channels);

  for (const epoch of epochs) {
    epochRe.fill(0);
    epochIm.fill(0);
    for (let s = 0; s < perEpoch; s++) {
      for (let c = 0; c < channels; c++) {
        vanishes[c] = segmentVanishes(epoch[c]!, s * step, segmentSamples, detrend) ? 1 : 0;
        if (!vanishes[c]) live[c] = 1;
      }
      for (const taper of tapers) {
        for (let c = 0; c < channels; c += 2) {
          taperSegment(epoch[c]!, s * step, taper, detrend, scratch, re);
          const paired = c + 1 < channels;
          if (paired) taperSegment(epoch[c + 1]!, s * step, taper, detrend, scratch, im);
          else im.fill(0);
          fft.transform(re, im);
          splitRealPair(re, im, fftLength, bins, spectra, c * bins, paired ? spectra : undefined, (c + 1) * bins);
          if (vanishes[c]) zeroSpectrum(spectra, c, bins);
          if (paired && vanishes[c + 1]) zeroSpectrum(spectra, c + 1, bins);
        }
        for (let i = 0; i < channels * bins; i++) auto[i] = auto[i]! + spectra.re[i]! ** 2 + spectra.im[i]! ** 2;
        pairs.forEach(([a, b], p) => {
          for (let k = 0; k < bins; k++) {
            const ar = spectra.re[a * bins + k]!,
              ai = spectra.im[a * bins + k]!;
            const br = spectra.re[b * bins + k]!,
              bi = spectra.im[b * bins + k]!;
            // X_a·conj(X_b)
            epochRe[p * bins + k] = epochRe[p * bins + k]! + ar * br + ai * bi;
            epochIm[p * bins + k] = epochIm[p * bins + k]! + ai * br - ar * bi;
          }
        });
      }
    }
    for (let i = 0; i < P * bins; i++) {
      crossRe[i] = crossRe[i]! + epochRe[i]!;
      crossIm[i] = crossIm[i]! + epochIm[i]!;
      const magnitude = Math.hypot(epochRe[i]!, epochIm[i]!);
      // An epoch whose cross-spectrum vanishes (a flat channel) has no phase: it is left out.
      if (magnitude > 0) {
        lockRe[i] = lockRe[i]! + epochRe[i]! / magnitude;
        lockIm[i] = lockIm[i]! + epochIm[i]! / magnitude;
        lockCount[i] = lockCount[i]! + 1;
      }
    }
  }

  const coherence: Float64Array[] = [],
    imaginaryCoherency: Float64Array[] = [],
    locking: Float64Array[] = [];
  pairs.forEach(([a, b], p) => {
    const c = new Float64Array(bins),
      ic = new Float64Array(bins),
      plv = new Float64Array(bins);
    for (let k = 0; k < bins; k++) {
      const i = p * bins + k;
      const denominator = auto[a * bins + k]! * auto[b * bins + k]!;
      c[k] = (crossRe[i]! ** 2 + crossIm[i]! ** 2) / denominator;
      ic[k] = crossIm[i]! / Math.sqrt(denominator);
      plv[k] = lockCount[i]! > 0 ? Math.hypot(lockRe[i]!, lockIm[i]!) / lockCount[i]! : Number.NaN;
    }
    coherence.push(c);
    imaginaryCoherency.push(ic);
    locking.push(plv);
  });
  const phaseLocking = E >= 2 ? locking : undefined;

  const overlapFactor = overlapSamples === 0 ? 1 : welchDegreesOfFreedom(tapers[0]!, overlapSamples, perEpoch) / (2 * perEpoch);
  const effectiveSegments = E * perEpoch * K * overlapFactor;
  return {
    method: options.tapers === undefined ? 'welch' : 'multitaper',
    frequencies,
    pairs,
    coherence,
    imaginaryCoherency,
    phaseLocking,
    bands: bands.map(({ band, first, end }) => ({
      name: band.name,
      low: band.low,
      high: band.high,
      binCount: end - first,
      coherence: bandMeans(coherence, first, end),
      imaginaryCoherency: bandMeans(imaginaryCoherency, first, end),
      phaseLocking: phaseLocking === undefined ? undefined : bandMeans(phaseLocking, first, end),
    })),
    epochCount: E,
    segmentCount: E * perEpoch,
    taperCount: K,
    effectiveSegments,
    coherenceBias: 1 / effectiveSegments,
    coherenceThreshold: effectiveSegments > 1 ? 1 - Math.pow(alpha, 1 / (effectiveSegments - 1)) : 1,
    alpha,
    phaseLockingNull: E >= 2 ? phaseConsistencyNull(E) : undefined,
    flatChannels: Array.from(live.keys()).filter((c) => !live[c]),
  };
}
