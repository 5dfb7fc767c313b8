/**
 * Default frequency bands, after the IFCN revised glossary (Kane et al. 2017): delta < 4 Hz,
 * theta 4 to < 8 Hz, alpha 8–13 Hz, beta 14–30 Hz, gamma > 30 Hz.
 *
 * The glossary gives integer limits and leaves open what happens between 13 and 14 Hz and at the
 * outer edges, so we choose (and document in the README):
 * - every band is half-open, `low ≤ f < high`, so contiguous bands add up exactly;
 * - delta starts at 1 Hz, because bins below 1 Hz of a 2 s segment carry the leakage of the removed
 *   mean and of slow drifts (common practice);
 * - 13 to < 14 Hz goes to beta, so that the bands are contiguous from 1 to 45 Hz;
 * - gamma stops below 45 Hz, under the 50 Hz mains line and its skirt (common practice).
 */
export const DEFAULT_BANDS: readonly { name: string; low: number; high: number }[] = Object.freeze([
  Object.freeze({ name: 'delta', low: 1, high: 4 }),
  Object.freeze({ name: 'theta', low: 4, high: 8 }),
  Object.freeze({ name: 'alpha', low: 8, high: 13 }),
  Object.freeze({ name: 'beta', low: 13, high: 30 }),
  Object.freeze({ name: 'gamma', low: 30, high: 45 }),
]);
