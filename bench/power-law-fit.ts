/**
 * The exponent of a power law y ≈ a·n^b fitted by ordinary least squares on (ln n, ln y), as the
 * growth benchmark (bench/growth.ts) prints it. Small on purpose: a straight line through logs.
 */

export interface PowerLawFit {
  /** the factor a of y ≈ a·n^b */
  a: number;
  /** the exponent b: the slope of ln y against ln n */
  b: number;
  /** the coefficient of determination of the line on the logs (1 when every point lies on it) */
  r2: number;
}

/**
 * Fits y ≈ a·n^b by least squares on ln y = ln a + b·ln n.
 *
 * @param n sizes, all > 0 and not all equal
 * @param y measured values (seconds, bytes), all > 0, as many as `n`
 * @throws RangeError naming the argument and index when the input cannot be fitted
 */
export function fitPowerLaw(n: readonly number[], y: readonly number[]): PowerLawFit {
  if (n.length !== y.length) throw new RangeError(`fitPowerLaw: n has ${n.length} values but y has ${y.length}; give one y per n`);
  if (n.length < 2) throw new RangeError(`fitPowerLaw: needs at least 2 points, got ${n.length}`);
  for (const [name, values] of [
    ['n', n],
    ['y', y],
  ] as const) {
    values.forEach((v, i) => {
      if (!Number.isFinite(v) || v <= 0) throw new RangeError(`fitPowerLaw: ${name}[${i}] is ${v}; every value must be finite and > 0 to take its logarithm`);
    });
  }
  const x = n.map(Math.log);
  const z = y.map(Math.log);
  const xMean = x.reduce((s, v) => s + v, 0) / x.length;
  const zMean = z.reduce((s, v) => s + v, 0) / z.length;
  let sxx = 0;
  let sxz = 0;
  let szz = 0;
  for (let i = 0; i < x.length; i++) {
    const dx = x[i]! - xMean;
    const dz = z[i]! - zMean;
    sxx += dx * dx;
    sxz += dx * dz;
    szz += dz * dz;
  }
  if (sxx === 0) throw new RangeError(`fitPowerLaw: every n is ${n[0]}; the sizes must differ to fit an exponent`);
  const b = sxz / sxx;
  // A flat y lies exactly on the line b = 0.
  const r2 = szz === 0 ? 1 : (sxz * sxz) / (sxx * szz);
  return { a: Math.exp(zMean - b * xMean), b, r2 };
}
