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
