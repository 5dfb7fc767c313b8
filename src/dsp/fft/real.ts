/** Real-input plans: even lengths through a half-length complex transform, odd ones through a full one. */
import { checkBuffers, checkInput } from './checks.js';
import { unitRoot } from './factorization.js';
import { complexFftPlan } from './plans.js';
import type { ComplexFftPlan, RealFftPlan } from './types.js';

/**
 * Real input of even length n through one complex transform of length n/2 on the packed
 * sequence z_j = x_{2j} + i·x_{2j+1}, then a split into even and odd halves
 * (common practice; e.g. Press et al., Numerical Recipes, §12.3, from memory).
 */
export class EvenRealPlan implements RealFftPlan {
  readonly size: number;
  private readonly half: ComplexFftPlan;
  private readonly packRe: Float64Array;
  private readonly packIm: Float64Array;
  private readonly rotRe: Float64Array;
  private readonly rotIm: Float64Array;

  constructor(size: number) {
    this.size = size;
    const h = size / 2;
    this.half = complexFftPlan(h);
    this.packRe = new Float64Array(h);
    this.packIm = new Float64Array(h);
    this.rotRe = new Float64Array(h + 1);
    this.rotIm = new Float64Array(h + 1);
    for (let k = 0; k <= h; k++) unitRoot(k, size, this.rotRe, this.rotIm, k);
  }

  forward(input: Float64Array, re: Float64Array, im: Float64Array): void {
    const n = this.size;
    const h = n / 2;
    checkInput(input, n);
    checkBuffers(re, im, h + 1, 'forward:');
    const pr = this.packRe,
      pi = this.packIm;
    const len = input.length;
    for (let j = 0; j < h; j++) {
      const e = 2 * j;
      pr[j] = e < len ? input[e]! : 0;
      pi[j] = e + 1 < len ? input[e + 1]! : 0;
    }
    this.half.transform(pr, pi);
    for (let k = 0; k <= h; k++) {
      const a = k === h ? 0 : k;
      const b = k === 0 ? 0 : h - k;
      const zr = pr[a]!,
        zi = pi[a]!,
        yr = pr[b]!,
        yi = pi[b]!;
      // E = (Z_k + conj Z_{h−k})/2, O = (Z_k − conj Z_{h−k})/(2i), X_k = E + ω_n^k·O
      const er = 0.5 * (zr + yr),
        ei = 0.5 * (zi - yi);
      const or = 0.5 * (zi + yi),
        oi = -0.5 * (zr - yr);
      const wr = this.rotRe[k]!,
        wi = this.rotIm[k]!;
      re[k] = er + wr * or - wi * oi;
      im[k] = ei + wr * oi + wi * or;
    }
    // exact for real input; rounding would otherwise leave ±1e-16 here
    im[0] = 0;
    im[h] = 0;
  }
}

/** Odd lengths: a complex transform with zero imaginary part (no split exists). */
export class OddRealPlan implements RealFftPlan {
  readonly size: number;
  private readonly full: ComplexFftPlan;
  private readonly bufRe: Float64Array;
  private readonly bufIm: Float64Array;

  constructor(size: number) {
    this.size = size;
    this.full = complexFftPlan(size);
    this.bufRe = new Float64Array(size);
    this.bufIm = new Float64Array(size);
  }

  forward(input: Float64Array, re: Float64Array, im: Float64Array): void {
    const n = this.size;
    checkInput(input, n);
    const bins = (n >> 1) + 1;
    checkBuffers(re, im, bins, 'forward:');
    this.bufRe.set(input);
    this.bufRe.fill(0, input.length);
    this.bufIm.fill(0);
    this.full.transform(this.bufRe, this.bufIm);
    re.set(this.bufRe.subarray(0, bins));
    im.set(this.bufIm.subarray(0, bins));
    im[0] = 0; // exact for real input
  }
}
