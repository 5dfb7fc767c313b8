/**
 * Discrete prolate spheroidal sequences (Slepian tapers) for multitaper spectral estimation.
 */
import { complexFftPlan } from './fft.js';

/** A set of DPSS tapers and their spectral concentrations. */
export interface DpssTapers {
  /** K unit-energy, mutually orthogonal tapers of `length` samples each, order 0..K−1. */
  readonly tapers: Float64Array[];
  /** λ_k: fraction of each taper's energy inside [−W, W], W = timeBandwidth/length (cycles/sample). */
  readonly concentrations: Float64Array;
}

function checkArguments(length: number, timeBandwidth: number, taperCount: number): void {
  if (!Number.isInteger(length) || length < 1) throw new RangeError(`length must be an integer ≥ 1, got ${length}`);
  if (!(timeBandwidth > 0) || !Number.isFinite(timeBandwidth)) {
    throw new RangeError(`timeBandwidth must be a positive finite number, got ${timeBandwidth}`);
  }
  if (timeBandwidth >= length / 2) {
    throw new RangeError(`timeBandwidth must be less than length/2 = ${length / 2}, got ${timeBandwidth}`);
  }
  if (!Number.isInteger(taperCount) || taperCount < 1 || taperCount > length) {
    throw new RangeError(`taperCount must be an integer in [1, length = ${length}], got ${taperCount}`);
  }
}

/** Number of eigenvalues of the symmetric tridiagonal (diag, off) strictly below `shift` (Sturm count). */
function countBelow(diag: Float64Array, off: Float64Array, shift: number, pivotFloor: number): number {
  let count = 0;
  let q = diag[0]! - shift;
  if (q < 0) count++;
  for (let i = 1; i < diag.length; i++) {
    if (q === 0) q = -pivotFloor;
    const e = off[i - 1]!;
    q = diag[i]! - shift - (e * e) / q;
    if (q < 0) count++;
  }
  return count;
}

/** Eigenvalue number `index` (ascending, 0-based) by bisection to full double precision. */
function bisectEigenvalue(diag: Float64Array, off: Float64Array, index: number, lower: number, upper: number, pivotFloor: number): number {
  let lo = lower;
  let hi = upper;
  for (let iteration = 0; iteration < 200; iteration++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (countBelow(diag, off, mid, pivotFloor) > index) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Solves (T − shift·I)x = b in place by Gaussian elimination with partial pivoting (the
 * scheme of LAPACK's tridiagonal factorisation), replacing exact-zero pivots by `pivotFloor`.
 */
function shiftedSolve(diag: Float64Array, off: Float64Array, shift: number, b: Float64Array, pivotFloor: number, work: Float64Array[]): void {
  const n = diag.length;
  const [dl, d, du, du2] = work as [Float64Array, Float64Array, Float64Array, Float64Array];
  const swapped = new Uint8Array(n);
  for (let i = 0; i < n; i++) d[i] = diag[i]! - shift;
  for (let i = 0; i < n - 1; i++) {
    dl[i] = off[i]!;
    du[i] = off[i]!;
    du2[i] = 0;
  }
  for (let i = 0; i < n - 1; i++) {
    if (Math.abs(d[i]!) >= Math.abs(dl[i]!)) {
      if (d[i] === 0) d[i] = pivotFloor;
      const fact = dl[i]! / d[i]!;
      dl[i] = fact;
      d[i + 1] = d[i + 1]! - fact * du[i]!;
    } else {
      const fact = d[i]! / dl[i]!;
      d[i] = dl[i]!;
      dl[i] = fact;
      const temp = du[i]!;
      du[i] = d[i + 1]!;
      d[i + 1] = temp - fact * d[i + 1]!;
      if (i < n - 2) {
        du2[i] = du[i + 1]!;
        du[i + 1] = -fact * du[i + 1]!;
      }
      swapped[i] = 1;
    }
  }
  if (d[n - 1] === 0) d[n - 1] = pivotFloor;
  for (let i = 0; i < n - 1; i++) {
    if (swapped[i] === 0) {
      b[i + 1] = b[i + 1]! - dl[i]! * b[i]!;
    } else {
      const temp = b[i]!;
      b[i] = b[i + 1]!;
      b[i + 1] = temp - dl[i]! * b[i]!;
    }
  }
  b[n - 1] = b[n - 1]! / d[n - 1]!;
  if (n > 1) b[n - 2] = (b[n - 2]! - du[n - 2]! * b[n - 1]!) / d[n - 2]!;
  for (let i = n - 3; i >= 0; i--) b[i] = (b[i]! - du[i]! * b[i + 1]! - du2[i]! * b[i + 2]!) / d[i]!;
}

function normalize(v: Float64Array): void {
  let sum = 0;
  for (let i = 0; i < v.length; i++) sum += v[i]! * v[i]!;
  const scale = 1 / Math.sqrt(sum);
  for (let i = 0; i < v.length; i++) v[i] = v[i]! * scale;
}

function orthogonalize(v: Float64Array, against: Float64Array[]): void {
  for (const u of against) {
    let dot = 0;
    for (let i = 0; i < v.length; i++) dot += v[i]! * u[i]!;
    for (let i = 0; i < v.length; i++) v[i] = v[i]! - dot * u[i]!;
  }
}

/** Concentration λ = hᵀAh with A_mn = sin(2πW(m−n))/(π(m−n)), A_mm = 2W, evaluated through h's autocorrelation. */
function concentration(taper: Float64Array, halfBandwidth: number): number {
  const n = taper.length;
  let size = 1;
  while (size < 2 * n - 1) size <<= 1;
  const plan = complexFftPlan(size);
  const re = new Float64Array(size);
  const im = new Float64Array(size);
  re.set(taper);
  plan.transform(re, im);
  for (let k = 0; k < size; k++) {
    re[k] = re[k]! * re[k]! + im[k]! * im[k]!;
    im[k] = 0;
  }
  plan.transform(re, im, true);
  let ratio = (2 * halfBandwidth * re[0]!) / size;
  for (let m = 1; m < n; m++) {
    ratio += ((2 * Math.sin(2 * Math.PI * halfBandwidth * m)) / (Math.PI * m)) * (re[m]! / size);
  }
  return ratio;
}

function computeDpss(length: number, timeBandwidth: number, taperCount: number): DpssTapers {
  const halfBandwidth = timeBandwidth / length;
  const diag = new Float64Array(length);
  const off = new Float64Array(Math.max(length - 1, 0));
  const cosine = Math.cos(2 * Math.PI * halfBandwidth);
  for (let i = 0; i < length; i++) {
    const centred = (length - 1 - 2 * i) / 2;
    diag[i] = centred * centred * cosine;
  }
  for (let i = 1; i < length; i++) off[i - 1] = (i * (length - i)) / 2;

  // Gershgorin bounds enclose every eigenvalue.
  let lower = Infinity;
  let upper = -Infinity;
  for (let i = 0; i < length; i++) {
    const radius = (i > 0 ? Math.abs(off[i - 1]!) : 0) + (i < length - 1 ? Math.abs(off[i]!) : 0);
    lower = Math.min(lower, diag[i]! - radius);
    upper = Math.max(upper, diag[i]! + radius);
  }
  const norm = Math.max(Math.abs(lower), Math.abs(upper), 1);
  const pivotFloor = Number.EPSILON * norm;
  lower -= pivotFloor;
  upper += pivotFloor;

  const work = [new Float64Array(length), new Float64Array(length), new Float64Array(length), new Float64Array(length)];
  const tapers: Float64Array[] = [];
  for (let k = 0; k < taperCount; k++) {
    const eigenvalue = bisectEigenvalue(diag, off, length - 1 - k, lower, upper, pivotFloor);
    const v = new Float64Array(length);
    // A deterministic start vector with components along every eigenvector.
    for (let i = 0; i < length; i++) v[i] = 1 + 0.5 * Math.sin(1.618033988749895 * (i + 1) * (k + 1));
    for (let iteration = 0; iteration < 4; iteration++) {
      orthogonalize(v, tapers);
      normalize(v);
      shiftedSolve(diag, off, eigenvalue, v, pivotFloor, work);
    }
    orthogonalize(v, tapers);
    normalize(v);
    tapers.push(v);
  }

  // Sign convention (Percival & Walden 1993, p. 379): even orders sum positive, odd orders start positive.
  const threshold = Math.max(1e-7, 1 / length);
  for (let k = 0; k < taperCount; k++) {
    const v = tapers[k]!;
    let flip: boolean;
    if (k % 2 === 0) {
      let sum = 0;
      for (let i = 0; i < length; i++) sum += v[i]!;
      flip = sum < 0;
    } else {
      let first = v.findIndex((x) => x * x > threshold);
      if (first < 0) first = 0;
      flip = v[first]! < 0;
    }
    if (flip) for (let i = 0; i < length; i++) v[i] = -v[i]!;
  }

  const concentrations = new Float64Array(taperCount);
  for (let k = 0; k < taperCount; k++) concentrations[k] = concentration(tapers[k]!, halfBandwidth);
  return { tapers, concentrations };
}

const CACHE_LIMIT = 32;
const cache = new Map<string, DpssTapers>();

/**
 * The shared cached tapers for (length, timeBandwidth, taperCount). Internal to src/dsp: callers
 * must not write into the arrays.
 */
/** K = ⌊2·NW⌋ − 1 (at least 1), the usual taper count (Percival & Walden 1993; from memory, see docs/references.md §3). */
export function defaultTaperCount(timeBandwidth: number): number {
  return Math.max(1, Math.floor(2 * timeBandwidth) - 1);
}

export function cachedDpss(length: number, timeBandwidth: number, taperCount: number): DpssTapers {
  checkArguments(length, timeBandwidth, taperCount);
  const key = `${length}|${timeBandwidth}|${taperCount}`;
  let entry = cache.get(key);
  if (entry === undefined) {
    entry = computeDpss(length, timeBandwidth, taperCount);
    if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value!);
    cache.set(key, entry);
  } else {
    // Refresh recency so the least recently used set is evicted first.
    cache.delete(key);
    cache.set(key, entry);
  }
  return entry;
}

/**
 * Discrete prolate spheroidal (Slepian) sequences.
 *
 * The tapers are the eigenvectors of the symmetric tridiagonal matrix with diagonal
 * ((N−1−2n)/2)²·cos(2πW) and off-diagonal n(N−n)/2, W = NW/N, for its K largest eigenvalues
 * (bisection on Sturm counts, then inverse iteration with partial pivoting). Each taper has unit
 * energy; even-order tapers have a positive sum and odd-order tapers start with a positive lobe.
 * The concentrations are the Rayleigh quotients hᵀAh of the sinc matrix
 * A_mn = sin(2πW(m−n))/(π(m−n)), computed from each taper's autocorrelation.
 *
 * @param length - N, taper length in samples (≥ 1)
 * @param timeBandwidth - NW, the time–half-bandwidth product (0 < NW < N/2)
 * @param taperCount - K, the number of tapers (1 ≤ K ≤ N); 2NW − 1 is the usual choice
 * @returns fresh copies of the tapers (order 0..K−1) and their concentrations λ_k (descending)
 * @throws RangeError naming the offending parameter
 * @see D. B. Percival & A. T. Walden (1993), Spectral Analysis for Physical Applications, ch. 8 (tridiagonal form, p. 379 signs, p. 390 concentrations).
 * @see D. Slepian (1978), Bell Syst. Tech. J. 57:1371–1430.
 */
export function dpss(length: number, timeBandwidth: number, taperCount: number): DpssTapers {
  const shared = cachedDpss(length, timeBandwidth, taperCount);
  return { tapers: shared.tapers.map((t) => t.slice()), concentrations: shared.concentrations.slice() };
}
