/**
 * Special functions needed for spectral confidence intervals: log-gamma, the regularised
 * incomplete gamma function and the chi-square distribution (CDF and quantile).
 *
 * Written here rather than taken from a dependency so that src/dsp stays self-contained.
 */

// Lanczos approximation, g = 7, n = 9 (coefficients as published by P. Godfrey; about 15
// significant digits over the positive reals).
const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];
const LN_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/**
 * Natural logarithm of the gamma function, ln Γ(x), for x > 0.
 *
 * @param x - argument, x > 0
 * @returns ln Γ(x)
 * @throws RangeError when `x` is not a positive finite number
 * @see C. Lanczos (1964), "A precision approximation of the gamma function", SIAM J. Numer. Anal. B 1:86–96.
 */
export function logGamma(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) throw new RangeError(`x must be a positive finite number, got ${x}`);
  if (x < 0.5) {
    // Reflection keeps the series in its accurate region.
    return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  }
  const z = x - 1;
  let sum = LANCZOS[0]!;
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i]! / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return LN_SQRT_2PI + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

const EPS = 1e-16;
const MAX_TERMS = 100_000;

/** Series for P(a, x), best for x < a + 1. */
function gammaPSeries(a: number, x: number): number {
  let term = 1 / a;
  let sum = term;
  for (let n = 1; n < MAX_TERMS; n++) {
    term *= x / (a + n);
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPS) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - logGamma(a));
}

/** Continued fraction for Q(a, x) (modified Lentz), best for x ≥ a + 1. */
function gammaQContinuedFraction(a: number, x: number): number {
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < MAX_TERMS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPS) break;
  }
  return Math.exp(-x + a * Math.log(x) - logGamma(a)) * h;
}

function checkShape(a: number): void {
  if (!(a > 0) || !Number.isFinite(a)) throw new RangeError(`a must be a positive finite number, got ${a}`);
}

/**
 * Regularised lower incomplete gamma function P(a, x) = γ(a, x)/Γ(a).
 *
 * @param a - shape, a > 0
 * @param x - argument, x ≥ 0
 * @returns P(a, x) in [0, 1]
 * @throws RangeError when `a` ≤ 0 or `x` < 0
 * @see Abramowitz & Stegun (1964), Handbook of Mathematical Functions, 6.5.1 and 6.5.29 (series) and 6.5.31 (continued fraction).
 */
export function regularizedGammaP(a: number, x: number): number {
  checkShape(a);
  if (!(x >= 0)) throw new RangeError(`x must be ≥ 0, got ${x}`);
  if (x === 0) return 0;
  if (x === Infinity) return 1;
  return x < a + 1 ? gammaPSeries(a, x) : 1 - gammaQContinuedFraction(a, x);
}

/**
 * Regularised upper incomplete gamma function Q(a, x) = 1 − P(a, x), computed directly in the
 * upper tail so that small values keep their relative accuracy.
 *
 * @param a - shape, a > 0
 * @param x - argument, x ≥ 0
 * @returns Q(a, x) in [0, 1]
 * @throws RangeError when `a` ≤ 0 or `x` < 0
 * @see Abramowitz & Stegun (1964), 6.5.3.
 */
export function regularizedGammaQ(a: number, x: number): number {
  checkShape(a);
  if (!(x >= 0)) throw new RangeError(`x must be ≥ 0, got ${x}`);
  if (x === 0) return 1;
  if (x === Infinity) return 0;
  return x < a + 1 ? 1 - gammaPSeries(a, x) : gammaQContinuedFraction(a, x);
}

function checkDegrees(degreesOfFreedom: number): void {
  if (!(degreesOfFreedom > 0) || !Number.isFinite(degreesOfFreedom)) {
    throw new RangeError(`degreesOfFreedom must be a positive finite number, got ${degreesOfFreedom}`);
  }
}

/**
 * Chi-square cumulative distribution function, P(X ≤ x) for X ~ χ²_ν (ν may be fractional).
 *
 * @param x - value, x ≥ 0
 * @param degreesOfFreedom - ν > 0
 * @returns the probability P(X ≤ x)
 * @throws RangeError when `degreesOfFreedom` ≤ 0 or `x` < 0
 * @see Abramowitz & Stegun (1964), 26.4.19: P(x | ν) = P(ν/2, x/2).
 */
export function chiSquareCdf(x: number, degreesOfFreedom: number): number {
  checkDegrees(degreesOfFreedom);
  return regularizedGammaP(degreesOfFreedom / 2, x / 2);
}

/**
 * Chi-square quantile (inverse CDF): the x with P(X ≤ x) = p for X ~ χ²_ν.
 *
 * Newton steps on the CDF (on the complementary CDF when p > ½, to keep upper-tail accuracy),
 * inside a bracket that falls back to bisection; converges to about 1e-14 relative.
 *
 * @param p - probability, 0 ≤ p ≤ 1
 * @param degreesOfFreedom - ν > 0 (fractional values allowed, as for equivalent degrees of freedom)
 * @returns the p-quantile χ²_ν(p); 0 for p = 0 and Infinity for p = 1
 * @throws RangeError when `p` is outside [0, 1] or `degreesOfFreedom` ≤ 0
 * @see Abramowitz & Stegun (1964), 26.4.17 (Wilson–Hilferty start value).
 */
export function chiSquareQuantile(p: number, degreesOfFreedom: number): number {
  checkDegrees(degreesOfFreedom);
  if (!(p >= 0 && p <= 1)) throw new RangeError(`p must be in [0, 1], got ${p}`);
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  const a = degreesOfFreedom / 2;
  const upper = p > 0.5;
  const target = upper ? 1 - p : p;
  // F(y) is increasing in y when working on the lower tail, decreasing on the upper.
  const f = (y: number): number => (upper ? regularizedGammaQ(a, y) : regularizedGammaP(a, y)) - target;
  const logNorm = logGamma(a);
  const density = (y: number): number => Math.exp((a - 1) * Math.log(y) - y - logNorm);

  let y = startValue(a, p);
  let lo = 0;
  let hi = Infinity;
  for (let iteration = 0; iteration < 200; iteration++) {
    const value = f(y);
    if (value === 0) return 2 * y;
    const below = upper ? value > 0 : value < 0;
    if (below) lo = y;
    else hi = y;
    const slope = upper ? -density(y) : density(y);
    let next = y - value / slope;
    if (!(next > lo && next < hi) || !Number.isFinite(next)) {
      next = hi === Infinity ? Math.max(2 * y, y + 1) : 0.5 * (lo + hi);
    }
    if (Math.abs(next - y) <= 1e-15 * Math.abs(next)) return 2 * next;
    y = next;
    if (hi !== Infinity && hi - lo <= 1e-15 * hi) break;
  }
  return 2 * y;
}

/** Start value for the half-scale quantile y = x/2 of Gamma(a, 1). */
function startValue(a: number, p: number): number {
  const nu = 2 * a;
  if (nu < 1) {
    // Lower-tail approximation P(a, y) ≈ y^a/Γ(a+1), adequate for small shape.
    const y = Math.exp((Math.log(p) + logGamma(a + 1)) / a);
    return Math.max(Math.min(y, 1e3), 1e-300);
  }
  const z = normalQuantile(p);
  const c = 2 / (9 * nu);
  const w = 1 - c + z * Math.sqrt(c);
  const x = nu * w * w * w;
  return x > 0 ? x / 2 : Math.max(1e-300, Math.exp((Math.log(p) + logGamma(a + 1)) / a));
}

/** Standard normal quantile, rational approximation (Acklam), about 1e-9 relative: only a start value. */
function normalQuantile(p: number): number {
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
  const low = 0.02425;
  if (p < low) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((c[0]! * q + c[1]!) * q + c[2]!) * q + c[3]!) * q + c[4]!) * q + c[5]!) / ((((d[0]! * q + d[1]!) * q + d[2]!) * q + d[3]!) * q + 1);
  }
  if (p > 1 - low) return -normalQuantile(1 - p);
  const q = p - 0.5;
  const r = q * q;
  return ((((((a[0]! * r + a[1]!) * r + a[2]!) * r + a[3]!) * r + a[4]!) * r + a[5]!) * q) / (((((b[0]! * r + b[1]!) * r + b[2]!) * r + b[3]!) * r + b[4]!) * r + 1);
}
