/** Bluestein plans for lengths with a large prime factor. */
import { checkBuffers, checkOutputCount } from './checks.js';
import { complexFftPlan } from './plans.js';
import type { ComplexFftPlan } from './types.js';

/**
 * Convolution length for Bluestein: the power of two ≥ n, unless a 2^a·3^b·5^c length is enough
 * shorter to pay for its slower radix-3/5 stages (measured about 1.4× the cost per point here).
 */
export function convolutionLength(n: number): number {
  let pow2 = 1;
  while (pow2 < n) pow2 *= 2;
  let smooth = pow2;
  for (let p5 = 1; p5 < pow2; p5 *= 5) {
    for (let p35 = p5; p35 < pow2; p35 *= 3) {
      let m = p35;
      while (m < n) m *= 2;
      if (m < smooth) smooth = m;
    }
  }
  return smooth * 1.4 < pow2 ? smooth : pow2;
}

/** Bluestein's chirp-z algorithm: a length-n DFT as a circular convolution of a fast length. */
export class BluesteinPlan implements ComplexFftPlan {
  readonly size: number;
  private readonly inner: ComplexFftPlan;
  private readonly chirpRe: Float64Array;
  private readonly chirpIm: Float64Array;
  private readonly kernelRe: Float64Array;
  private readonly kernelIm: Float64Array;
  private readonly workRe: Float64Array;
  private readonly workIm: Float64Array;

  constructor(size: number) {
    this.size = size;
    const m = convolutionLength(2 * size - 1);
    this.inner = complexFftPlan(m);
    this.chirpRe = new Float64Array(size);
    this.chirpIm = new Float64Array(size);
    for (let k = 0; k < size; k++) {
      // k² mod 2n keeps the angle exact for large k.
      const angle = (Math.PI * ((k * k) % (2 * size))) / size;
      this.chirpRe[k] = Math.cos(angle);
      this.chirpIm[k] = -Math.sin(angle);
    }
    this.kernelRe = new Float64Array(m);
    this.kernelIm = new Float64Array(m);
    for (let k = 0; k < size; k++) {
      const cr = this.chirpRe[k]!;
      const ci = -this.chirpIm[k]!;
      this.kernelRe[k] = cr;
      this.kernelIm[k] = ci;
      if (k > 0) {
        this.kernelRe[m - k] = cr;
        this.kernelIm[m - k] = ci;
      }
    }
    this.inner.transform(this.kernelRe, this.kernelIm);
    // Fold the 1/m of the inverse transform into the kernel.
    for (let k = 0; k < m; k++) {
      this.kernelRe[k] = this.kernelRe[k]! / m;
      this.kernelIm[k] = this.kernelIm[k]! / m;
    }
    this.workRe = new Float64Array(m);
    this.workIm = new Float64Array(m);
  }

  transform(re: Float64Array, im: Float64Array, inverse = false, outputCount = this.size): void {
    const n = this.size;
    checkBuffers(re, im, n, 'transform:');
    checkOutputCount(outputCount, n);
    if (inverse) this.forward(im, re);
    else this.forward(re, im);
  }

  /** In place, forward; the inverse hands the arrays over swapped (see MixedRadixPlan.transform). */
  private forward(re: Float64Array, im: Float64Array): void {
    const n = this.size;
    const m = this.inner.size;
    const wr = this.workRe,
      wi = this.workIm;
    for (let k = 0; k < n; k++) {
      const cr = this.chirpRe[k]!,
        ci = this.chirpIm[k]!;
      const xr = re[k]!,
        xi = im[k]!;
      wr[k] = xr * cr - xi * ci;
      wi[k] = xr * ci + xi * cr;
    }
    wr.fill(0, n, m);
    wi.fill(0, n, m);
    this.inner.transform(wr, wi);
    for (let k = 0; k < m; k++) {
      const kr = this.kernelRe[k]!,
        ki = this.kernelIm[k]!;
      const xr = wr[k]!,
        xi = wi[k]!;
      // multiply and conjugate, so the next forward transform acts as an inverse one
      wr[k] = xr * kr - xi * ki;
      wi[k] = -(xr * ki + xi * kr);
    }
    this.inner.transform(wr, wi);
    for (let k = 0; k < n; k++) {
      const cr = this.chirpRe[k]!,
        ci = this.chirpIm[k]!;
      const xr = wr[k]!,
        xi = -wi[k]!;
      re[k] = xr * cr - xi * ci;
      im[k] = xr * ci + xi * cr;
    }
  }
}
