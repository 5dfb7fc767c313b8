import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { confidenceInterval, perBinDegreesOfFreedom, weightedDegreesOfFreedom, welchDegreesOfFreedom } from '../../src/dsp/dof.js';
import { multitaper } from '../../src/dsp/multitaper.js';
import { periodogram } from '../../src/dsp/periodogram.js';
import { welch } from '../../src/dsp/welch.js';
import { makeWindow } from '../../src/dsp/windows.js';

/** Seeded unit Gaussian noise: mulberry32 uniforms through the Marsaglia polar method. */
function gaussianNoise(n: number, seed: number): Float64Array {
  let a = seed >>> 0;
  const uniform = (): number => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const out = new Float64Array(n);
  for (let i = 0; i < n; i += 2) {
    let u: number, v: number, s: number;
    do {
      u = 2 * uniform() - 1;
      v = 2 * uniform() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    out[i] = u * f;
    if (i + 1 < n) out[i + 1] = v * f;
  }
  return out;
}

/** Fraction of interior bins whose 95 % interval holds the true white-noise density 2σ²/fs (σ = 1). */
function coverage(epochs: number, samples: number, fs: number, estimate: (x: Float64Array) => { psd: Float64Array; dof: number | Float64Array }): number {
  let inside = 0,
    total = 0;
  for (let e = 0; e < epochs; e++) {
    const { psd, dof } = estimate(gaussianNoise(samples, 1000 + e));
    const { lower, upper } = confidenceInterval(psd, dof);
    for (let k = 1; k < psd.length - 1; k++) {
      total++;
      if (lower[k]! <= 2 / fs && 2 / fs <= upper[k]!) inside++;
    }
  }
  return inside / total;
}

// Monte Carlo with scipy.signal.welch(average='median'), made by scripts/make-multitaper-fixtures.py.
const medianFixture = JSON.parse(readFileSync(new URL('../fixtures/multitaper/welch-median-dof.json', import.meta.url), 'utf8')) as {
  cases: Array<{ segmentCount: number; segmentSamples: number; overlapSamples: number; dof: number }>;
};

describe('welchDegreesOfFreedom', () => {
  describe('when the window is Hann with 50 % overlap', () => {
    const hann = makeWindow('hann', 256);
    // docs/references.md §2 table (COMPUTED from Percival & Walden 292b): ν = 36N_B²/(19N_B − 1).
    const table: Array<[number, number]> = [
      [1, 2],
      [2, 3.891892],
      [5, 9.574468],
      [9, 17.152941],
      [20, 37.994723],
      [100, 189.5734],
    ];
    for (const [segments, tabulated] of table) {
      it(`should give 36N_B²/(19N_B − 1) to 1e-9 and the table value at its precision for N_B = ${segments}`, () => {
        const nu = welchDegreesOfFreedom(hann, 128, segments);
        expect(Math.abs(nu - (36 * segments ** 2) / (19 * segments - 1))).toBeLessThan(1e-9);
        expect(Math.abs(nu - tabulated)).toBeLessThan(5e-5 * Math.max(1, tabulated / 10));
      });
    }
  });

  describe('when the window is rectangular', () => {
    const boxcar = makeWindow('rectangular', 100);
    it('should give exactly 2N_B without overlap (independent χ²₂ periodograms, common practice)', () => {
      expect(welchDegreesOfFreedom(boxcar, 0, 7)).toBe(14);
    });
    it('should approach (4/3)·N_B with 50 % overlap (asymptotic factor, docs/references.md §2)', () => {
      expect(Math.abs(welchDegreesOfFreedom(boxcar, 50, 20000) / 20000 - 4 / 3)).toBeLessThan(1e-4);
    });
  });

  describe('when segments are median-averaged', () => {
    const boxcar = makeWindow('rectangular', 64);
    it('should give the exact exponential order-statistic EDOF without overlap (hand-derived)', () => {
      // n = 1: one χ²₂ → 2. n = 2: median = mean of two → 4.
      // n = 3: X_(2) = Z₁/3 + Z₂/2, mean 5/6, variance 1/9 + 1/4 = 13/36 → ν = 2(25/36)/(13/36) = 50/13.
      expect(Math.abs(welchDegreesOfFreedom(boxcar, 0, 1, 'median') - 2)).toBeLessThan(1e-12);
      expect(Math.abs(welchDegreesOfFreedom(boxcar, 0, 2, 'median') - 4)).toBeLessThan(1e-12);
      expect(Math.abs(welchDegreesOfFreedom(boxcar, 0, 3, 'median') - 50 / 13)).toBeLessThan(1e-12);
    });
    for (const c of medianFixture.cases) {
      it(`should stay within 4 % below scipy's Monte-Carlo EDOF for Hann 50 %, N_B = ${c.segmentCount}`, () => {
        const nu = welchDegreesOfFreedom(makeWindow('hann', c.segmentSamples), c.overlapSamples, c.segmentCount, 'median');
        expect(nu / c.dof).toBeGreaterThan(0.96);
        expect(nu / c.dof).toBeLessThan(1.0);
      });
    }
  });

  describe('when the arguments are invalid', () => {
    it('should throw RangeError naming the parameter', () => {
      const w = makeWindow('hann', 16);
      expect(() => welchDegreesOfFreedom(w, 16, 3)).toThrow(/overlapSamples/);
      expect(() => welchDegreesOfFreedom(w, 8, 0)).toThrow(/segmentCount/);
      expect(() => welchDegreesOfFreedom(new Float64Array(16), 8, 2)).toThrow(/window/);
    });
  });
});

describe('weightedDegreesOfFreedom', () => {
  describe('when weights are equal or concentrated on one estimate', () => {
    it('should give 2K and 2 (moment matching, Percival & Walden ch. 7)', () => {
      expect(weightedDegreesOfFreedom([1, 1, 1, 1, 1, 1, 1])).toBeCloseTo(14, 12);
      expect(weightedDegreesOfFreedom([3, 0, 0])).toBeCloseTo(2, 12);
      // Hand-derived: weights 1 and 0.5 → 2·2.25/1.25 = 3.6.
      expect(weightedDegreesOfFreedom([1, 0.5])).toBeCloseTo(3.6, 12);
    });
    it('should throw when every weight is zero', () => {
      expect(() => weightedDegreesOfFreedom([0, 0])).toThrow(/weights/);
    });
  });
});

describe('perBinDegreesOfFreedom', () => {
  describe('when fftLength is even or odd', () => {
    it('should halve ν at DC and, for even lengths only, at Nyquist (real DFT bins, common practice)', () => {
      expect(Array.from(perBinDegreesOfFreedom(14, 8))).toEqual([7, 14, 14, 14, 7]);
      expect(Array.from(perBinDegreesOfFreedom(14, 7))).toEqual([7, 14, 14, 14]);
    });
  });
});

describe('confidenceInterval', () => {
  describe('when compared with the 95 % multipliers of docs/references.md §2 (scipy.stats.chi2.ppf, NIST tables)', () => {
    const table: Array<[number, number, number]> = [
      [2, 0.27109, 39.4979],
      [10, 0.48821, 3.07979],
      [20, 0.58532, 2.08534],
    ];
    for (const [nu, low, high] of table) {
      it(`should multiply the estimate by [${low}, ${high}] for ν = ${nu} (5 significant digits)`, () => {
        const { lower, upper } = confidenceInterval(Float64Array.of(1, 2), nu);
        expect(Math.abs(lower[0]! / low - 1)).toBeLessThan(2e-5);
        expect(Math.abs(upper[0]! / high - 1)).toBeLessThan(2e-5);
        expect(lower[1]!).toBeCloseTo(2 * lower[0]!, 14);
      });
    }
  });

  describe('when ν differs per bin', () => {
    it("should use each bin's own ν", () => {
      const { lower, upper } = confidenceInterval(Float64Array.of(1, 1), Float64Array.of(2, 20));
      expect(Math.abs(lower[0]! / 0.27109 - 1)).toBeLessThan(2e-5);
      expect(Math.abs(upper[1]! / 2.08534 - 1)).toBeLessThan(2e-5);
    });
    it('should reject mismatched lengths, bad ν and bad levels', () => {
      expect(() => confidenceInterval(Float64Array.of(1, 1), Float64Array.of(2))).toThrow(/degreesOfFreedom/);
      expect(() => confidenceInterval(Float64Array.of(1), 0)).toThrow(/degreesOfFreedom/);
      expect(() => confidenceInterval(Float64Array.of(1), 2, 1)).toThrow(/level/);
    });
  });
});

describe('when white Gaussian noise is analysed (seeded Monte Carlo)', () => {
  // Nominal coverage is 95 %; the tolerance ±1 % covers the Monte-Carlo spread of ~5·10⁴ correlated bins.
  it('should hold the true PSD inside the 95 % CI of a rectangular periodogram (ν = 2, exact χ²₂) in 95 ± 1 % of bins', () => {
    const c = coverage(200, 512, 256, (x) => ({ psd: periodogram(x, { samplingRate: 256, detrend: 'none' }).psd, dof: 2 }));
    expect(Math.abs(c - 0.95)).toBeLessThan(0.01);
  });
  it('should hold it inside the 95 % CI of equal-weight multitaper (ν = 2K, exact for orthonormal tapers) in 95 ± 1 % of bins', () => {
    const c = coverage(200, 512, 256, (x) => {
      const r = multitaper(x, { samplingRate: 256, timeBandwidth: 4, taperCount: 7, weighting: 'equal', detrend: 'none' });
      return { psd: r.psd, dof: r.degreesOfFreedom };
    });
    expect(Math.abs(c - 0.95)).toBeLessThan(0.01);
  });
  it('should hold it inside the 95 % CI of Hann/50 % Welch with the P&W (292b) EDOF in 95 ± 1 % of bins', () => {
    const window = makeWindow('hann', 256);
    const nu = welchDegreesOfFreedom(window, 128, 9);
    const c = coverage(200, 1280, 256, (x) => ({
      psd: welch(x, { samplingRate: 256, segmentSamples: 256, overlapSamples: 128, fftLength: 256, window, detrend: 'none', average: 'mean' }).psd,
      dof: nu,
    }));
    expect(Math.abs(c - 0.95)).toBeLessThan(0.01);
  });
  it('should give an unbiased adaptive multitaper estimate with mean ν close to 2K (docs/references.md §3: 0.993 and 13.98)', () => {
    let level = 0,
      nu = 0,
      count = 0,
      maxIterations = 0;
    for (let e = 0; e < 100; e++) {
      const r = multitaper(gaussianNoise(512, 5000 + e), { samplingRate: 1, timeBandwidth: 4, taperCount: 7, weighting: 'adaptive', detrend: 'none' });
      maxIterations = Math.max(maxIterations, r.iterations);
      for (let k = 1; k < r.psd.length - 1; k++) {
        level += r.psd[k]! / 2;
        nu += r.degreesOfFreedom[k]!;
        count++;
      }
    }
    // Unit white noise: one-sided density 2σ²/fs = 2. Tolerances: 2 % on the level, ν in [13, 14].
    expect(Math.abs(level / count - 1)).toBeLessThan(0.02);
    expect(nu / count).toBeGreaterThan(13);
    expect(nu / count).toBeLessThanOrEqual(14);
    expect(maxIterations).toBeLessThan(100);
  });
});
