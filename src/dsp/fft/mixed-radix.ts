/** The mixed-radix Stockham plan for lengths whose prime factors are all direct radices. */
import { checkBuffers, checkOutputCount } from './checks.js';
import { makeStages, type Stage } from './factorization.js';
import { radix12, radix16, radix2, radix3, radix4, radix5, radix8, radix9, radixOdd } from './butterflies.js';
import type { ComplexFftPlan } from './types.js';

/** Mixed-radix Stockham transform for lengths whose prime factors are all ≤ MAX_DIRECT_RADIX. */
export class MixedRadixPlan implements ComplexFftPlan {
  readonly size: number;
  private readonly stages: Stage[];
  private readonly scratchRe: Float64Array;
  private readonly scratchIm: Float64Array;
  private readonly sumRe: Float64Array;
  private readonly sumIm: Float64Array;
  private readonly diffRe: Float64Array;
  private readonly diffIm: Float64Array;

  constructor(size: number, radices: readonly number[]) {
    this.size = size;
    this.stages = makeStages(size, radices);
    this.scratchRe = new Float64Array(size);
    this.scratchIm = new Float64Array(size);
    const largest = Math.max(1, ...radices);
    this.sumRe = new Float64Array(largest);
    this.sumIm = new Float64Array(largest);
    this.diffRe = new Float64Array(largest);
    this.diffIm = new Float64Array(largest);
  }

  transform(re: Float64Array, im: Float64Array, inverse = false, outputCount = this.size): void {
    checkBuffers(re, im, this.size, 'transform:');
    checkOutputCount(outputCount, this.size);
    // ifft(x) = swap(fft(swap(x))), swap exchanging real and imaginary parts: one kernel serves both
    // directions, and swapping costs nothing when the kernel is handed the arrays the other way round.
    if (inverse) this.forwardInPlace(im, re, outputCount);
    else this.forwardInPlace(re, im, outputCount);
  }

  private forwardInPlace(re: Float64Array, im: Float64Array, outputCount: number): void {
    const stages = this.stages;
    const last = stages.length - 1;
    let xr = re,
      xi = im,
      yr = this.scratchRe,
      yi = this.scratchIm;
    for (let k = 0; k <= last; k++) {
      const stage = stages[k]!;
      // The last stage (span 1) reads and writes the same indices, each butterfly all its inputs before
      // any output, so it runs in place when its input is already the caller's arrays: no copy back.
      if (k === last) {
        yr = re;
        yi = im;
      }
      const { radix, stride, span, twiddles } = stage;
      // the last stage's output q + stride·t, q < stride: rows t < ceil(outputCount/stride) are needed
      const rows = k === last ? Math.min(radix, Math.ceil(outputCount / stride)) : radix;
      switch (radix) {
        case 16:
          radix16(stride, span, xr, xi, yr, yi, twiddles, rows);
          break;
        case 8:
          radix8(stride, span, xr, xi, yr, yi, twiddles, rows);
          break;
        case 4:
          radix4(stride, span, xr, xi, yr, yi, twiddles, rows);
          break;
        case 2:
          radix2(stride, span, xr, xi, yr, yi, twiddles, rows);
          break;
        case 3:
          radix3(stride, span, xr, xi, yr, yi, twiddles, rows);
          break;
        case 5:
          radix5(stride, span, xr, xi, yr, yi, twiddles, rows);
          break;
        case 9:
          radix9(stride, span, xr, xi, yr, yi, twiddles, rows);
          break;
        case 12:
          radix12(stride, span, xr, xi, yr, yi, twiddles, rows);
          break;
        default:
          radixOdd(radix, stride, span, xr, xi, yr, yi, twiddles, stage.rootRe!, stage.rootIm!, this.sumRe, this.sumIm, this.diffRe, this.diffIm, rows);
      }
      const tr = xr,
        ti = xi;
      xr = yr;
      xi = yi;
      yr = tr;
      yi = ti;
    }
  }
}
