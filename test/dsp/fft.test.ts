import FFT from 'fft.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { complexFftPlan, realFftPlan } from '../../src/dsp/fft.js';

/** O(N²) DFT written here as the reference; j·k is reduced mod N first so the angles stay exact. */
function naiveDft(re: Float64Array, im: Float64Array, sign = -1): { re: Float64Array; im: Float64Array } {
  const n = re.length;
  const outRe = new Float64Array(n),
    outIm = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let sr = 0,
      si = 0;
    for (let j = 0; j < n; j++) {
      const angle = (sign * 2 * Math.PI * ((j * k) % n)) / n;
      const c = Math.cos(angle),
        s = Math.sin(angle);
      sr += re[j]! * c - im[j]! * s;
      si += re[j]! * s + im[j]! * c;
    }
    outRe[k] = sr;
    outIm[k] = si;
  }
  return { re: outRe, im: outIm };
}

/** seeded uniform values in [−1, 1) from the project's generator, so failures reproduce */
function seeded(n: number, seed: number): Float64Array {
  const random = createRandom(seed);
  return new Float64Array(n).map(() => 2 * random.uniform() - 1);
}

function l1(re: Float64Array, im: Float64Array): number {
  let s = 0;
  for (let i = 0; i < re.length; i++) s += Math.hypot(re[i]!, im[i]!);
  return s;
}

function maxDiff(aRe: Float64Array, aIm: Float64Array, bRe: Float64Array, bIm: Float64Array, count = aRe.length): number {
  let worst = 0;
  for (let k = 0; k < count; k++) worst = Math.max(worst, Math.hypot(aRe[k]! - bRe[k]!, aIm[k]! - bIm[k]!));
  return worst;
}

// primes above 61 go through Bluestein (2053 on a 2^a·3^b·5^c convolution length, the rest on powers of two)
const primes = [67, 97, 101, 127, 257, 509, 997, 1009, 2053];
const products = [210, 2310, 420, 1050, 3 * 5 * 7 * 11 * 2];
// 31·32, 37·8, 41·25 and 59, 61 (above) exercise the generic odd radix
const others = [250, 500, 768, 961, 1000, 1001, 1024, 1025, 2048, 4096, 31 * 32, 37 * 8, 41 * 25];
const sizes = [...Array.from({ length: 64 }, (_, i) => i + 1), ...primes, ...products, ...others];

// Tolerance: |X_k| ≤ Σ|x_j| for every k, so 1e-13·Σ|x_j| is 1e-13 relative to the largest possible
// bin; with N ≤ 4096 this is well inside the brief's 1e-12·N bar.
const TOLERANCE = 1e-13;

describe('complexFftPlan', () => {
  describe('when compared with an O(N²) DFT on seeded random input', () => {
    it.each(sizes)('should agree for N = %i (forward and inverse)', (n) => {
      const re = seeded(n, n),
        im = seeded(n, 7 * n + 1);
      const bound = TOLERANCE * l1(re, im);
      const ref = naiveDft(re, im);
      const xr = re.slice(),
        xi = im.slice();
      complexFftPlan(n).transform(xr, xi);
      expect(maxDiff(xr, xi, ref.re, ref.im)).toBeLessThanOrEqual(bound);
      const inv = naiveDft(re, im, +1);
      const yr = re.slice(),
        yi = im.slice();
      complexFftPlan(n).transform(yr, yi, true);
      expect(maxDiff(yr, yi, inv.re, inv.im)).toBeLessThanOrEqual(bound);
    });
  });

  // factorize() runs a leading radix 16 (or two) then 8s for powers of two, then odd primes; these sizes
  // put every butterfly in the first stage (stride 1, twiddles change every butterfly) and in the last
  // stage (span 1, which runs in place into the caller's arrays), with odd and even stage counts.
  describe('when each butterfly is the first and the last stage (O(N²) DFT definition as reference)', () => {
    it.each<[number, string]>([
      [16, '16 alone'],
      [128, '16·8'],
      [256, '16·16'],
      [2048, '16·16·8'],
      [1024, '16·8·8'],
      [48, '16·3'],
      [80, '16·5'],
      [112, '16·7 (generic odd radix last)'],
      [40, '8·5'],
      [24, '8·3'],
      [32, '8·4'],
      [6, '2·3'],
      [10, '2·5'],
      [15, '3·5'],
      [35, '5·7'],
      // radix 9 (one stage for each 3·3): last after powers of two, first before odd primes, in the middle
      [9, '9 alone'],
      [18, '2·9'],
      [72, '8·9'],
      [1152, '16·8·9'],
      [2304, '16·16·9'],
      [4608, '8·8·8·9'],
      [45, '9·5'],
      [81, '9·9'],
      [405, '9·9·5'],
      [27, '9·3'],
      // radix 12 (a lone 3 with a 4, where that saves a stage): alone, first, middle and last
      [12, '12 alone'],
      [60, '12·5'],
      [84, '12·7'],
      [960, '16·12·5'],
      [192, '16·12'],
      [1536, '16·8·12'],
      [3072, '16·16·12'],
      [108, '9·12'],
      [24, '8·3 (no 12: 2·12 saves nothing)'],
    ])('should agree for N = %i (%s), forward and inverse', (n) => {
      const re = seeded(n, 13 * n),
        im = seeded(n, 17 * n + 3);
      const bound = TOLERANCE * l1(re, im);
      for (const sign of [-1, 1]) {
        const ref = naiveDft(re, im, sign);
        const xr = re.slice(),
          xi = im.slice();
        complexFftPlan(n).transform(xr, xi, sign === 1);
        expect(maxDiff(xr, xi, ref.re, ref.im)).toBeLessThanOrEqual(bound);
      }
    });

    it('should leave elements past N untouched in longer arrays (callers pass reused work buffers)', () => {
      for (const n of [128, 1024, 48]) {
        const re = seeded(n + 5, n),
          im = seeded(n + 5, n + 1);
        const ref = naiveDft(re.subarray(0, n), im.subarray(0, n), 1);
        const xr = re.slice(),
          xi = im.slice();
        complexFftPlan(n).transform(xr, xi, true);
        expect(maxDiff(xr.subarray(0, n), xi.subarray(0, n), ref.re, ref.im)).toBeLessThanOrEqual(TOLERANCE * l1(re, im));
        expect(Array.from(xr.subarray(n))).toEqual(Array.from(re.subarray(n)));
        expect(Array.from(xi.subarray(n))).toEqual(Array.from(im.subarray(n)));
      }
    });
  });

  // outputCount only lets the last stage skip rows of outputs past the count; the outputs it does
  // compute go through the same operations, so they must equal the full transform's bit for bit.
  describe('when only a prefix of the outputs is asked for (outputCount)', () => {
    it.each<[number, string]>([
      [2, '2 alone'],
      [4, '4 alone'],
      [32, '8·4'],
      [16, '16 alone'],
      [128, '16·8'],
      [2048, '16·16·8'],
      [256, '16·16'],
      [48, '16·3'],
      [80, '16·5'],
      [1280, '16·16·5'],
      [1152, '16·8·9'],
      [1536, '16·8·12'],
      [112, '16·7 (generic odd radix)'],
      [35, '5·7'],
      [67, 'Bluestein'],
    ])('should equal the full transform on outputs 0..count−1 for N = %i (%s)', (n) => {
      const re = seeded(n, 19 * n),
        im = seeded(n, 23 * n + 5);
      const counts = n <= 128 ? Array.from({ length: n }, (_, k) => k + 1) : [1, 2, 127, 128, 129, 500, 1000, n >> 1, n - 1, n].filter((c) => c <= n);
      for (const inverse of [false, true]) {
        const fr = re.slice(),
          fi = im.slice();
        complexFftPlan(n).transform(fr, fi, inverse);
        for (const count of counts) {
          const xr = re.slice(),
            xi = im.slice();
          complexFftPlan(n).transform(xr, xi, inverse, count);
          expect(Array.from(xr.subarray(0, count))).toEqual(Array.from(fr.subarray(0, count)));
          expect(Array.from(xi.subarray(0, count))).toEqual(Array.from(fi.subarray(0, count)));
        }
      }
    });

    it('should reject a count outside 1..N', () => {
      const re = new Float64Array(16),
        im = new Float64Array(16);
      expect(() => complexFftPlan(16).transform(re, im, true, 0)).toThrow(/outputCount/);
      expect(() => complexFftPlan(16).transform(re, im, true, 17)).toThrow(RangeError);
      expect(() => complexFftPlan(67).transform(new Float64Array(67), new Float64Array(67), false, 2.5)).toThrow(/outputCount/);
    });
  });

  // X_k = Σ_j x_j·e^{−2πi·jk/N} evaluated by hand: a constant gives N·δ_k, an impulse at 0 gives 1,
  // (1, 0, −1, 0, …) gives N/2 at k = N/4 and 3N/4, and (−1)^j gives N·δ_{k−N/2}. For powers of two
  // every twiddle these touch is a quarter turn or multiplies a zero, so the values must be exact.
  describe('when given real inputs whose DFT is exact, at powers of two (values worked by hand from the DFT definition)', () => {
    const cases: [string, (j: number) => number, (k: number, n: number) => number][] = [
      ['a constant', () => 1, (k, n) => (k === 0 ? n : 0)],
      ['an impulse at 0', (j) => (j === 0 ? 1 : 0), () => 1],
      ['cos(2πj/4)', (j) => [1, 0, -1, 0][j % 4]!, (k, n) => (k === n / 4 || k === (3 * n) / 4 ? n / 2 : 0)],
      ['(−1)^j', (j) => (j % 2 === 0 ? 1 : -1), (k, n) => (k === n / 2 ? n : 0)],
    ];
    it.each([16, 128, 256, 1024, 2048, 4096])('should give exact values and exact zeros for N = %i', (n) => {
      for (const [, input, expected] of cases) {
        for (const inverse of [false, true]) {
          const re = new Float64Array(n).map((_, j) => input(j)),
            im = new Float64Array(n);
          complexFftPlan(n).transform(re, im, inverse);
          // these inputs are even (x_j = x_{N−j}), so the inverse gives the same values
          for (let k = 0; k < n; k++) {
            // + 0 folds −0 into 0: the sign of a zero is not part of the claim
            expect(re[k]! + 0).toBe(expected(k, n));
            expect(im[k]! + 0).toBe(0);
          }
        }
      }
    });
  });

  describe('when compared with fft.js, an independent implementation (powers of two)', () => {
    it.each([2, 4, 8, 16, 32, 64, 128, 256, 512, 1024, 2048, 4096, 8192])('should agree for N = %i', (n) => {
      const re = seeded(n, 3 * n),
        im = seeded(n, 5 * n);
      const f = new FFT(n);
      const input = f.createComplexArray() as number[];
      for (let i = 0; i < n; i++) {
        input[2 * i] = re[i]!;
        input[2 * i + 1] = im[i]!;
      }
      const output = f.createComplexArray() as number[];
      f.transform(output, input);
      const xr = re.slice(),
        xi = im.slice();
      complexFftPlan(n).transform(xr, xi);
      let worst = 0;
      for (let k = 0; k < n; k++) worst = Math.max(worst, Math.hypot(xr[k]! - output[2 * k]!, xi[k]! - output[2 * k + 1]!));
      expect(worst).toBeLessThanOrEqual(TOLERANCE * l1(re, im));
    });
  });

  describe('when given the worked examples of docs/references.md §8', () => {
    it('should map [0, 1, 2, 3] to [6, −2+2j, −2, −2−2j] (computed by hand and numpy)', () => {
      const re = Float64Array.from([0, 1, 2, 3]),
        im = new Float64Array(4);
      complexFftPlan(4).transform(re, im);
      const expected = [
        [6, 0],
        [-2, 2],
        [-2, 0],
        [-2, -2],
      ];
      expected.forEach(([r, i], k) => {
        expect(re[k]).toBeCloseTo(r!, 12);
        expect(im[k]).toBeCloseTo(i!, 12);
      });
    });

    it('should map [1, 2, 3, 4] to [10, −2+2j, −2, −2−2j] through the real plan too', () => {
      const re = new Float64Array(3),
        im = new Float64Array(3);
      realFftPlan(4).forward(Float64Array.from([1, 2, 3, 4]), re, im);
      expect(Array.from(re)).toEqual([10, -2, -2]);
      expect(Array.from(im)).toEqual([0, 2, 0]);
    });

    it('should give 8 at k = 1 and 0 elsewhere for exp(2πi·n/8) (numpy.fft.fft docstring)', () => {
      const re = new Float64Array(8).map((_, n) => Math.cos((2 * Math.PI * n) / 8));
      const im = new Float64Array(8).map((_, n) => Math.sin((2 * Math.PI * n) / 8));
      complexFftPlan(8).transform(re, im);
      for (let k = 0; k < 8; k++) {
        expect(Math.abs(re[k]! - (k === 1 ? 8 : 0))).toBeLessThan(1e-14);
        expect(Math.abs(im[k]!)).toBeLessThan(1e-14);
      }
    });
  });

  describe('when checking algebraic properties (fast-check)', () => {
    const signal = fc
      .integer({ min: 1, max: 160 })
      .chain((n) =>
        fc.tuple(
          fc.float64Array({ minLength: n, maxLength: n, min: -1e3, max: 1e3, noNaN: true }),
          fc.float64Array({ minLength: n, maxLength: n, min: -1e3, max: 1e3, noNaN: true }),
          fc.float64Array({ minLength: n, maxLength: n, min: -1e3, max: 1e3, noNaN: true }),
        ),
      );

    it('should be linear: F(a·x + y) = a·F(x) + F(y)', () => {
      fc.assert(
        fc.property(signal, fc.double({ min: -10, max: 10, noNaN: true }), ([x, y, z], a) => {
          const n = x.length;
          const plan = complexFftPlan(n);
          const sr = new Float64Array(n).map((_, i) => a * x[i]! + y[i]!),
            si = z.slice();
          const xr = x.slice(),
            xi = new Float64Array(n),
            yr = y.slice(),
            yi = z.slice();
          plan.transform(sr, si);
          plan.transform(xr, xi);
          plan.transform(yr, yi);
          const er = new Float64Array(n).map((_, k) => a * xr[k]! + yr[k]!);
          const ei = new Float64Array(n).map((_, k) => a * xi[k]! + yi[k]!);
          const scale = (Math.abs(a) + 1) * (l1(x, new Float64Array(n)) + l1(y, z)) + 1e-300;
          return maxDiff(sr, si, er, ei) <= 1e-12 * scale;
        }),
        { seed: 1, numRuns: 150 },
      );
    });

    it('should satisfy Parseval: Σ|x|² = (1/N)·Σ|X|² (numpy.fft convention, docs/references.md §4)', () => {
      fc.assert(
        fc.property(signal, ([x, y]) => {
          const n = x.length;
          let energy = 0;
          for (let i = 0; i < n; i++) energy += x[i]! ** 2 + y[i]! ** 2;
          const re = x.slice(),
            im = y.slice();
          complexFftPlan(n).transform(re, im);
          let spectral = 0;
          for (let k = 0; k < n; k++) spectral += re[k]! ** 2 + im[k]! ** 2;
          return Math.abs(spectral / n - energy) <= 1e-12 * energy + 1e-300;
        }),
        { seed: 2, numRuns: 150 },
      );
    });
  });

  describe('when misused', () => {
    it('should reject sizes that are not integers ≥ 1 and short buffers', () => {
      expect(() => complexFftPlan(0)).toThrow(RangeError);
      expect(() => complexFftPlan(2.5)).toThrow(/size/);
      expect(() => complexFftPlan(16).transform(new Float64Array(8), new Float64Array(16))).toThrow(RangeError);
    });

    it('should cache one plan per size', () => {
      expect(complexFftPlan(360)).toBe(complexFftPlan(360));
      expect(complexFftPlan(360).size).toBe(360);
    });

    it('should keep an evicted plan working once more than 64 other sizes were planned', () => {
      const old = complexFftPlan(720);
      for (let n = 3000; n < 3070; n++) complexFftPlan(n);
      const fresh = complexFftPlan(720);
      expect(fresh).not.toBe(old);
      const a = { re: seeded(720, 1), im: seeded(720, 2) };
      const b = { re: a.re.slice(), im: a.im.slice() };
      old.transform(a.re, a.im);
      fresh.transform(b.re, b.im);
      expect(Array.from(a.re)).toEqual(Array.from(b.re));
      expect(Array.from(a.im)).toEqual(Array.from(b.im));
    });
  });
});

describe('realFftPlan', () => {
  describe('when compared with an O(N²) DFT of real input', () => {
    it.each(sizes)('should give bins 0..floor(N/2) for N = %i', (n) => {
      const x = seeded(n, 11 * n);
      const ref = naiveDft(x, new Float64Array(n));
      const bins = (n >> 1) + 1;
      const re = new Float64Array(bins),
        im = new Float64Array(bins);
      realFftPlan(n).forward(x, re, im);
      expect(maxDiff(re, im, ref.re, ref.im, bins)).toBeLessThanOrEqual(TOLERANCE * l1(x, new Float64Array(n)));
      // a real input has a real DC bin, and a real Nyquist bin when N is even (Hermitian symmetry)
      expect(im[0]).toBe(0);
      if (n % 2 === 0) expect(Math.abs(im[bins - 1]!)).toBeLessThanOrEqual(TOLERANCE * l1(x, new Float64Array(n)));
    });
  });

  describe('when the input is shorter than the plan', () => {
    it.each([1000, 1001, 1024, 997])('should zero-pad implicitly (N = %i)', (n) => {
      const x = seeded(600, n);
      const padded = new Float64Array(n);
      padded.set(x);
      const bins = (n >> 1) + 1;
      const a = { re: new Float64Array(bins), im: new Float64Array(bins) };
      const b = { re: new Float64Array(bins), im: new Float64Array(bins) };
      realFftPlan(n).forward(x, a.re, a.im);
      realFftPlan(n).forward(padded, b.re, b.im);
      expect(Array.from(a.re)).toEqual(Array.from(b.re));
      expect(Array.from(a.im)).toEqual(Array.from(b.im));
    });
  });

  describe('when misused', () => {
    it('should reject a longer input, short outputs and bad sizes', () => {
      expect(() => realFftPlan(8).forward(new Float64Array(9), new Float64Array(5), new Float64Array(5))).toThrow(/input length/);
      expect(() => realFftPlan(8).forward(new Float64Array(8), new Float64Array(4), new Float64Array(5))).toThrow(RangeError);
      expect(() => realFftPlan(-3)).toThrow(/size/);
      expect(realFftPlan(100)).toBe(realFftPlan(100));
    });
  });
});
