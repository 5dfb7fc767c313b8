/**
 * Discrete Fourier transform plans for any length n ≥ 1.
 *
 * Convention (as numpy.fft): X_k = Σ_j x_j·e^{−2πi·jk/n}; the inverse is unscaled.
 */

export interface RealFftPlan {
  readonly size: number;
  /** X_k = Σ_j x_j·e^{−2πi·jk/n} for k = 0..floor(n/2). `input.length` may be ≤ n (implicit zero padding). */
  forward(input: Float64Array, re: Float64Array, im: Float64Array): void;
}

export interface ComplexFftPlan {
  readonly size: number;
  /** In place. `inverse` uses e^{+2πi·jk/n} and is unscaled (the caller divides by n). */
  transform(re: Float64Array, im: Float64Array, inverse?: boolean): void;
}

function checkSize(size: number): void {
  if (!Number.isInteger(size) || size < 1) {
    throw new RangeError(`size must be an integer ≥ 1, got ${size}`);
  }
}

const isPowerOfTwo = (n: number): boolean => (n & (n - 1)) === 0;

class Radix2Plan implements ComplexFftPlan {
  readonly size: number;
  private readonly cos: Float64Array;
  private readonly sin: Float64Array;
  private readonly reversed: Uint32Array;

  constructor(size: number) {
    this.size = size;
    const half = size >> 1;
    this.cos = new Float64Array(half);
    this.sin = new Float64Array(half);
    for (let k = 0; k < half; k++) {
      this.cos[k] = Math.cos((2 * Math.PI * k) / size);
      this.sin[k] = Math.sin((2 * Math.PI * k) / size);
    }
    this.reversed = new Uint32Array(size);
    let bits = 0;
    while (1 << bits < size) bits++;
    for (let i = 0; i < size; i++) {
      let r = 0;
      for (let b = 0; b < bits; b++) r |= ((i >> b) & 1) << (bits - 1 - b);
      this.reversed[i] = r;
    }
  }

  transform(re: Float64Array, im: Float64Array, inverse = false): void {
    const n = this.size;
    const rev = this.reversed;
    for (let i = 0; i < n; i++) {
      const j = rev[i]!;
      if (j > i) {
        const tr = re[i]!; re[i] = re[j]!; re[j] = tr;
        const ti = im[i]!; im[i] = im[j]!; im[j] = ti;
      }
    }
    const sign = inverse ? 1 : -1;
    for (let len = 2; len <= n; len <<= 1) {
      const halfLen = len >> 1;
      const step = n / len;
      for (let start = 0; start < n; start += len) {
        for (let k = 0; k < halfLen; k++) {
          const wr = this.cos[k * step]!;
          const wi = sign * this.sin[k * step]!;
          const a = start + k;
          const b = a + halfLen;
          const xr = re[b]! * wr - im[b]! * wi;
          const xi = re[b]! * wi + im[b]! * wr;
          re[b] = re[a]! - xr; im[b] = im[a]! - xi;
          re[a] = re[a]! + xr; im[a] = im[a]! + xi;
        }
      }
    }
  }
}

/** Bluestein's chirp-z algorithm: any length through one power-of-two convolution. */
class BluesteinPlan implements ComplexFftPlan {
  readonly size: number;
  private readonly inner: Radix2Plan;
  private readonly chirpRe: Float64Array;
  private readonly chirpIm: Float64Array;
  private readonly kernelRe: Float64Array;
  private readonly kernelIm: Float64Array;
  private readonly workRe: Float64Array;
  private readonly workIm: Float64Array;

  constructor(size: number) {
    this.size = size;
    let m = 1;
    while (m < 2 * size - 1) m <<= 1;
    this.inner = new Radix2Plan(m);
    this.chirpRe = new Float64Array(size);
    this.chirpIm = new Float64Array(size);
    for (let k = 0; k < size; k++) {
      // k² mod 2n keeps the angle argument small and exact.
      const angle = (Math.PI * ((k * k) % (2 * size))) / size;
      this.chirpRe[k] = Math.cos(angle);
      this.chirpIm[k] = -Math.sin(angle);
    }
    this.kernelRe = new Float64Array(m);
    this.kernelIm = new Float64Array(m);
    this.kernelRe[0] = this.chirpRe[0]!;
    this.kernelIm[0] = -this.chirpIm[0]!;
    for (let k = 1; k < size; k++) {
      this.kernelRe[k] = this.kernelRe[m - k] = this.chirpRe[k]!;
      this.kernelIm[k] = this.kernelIm[m - k] = -this.chirpIm[k]!;
    }
    this.inner.transform(this.kernelRe, this.kernelIm);
    this.workRe = new Float64Array(m);
    this.workIm = new Float64Array(m);
  }

  transform(re: Float64Array, im: Float64Array, inverse = false): void {
    const n = this.size;
    const m = this.inner.size;
    const wr = this.workRe;
    const wi = this.workIm;
    const s = inverse ? -1 : 1;
    for (let k = 0; k < n; k++) {
      const cr = this.chirpRe[k]!;
      const ci = s * this.chirpIm[k]!;
      wr[k] = re[k]! * cr - im[k]! * ci;
      wi[k] = re[k]! * ci + im[k]! * cr;
    }
    wr.fill(0, n, m);
    wi.fill(0, n, m);
    this.inner.transform(wr, wi);
    for (let k = 0; k < m; k++) {
      const kr = this.kernelRe[k]!;
      const ki = s * this.kernelIm[k]!;
      const xr = wr[k]! * kr - wi[k]! * ki;
      const xi = wr[k]! * ki + wi[k]! * kr;
      wr[k] = xr;
      wi[k] = xi;
    }
    this.inner.transform(wr, wi, true);
    for (let k = 0; k < n; k++) {
      const cr = this.chirpRe[k]!;
      const ci = s * this.chirpIm[k]!;
      const xr = wr[k]! / m;
      const xi = wi[k]! / m;
      re[k] = xr * cr - xi * ci;
      im[k] = xr * ci + xi * cr;
    }
  }
}

class RealViaComplexPlan implements RealFftPlan {
  readonly size: number;
  private readonly inner: ComplexFftPlan;
  private readonly bufRe: Float64Array;
  private readonly bufIm: Float64Array;

  constructor(size: number) {
    this.size = size;
    this.inner = complexFftPlan(size);
    this.bufRe = new Float64Array(size);
    this.bufIm = new Float64Array(size);
  }

  forward(input: Float64Array, re: Float64Array, im: Float64Array): void {
    const n = this.size;
    if (input.length > n) throw new RangeError(`input length ${input.length} exceeds plan size ${n}`);
    const bins = (n >> 1) + 1;
    if (re.length < bins || im.length < bins) throw new RangeError(`re and im need at least ${bins} elements`);
    this.bufRe.set(input);
    this.bufRe.fill(0, input.length);
    this.bufIm.fill(0);
    this.inner.transform(this.bufRe, this.bufIm);
    for (let k = 0; k < bins; k++) {
      re[k] = this.bufRe[k]!;
      im[k] = this.bufIm[k]!;
    }
  }
}

const complexPlans = new Map<number, ComplexFftPlan>();
const realPlans = new Map<number, RealFftPlan>();

/** A cached in-place complex DFT plan for `size` points (any integer ≥ 1). */
export function complexFftPlan(size: number): ComplexFftPlan {
  checkSize(size);
  let plan = complexPlans.get(size);
  if (plan === undefined) {
    plan = isPowerOfTwo(size) ? new Radix2Plan(size) : new BluesteinPlan(size);
    complexPlans.set(size, plan);
  }
  return plan;
}

/** A cached real-input DFT plan for `size` points (any integer ≥ 1). */
export function realFftPlan(size: number): RealFftPlan {
  checkSize(size);
  let plan = realPlans.get(size);
  if (plan === undefined) {
    plan = new RealViaComplexPlan(size);
    realPlans.set(size, plan);
  }
  return plan;
}
