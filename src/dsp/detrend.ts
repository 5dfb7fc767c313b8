/**
 * Removal of a constant or a least-squares straight line, as applied to each Welch segment.
 */

export const DETREND_KINDS = ['none', 'mean', 'linear'] as const;
export type DetrendKind = (typeof DETREND_KINDS)[number];

/**
 * Least-squares line through x[start..start+n) on the centred abscissa t = i − (n−1)/2, where the
 * two normal equations decouple: mean = Σx/n and slope = Σt·x / Σt². Centring avoids the
 * cancellation of the raw-index form. Writes [mean, slope] into `fit`, so the Welch inner loop
 * shares it without allocating.
 *
 * @internal
 */
export function lineFit(x: Float64Array, start: number, n: number, fit: Float64Array): void {
  const centre = (n - 1) / 2;
  let sum = 0,
    moment = 0;
  for (let i = 0; i < n; i++) {
    const v = x[start + i]!;
    sum += v;
    moment += (i - centre) * v;
  }
  // Σ_{i<n} (i − (n−1)/2)² = n(n²−1)/12
  const spread = (n * (n * n - 1)) / 12;
  fit[0] = sum / n;
  fit[1] = spread > 0 ? moment / spread : 0;
}

/**
 * Remove a trend from `input`, writing the residual into `out`.
 *
 * @param input - samples x[0..n−1]
 * @param kind - `'none'` copies; `'mean'` subtracts the mean; `'linear'` subtracts the least-squares
 *   line, as scipy.signal.detrend(x, type='linear')
 * @param out - destination of length ≥ n; may be `input` itself
 * @returns `out`
 * @throws TypeError when `kind` is not one of {@link DETREND_KINDS}
 * @throws RangeError when `out` is shorter than `input`
 * @see scipy.signal.detrend; the linear fit is ordinary least squares (common practice)
 */
export function detrendInto(input: Float64Array, kind: DetrendKind, out: Float64Array): Float64Array {
  const n = input.length;
  if (out.length < n) throw new RangeError(`out must have at least ${n} elements, got ${out.length}`);
  switch (kind) {
    case 'none':
      if (out !== input) out.set(input);
      return out;
    case 'mean': {
      let sum = 0;
      for (let i = 0; i < n; i++) sum += input[i]!;
      const mean = sum / n;
      for (let i = 0; i < n; i++) out[i] = input[i]! - mean;
      return out;
    }
    case 'linear': {
      if (n === 0) return out;
      const fit = new Float64Array(2);
      lineFit(input, 0, n, fit);
      const mean = fit[0]!,
        slope = fit[1]!;
      const centre = (n - 1) / 2;
      for (let i = 0; i < n; i++) out[i] = input[i]! - mean - slope * (i - centre);
      return out;
    }
    default:
      throw new TypeError(`detrend kind must be one of ${DETREND_KINDS.join(', ')}, got ${String(kind)}`);
  }
}
