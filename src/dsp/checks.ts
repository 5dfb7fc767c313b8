/** Option checks shared by the estimators; each throws naming the parameter (see STYLE.md, errors). */
import { DETREND_KINDS, type DetrendKind } from './detrend.js';

export function requireRate(samplingRate: number): void {
  if (typeof samplingRate !== 'number' || !Number.isFinite(samplingRate) || samplingRate <= 0) {
    throw new RangeError(`samplingRate must be a finite number > 0 Hz, got ${samplingRate}`);
  }
}

export function requireDetrend(detrend: DetrendKind): void {
  if (!(DETREND_KINDS as readonly string[]).includes(detrend)) {
    throw new TypeError(`detrend must be one of ${DETREND_KINDS.join(', ')}, got ${String(detrend)}`);
  }
}

export function requireInteger(value: number, name: string, min: number): void {
  if (!Number.isInteger(value) || value < min) {
    throw new RangeError(`${name} must be an integer ≥ ${min}, got ${value}`);
  }
}

export function requireOptions(options: unknown): void {
  if (options === null || typeof options !== 'object') throw new TypeError('options must be an object');
}

/** segmentSamples ≥ 1 and 0 ≤ overlapSamples < segmentSamples, both integers. */
export function requireSegmenting(segmentSamples: number, overlapSamples: number): void {
  requireInteger(segmentSamples, 'segmentSamples', 1);
  requireInteger(overlapSamples, 'overlapSamples', 0);
  if (overlapSamples >= segmentSamples) {
    throw new RangeError(`overlapSamples must be less than segmentSamples (${segmentSamples}), got ${overlapSamples}`);
  }
}

/** An FFT length no shorter than what it transforms; `what` names that length, e.g. "segmentSamples". */
export function requireFftLength(fftLength: number, minimum: number, what: string): void {
  if (!Number.isInteger(fftLength) || fftLength < minimum) {
    throw new RangeError(`fftLength must be an integer ≥ ${what} (${minimum}), got ${fftLength}`);
  }
}

/** The signal handed to a plan built for `length` samples. */
export function requireSamples(x: Float64Array, length: number): void {
  if (!(x instanceof Float64Array)) throw new TypeError('x must be a Float64Array');
  if (x.length !== length) throw new RangeError(`x must have ${length} samples, got ${x.length}`);
}
