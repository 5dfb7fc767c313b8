/**
 * Time-domain quality flags for one channel of one epoch.
 */

export interface QualityOptions {
  /** a standard deviation at or below this (signal unit) marks the signal flat. @defaultValue 1e-6 */
  flatThreshold?: number;
  /** consecutive samples at the epoch's minimum or maximum that count as clipping. @defaultValue 5 */
  clipRunSamples?: number;
  /** a sample within clipTolerance·(max − min) of an extreme counts as at it. @defaultValue 0 */
  clipTolerance?: number;
  /** peak-to-peak amplitude (signal unit) above which the epoch is flagged. @defaultValue Infinity (not checked) */
  maxPeakToPeak?: number;
}

export interface QualityFlags {
  flat: boolean;
  clipped: boolean;
  excessiveAmplitude: boolean;
  /** max − min of the finite samples, signal unit */
  peakToPeak: number;
  /** population standard deviation of the finite samples, signal unit */
  standardDeviation: number;
  /** samples inside clipping runs */
  clippedSamples: number;
  /** longest run of samples at the minimum or maximum */
  longestClipRun: number;
  /** NaN or ±Infinity samples (ignored by the statistics) */
  nonFiniteSamples: number;
  warnings: string[];
}

function positive(name: string, value: number, integer = false): number {
  if (!(value >= 0) || (integer && !Number.isInteger(value))) throw new RangeError(`${name} must be a ${integer ? 'non-negative integer' : 'number ≥ 0'}, got ${value}`);
  return value;
}

/**
 * Flags a flat signal, clipping and excessive peak-to-peak amplitude.
 *
 * A flat signal has a standard deviation ≤ flatThreshold. Clipping is a run of at least
 * clipRunSamples consecutive samples at the epoch's own minimum or maximum (a saturated amplifier
 * or ADC rail holds one value); a flat signal is not also reported as clipped. Excessive amplitude
 * is a peak-to-peak range above maxPeakToPeak.
 *
 * @param samples - one channel of one epoch, signal unit (e.g. µV)
 * @param options - flatThreshold, clipRunSamples, clipTolerance, maxPeakToPeak
 * @defaultValue flatThreshold = 1e-6, clipRunSamples = 5, clipTolerance = 0, maxPeakToPeak = Infinity
 * @returns the three flags, the statistics behind them and warnings
 * @throws RangeError naming an invalid option
 * @see common practice in EEG artefact screening (flat-line, saturation and amplitude-threshold rejection).
 */
export function qualityFlags(samples: Float64Array, options: QualityOptions = {}): QualityFlags {
  const flatThreshold = positive('flatThreshold', options.flatThreshold ?? 1e-6);
  const clipRunSamples = positive('clipRunSamples', options.clipRunSamples ?? 5, true);
  if (clipRunSamples < 2) throw new RangeError(`clipRunSamples must be ≥ 2, got ${clipRunSamples}`);
  const clipTolerance = positive('clipTolerance', options.clipTolerance ?? 0);
  const maxPeakToPeak = positive('maxPeakToPeak', options.maxPeakToPeak ?? Infinity);
  let min = Infinity,
    max = -Infinity,
    sum = 0,
    count = 0,
    nonFinite = 0;
  for (let i = 0; i < samples.length; i++) {
    const v = samples[i]!;
    if (!Number.isFinite(v)) {
      nonFinite++;
      continue;
    }
    if (v < min) min = v;
    if (v > max) max = v;
    sum += v;
    count++;
  }
  const warnings: string[] = [];
  if (nonFinite > 0) warnings.push(`${nonFinite} non-finite sample(s) ignored`);
  if (count === 0) {
    warnings.push('no finite samples');
    return { flat: true, clipped: false, excessiveAmplitude: false, peakToPeak: 0, standardDeviation: 0, clippedSamples: 0, longestClipRun: 0, nonFiniteSamples: nonFinite, warnings };
  }
  const mean = sum / count;
  let squares = 0;
  for (let i = 0; i < samples.length; i++) if (Number.isFinite(samples[i]!)) squares += (samples[i]! - mean) ** 2;
  const standardDeviation = Math.sqrt(squares / count);
  const peakToPeak = max - min;
  const flat = standardDeviation <= flatThreshold;
  if (flat) warnings.push(`flat signal: standard deviation ${standardDeviation} ≤ flatThreshold ${flatThreshold}`);

  let clippedSamples = 0,
    longest = 0;
  if (!flat) {
    const margin = clipTolerance * peakToPeak;
    let run = 0,
      side = 0;
    const close = (): void => {
      if (run >= clipRunSamples) clippedSamples += run;
      longest = Math.max(longest, run);
    };
    for (let i = 0; i < samples.length; i++) {
      const v = samples[i]!;
      const at = v >= max - margin ? 1 : v <= min + margin ? -1 : 0;
      if (at !== 0 && at === side) run++;
      else {
        close();
        run = at !== 0 ? 1 : 0;
        side = at;
      }
    }
    close();
  }
  const clipped = clippedSamples > 0;
  if (clipped) warnings.push(`clipping: ${clippedSamples} sample(s) in runs of ≥ ${clipRunSamples} at the signal minimum or maximum`);
  const excessiveAmplitude = peakToPeak > maxPeakToPeak;
  if (excessiveAmplitude) warnings.push(`peak-to-peak amplitude ${peakToPeak} exceeds maxPeakToPeak ${maxPeakToPeak}`);
  return { flat, clipped, excessiveAmplitude, peakToPeak, standardDeviation, clippedSamples, longestClipRun: longest, nonFiniteSamples: nonFinite, warnings };
}
