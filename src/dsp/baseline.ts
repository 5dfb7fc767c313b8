/**
 * Baseline normalisation of time–frequency power over trials.
 *
 * Power maps are row-major [time][frequency] (as the spectrogram and Morlet modules give them). For
 * each frequency f the baseline statistics are taken over the baseline times: B(f) = mean of P(t, f),
 * and for `zscore` also the sample standard deviation s(f) (n − 1 denominator). Modes (common practice):
 * - `decibel`: 10·log10(P/B)
 * - `percent`: 100·(P − B)/B
 * - `ratio`: P/B
 * - `zscore`: (P − B)/s
 * The trial-averaged output normalises the mean over trials by the baseline of that mean; per-trial
 * output normalises each trial by its own baseline.
 */

export const BASELINE_MODES = ['decibel', 'percent', 'ratio', 'zscore'] as const;
export type BaselineMode = (typeof BASELINE_MODES)[number];

/** Baseline as sample indices of the time axis, half-open: startSample ≤ i < endSample. */
export interface BaselineSampleWindow {
  startSample: number;
  endSample: number;
}

/** Baseline as a closed time range against the time vector: startTime ≤ times[i] ≤ endTime (s). */
export interface BaselineTimeWindow {
  startTime: number;
  endTime: number;
  /** ascending, one per time row, s */
  times: ArrayLike<number>;
}

export interface BaselineOptions {
  mode: BaselineMode;
  /** rows of each power map */
  timeCount: number;
  /** columns of each power map */
  frequencyCount: number;
  window: BaselineSampleWindow | BaselineTimeWindow;
  /** also return every trial normalised by its own baseline. @defaultValue false */
  perTrial?: boolean;
  /**
   * cells marked 1 (e.g. a Morlet edge mask, [time][frequency]) are left out of the baseline
   * statistics; they are still normalised in the output. @defaultValue none
   */
  exclude?: Uint8Array;
}

export interface BaselineResult {
  mode: BaselineMode;
  /** normalised mean over trials, [time][frequency] */
  average: Float64Array;
  /** per-trial normalised maps when `perTrial`, else undefined */
  trials: Float64Array[] | undefined;
  /** B(f) of the trial average */
  baselineMean: Float64Array;
  /** s(f) of the trial average (n − 1 denominator); NaN where fewer than 2 cells */
  baselineStandardDeviation: Float64Array;
  /** baseline cells used per frequency (after `exclude`) */
  baselineCounts: Uint32Array;
  /** the baseline rows, half-open [start, end) */
  baselineStart: number;
  baselineEnd: number;
  trialCount: number;
  /** one line per frequency whose baseline was unusable (its outputs are NaN) */
  warnings: string[];
}

/**
 * Rows of the time axis inside a baseline window.
 *
 * @param window - sample indices (half-open) or a closed time range with its time vector (s)
 * @param timeCount - rows of the power maps
 * @returns half-open [start, end) of the rows, non-empty
 * @throws RangeError when the window is empty, outside the axis, or the time vector is not ascending
 *   or has the wrong length
 */
export function baselineRows(window: BaselineSampleWindow | BaselineTimeWindow, timeCount: number): { start: number; end: number } {
  if (window === null || typeof window !== 'object') throw new TypeError('window must be { startSample, endSample } or { startTime, endTime, times }');
  if ('times' in window) {
    const { startTime, endTime, times } = window;
    if (times.length !== timeCount) throw new RangeError(`window.times must have timeCount = ${timeCount} entries, got ${times.length}`);
    if (!(startTime <= endTime)) throw new RangeError(`window.startTime must be ≤ endTime, got ${startTime} and ${endTime}`);
    let start = -1,
      end = -1;
    for (let i = 0; i < times.length; i++) {
      if (i > 0 && !(times[i]! > times[i - 1]!)) throw new RangeError('window.times must be strictly ascending');
      if (times[i]! >= startTime && times[i]! <= endTime) {
        if (start < 0) start = i;
        end = i + 1;
      }
    }
    if (start < 0) throw new RangeError(`no time lies in the baseline [${startTime}, ${endTime}] s`);
    return { start, end };
  }
  const { startSample, endSample } = window;
  if (!Number.isInteger(startSample) || startSample < 0) throw new RangeError(`window.startSample must be an integer ≥ 0, got ${startSample}`);
  if (!Number.isInteger(endSample) || endSample <= startSample || endSample > timeCount) {
    throw new RangeError(`window.endSample must be an integer in (startSample, timeCount = ${timeCount}], got ${endSample}`);
  }
  return { start: startSample, end: endSample };
}

interface Statistics {
  mean: Float64Array;
  sd: Float64Array;
  counts: Uint32Array;
}

function statistics(p: Float64Array, F: number, start: number, end: number, exclude: Uint8Array | undefined): Statistics {
  const mean = new Float64Array(F),
    sd = new Float64Array(F),
    counts = new Uint32Array(F);
  for (let t = start; t < end; t++) {
    for (let f = 0; f < F; f++) {
      if (exclude !== undefined && exclude[t * F + f] === 1) continue;
      mean[f] = mean[f]! + p[t * F + f]!;
      counts[f] = counts[f]! + 1;
    }
  }
  for (let f = 0; f < F; f++) mean[f] = mean[f]! / counts[f]!;
  // two passes: the deviations are formed from the finished mean, avoiding Σx² − n·mean² cancellation
  for (let t = start; t < end; t++) {
    for (let f = 0; f < F; f++) {
      if (exclude !== undefined && exclude[t * F + f] === 1) continue;
      sd[f] = sd[f]! + (p[t * F + f]! - mean[f]!) ** 2;
    }
  }
  for (let f = 0; f < F; f++) sd[f] = counts[f]! >= 2 ? Math.sqrt(sd[f]! / (counts[f]! - 1)) : Number.NaN;
  return { mean, sd, counts };
}

/** Normalises p in place by the statistics; returns the frequencies whose baseline is unusable. */
function normalize(p: Float64Array, F: number, mode: BaselineMode, s: Statistics): number[] {
  const bad: number[] = [];
  const scale = new Float64Array(F),
    offset = new Float64Array(F);
  for (let f = 0; f < F; f++) {
    const b = s.mean[f]!,
      sd = s.sd[f]!;
    const usable = mode === 'zscore' ? sd > 0 && Number.isFinite(sd) : b > 0 && Number.isFinite(b);
    if (!usable) bad.push(f);
    scale[f] = usable ? (mode === 'zscore' ? 1 / sd : 1 / b) : Number.NaN;
    offset[f] = b;
  }
  for (let i = 0; i < p.length; i++) {
    const f = i % F;
    const v = p[i]!;
    switch (mode) {
      case 'decibel':
        p[i] = 10 * Math.log10(v * scale[f]!);
        break;
      case 'percent':
        p[i] = 100 * (v - offset[f]!) * scale[f]!;
        break;
      case 'ratio':
        p[i] = v * scale[f]!;
        break;
      case 'zscore':
        p[i] = (v - offset[f]!) * scale[f]!;
        break;
    }
  }
  return bad;
}

/**
 * Baseline-normalised time–frequency power, trial-averaged and optionally per trial.
 *
 * @param trials - one power map per trial, each timeCount·frequencyCount values ([time][frequency]), unit²
 * @param options - mode, timeCount, frequencyCount, baseline window (samples or a time range),
 *   perTrial, exclude; see {@link BaselineOptions}
 * @defaultValue perTrial false, exclude none
 * @returns the normalised average (dB, %, ratio or z), per-trial maps when asked, the baseline mean,
 *   standard deviation and cell count per frequency, the baseline rows, the trial count and warnings.
 *   A frequency whose baseline is unusable (no cells left after `exclude`, mean ≤ 0, or for zscore a
 *   standard deviation that is 0 or undefined) gives NaN there and a warning, never a silent value.
 * @throws RangeError for no trials, maps of the wrong size, or a bad window
 * @throws TypeError for an unknown mode
 * @see common practice in event-related time–frequency analysis; e.g. Tallon-Baudry et al. (1996),
 *   J. Neurosci. 16:4240–4249 (power relative to a pre-stimulus baseline)
 */
export function baselineNormalize(trials: readonly Float64Array[], options: BaselineOptions): BaselineResult {
  if (options === null || typeof options !== 'object') throw new TypeError('options must be an object');
  const { mode, timeCount: T, frequencyCount: F } = options;
  if (!(BASELINE_MODES as readonly string[]).includes(mode)) throw new TypeError(`mode must be one of ${BASELINE_MODES.join(', ')}, got ${String(mode)}`);
  if (!Number.isInteger(T) || T < 1) throw new RangeError(`timeCount must be an integer ≥ 1, got ${T}`);
  if (!Number.isInteger(F) || F < 1) throw new RangeError(`frequencyCount must be an integer ≥ 1, got ${F}`);
  if (!Array.isArray(trials) || trials.length === 0) throw new RangeError('trials must hold at least one power map');
  trials.forEach((p, r) => {
    if (!(p instanceof Float64Array) || p.length !== T * F) throw new RangeError(`trials[${r}] must be a Float64Array of timeCount·frequencyCount = ${T * F} values`);
  });
  const { exclude } = options;
  if (exclude !== undefined && (!(exclude instanceof Uint8Array) || exclude.length !== T * F)) {
    throw new RangeError(`exclude must be a Uint8Array of ${T * F} values`);
  }
  const { start, end } = baselineRows(options.window, T);
  const average = new Float64Array(T * F);
  for (const p of trials) for (let i = 0; i < average.length; i++) average[i] = average[i]! + p[i]!;
  for (let i = 0; i < average.length; i++) average[i] = average[i]! / trials.length;
  const stats = statistics(average, F, start, end, exclude);
  const warnings: string[] = [];
  const report = (bad: number[], what: string): void => {
    if (bad.length > 0) warnings.push(`${what}: unusable ${mode} baseline at frequency index ${bad.join(', ')} (no cells left, non-positive mean or zero spread); those outputs are NaN`);
  };
  report(normalize(average, F, mode, stats), 'trial average');
  let normalizedTrials: Float64Array[] | undefined;
  if (options.perTrial === true) {
    normalizedTrials = trials.map((p, r) => {
      const copy = p.slice();
      report(normalize(copy, F, mode, statistics(copy, F, start, end, exclude)), `trial ${r}`);
      return copy;
    });
  }
  return {
    mode,
    average,
    trials: normalizedTrials,
    baselineMean: stats.mean,
    baselineStandardDeviation: stats.sd,
    baselineCounts: stats.counts,
    baselineStart: start,
    baselineEnd: end,
    trialCount: trials.length,
    warnings,
  };
}
