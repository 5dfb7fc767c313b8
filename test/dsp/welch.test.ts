import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createWelchPlan, medianBias, oneSidedDensityScale, segmentCount, welch, welchFrequencies, type WelchOptions } from '../../src/dsp/welch.js';
import { makeWindow, windowFigures, type WindowName } from '../../src/dsp/windows.js';
import type { DetrendKind } from '../../src/dsp/detrend.js';
import { createRandom } from '../../src/common/random.js';
import { float32s, float64s, readWelchFixture, worstRelativeError } from '../fixtures/welch/fixture.js';

interface WelchCase {
  name: string;
  samplingRate: number;
  segmentSamples: number;
  overlapSamples: number;
  fftLength: number;
  window: WindowName;
  tukeyRatio: number | null;
  detrend: DetrendKind;
  average: 'mean' | 'median';
  x32: string;
  frequencies: string;
  psd: string;
  segmentCount: number;
}
const fixture = readWelchFixture<{ provenance: { scipy: string }; cases: WelchCase[] }>('./welch-cases.json');
const biasFixture = readWelchFixture<{ values: { count: number; bias: number }[] }>('./median-bias.json');

/** seeded standard normals from the project's generator, so tests never depend on Math.random */
function normals(n: number, seed: number): Float64Array {
  const random = createRandom(seed);
  return new Float64Array(n).map(() => random.normal());
}

function options(overrides: Partial<WelchOptions> = {}): WelchOptions {
  const segmentSamples = overrides.segmentSamples ?? 256;
  return {
    samplingRate: 256,
    segmentSamples,
    overlapSamples: segmentSamples / 2,
    fftLength: segmentSamples,
    detrend: 'mean',
    average: 'mean',
    ...overrides,
    window: overrides.window ?? makeWindow('hann', Number.isInteger(segmentSamples) && segmentSamples > 0 ? segmentSamples : 1),
  };
}

function variance(x: Float64Array): number {
  let mean = 0;
  for (const v of x) mean += v;
  mean /= x.length;
  let sum = 0;
  for (const v of x) sum += (v - mean) ** 2;
  return sum / x.length;
}

describe('welch', () => {
  describe(`when compared with scipy.signal.welch (scipy ${fixture.provenance.scipy}, fixture cases)`, () => {
    it.each(fixture.cases.map((c) => [c.name, c] as const))('should match %s to 1e-9 relative', (_name, c) => {
      const window = makeWindow(c.window, c.segmentSamples, c.tukeyRatio === null ? undefined : { tukeyRatio: c.tukeyRatio });
      const result = welch(float32s(c.x32), {
        samplingRate: c.samplingRate,
        segmentSamples: c.segmentSamples,
        overlapSamples: c.overlapSamples,
        fftLength: c.fftLength,
        window,
        detrend: c.detrend,
        average: c.average,
      });
      const expected = float64s(c.psd);
      expect(result.psd.length).toBe(expected.length);
      expect(result.segmentCount).toBe(c.segmentCount);
      expect(result.rejectedSegments).toBe(0);
      // tolerance from the brief: 1e-9 relative on every bin above 1e-12 of the peak
      expect(worstRelativeError(result.psd, expected, 1e-12)).toBeLessThan(1e-9);
      expect(worstRelativeError(result.frequencies, float64s(c.frequencies), 0)).toBeLessThan(1e-14);
    });

    it('should cover every window, detrend, average and the required fftLengths', () => {
      const names = new Set(fixture.cases.map((c) => c.window));
      expect([...names].sort()).toEqual(['blackman', 'blackman-harris', 'flat-top', 'hamming', 'hann', 'rectangular', 'tukey']);
      expect(new Set(fixture.cases.map((c) => c.detrend)).size).toBe(3);
      expect(new Set(fixture.cases.map((c) => c.average)).size).toBe(2);
      const lengths = new Set(fixture.cases.map((c) => c.fftLength));
      for (const n of [500, 1000, 250, 997, 1001, 768, 1025]) expect(lengths.has(n)).toBe(true);
      expect(fixture.cases.some((c) => c.fftLength > c.segmentSamples)).toBe(true);
    });
  });

  describe('when checking Parseval (docs/references.md §4, mathematics)', () => {
    it('should integrate to the mean square exactly for a rectangular window without detrend', () => {
      // one segment covering the record, so Σ psd·Δf = (1/N)·Σx² by the DFT Parseval identity
      const x = normals(1000, 7);
      for (const fftLength of [1000, 1001, 1024]) {
        // zero padding keeps Parseval: the padded DFT has the same energy per bin spacing fs/fftLength
        const r = welch(x, options({ segmentSamples: 1000, overlapSamples: 0, fftLength, window: makeWindow('rectangular', 1000), detrend: 'none', samplingRate: 200 }));
        const df = 200 / fftLength;
        let integral = 0;
        for (const v of r.psd) integral += v * df;
        let meanSquare = 0;
        for (const v of x) meanSquare += v * v;
        meanSquare /= x.length;
        expect(Math.abs(integral - meanSquare) / meanSquare).toBeLessThan(1e-12);
      }
    });

    it('should integrate to the variance exactly with a rectangular window and mean detrend', () => {
      // removing the mean leaves Σ(x − x̄)²/N = the (population) variance, by the same identity
      const x = normals(999, 8).map((v) => 5 + 3 * v);
      const r = welch(x, options({ segmentSamples: 999, overlapSamples: 0, fftLength: 999, window: makeWindow('rectangular', 999), detrend: 'mean', samplingRate: 100 }));
      let integral = 0;
      for (const v of r.psd) integral += (v * 100) / 999;
      expect(Math.abs(integral - variance(x)) / variance(x)).toBeLessThan(1e-12);
      expect(r.psd[0]).toBeLessThan(1e-20 * variance(x)); // nothing left at DC
    });

    it('should hold for any input, any odd or even length, with a rectangular window (fast-check)', () => {
      fc.assert(
        fc.property(fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 1, maxLength: 90 }), fc.double({ min: 1, max: 1e4, noNaN: true }), (values, fs) => {
          const x = Float64Array.from(values);
          const n = x.length;
          const r = welch(x, options({ samplingRate: fs, segmentSamples: n, overlapSamples: 0, fftLength: n, window: makeWindow('rectangular', n), detrend: 'none' }));
          let integral = 0;
          for (const v of r.psd) integral += (v * fs) / n;
          let meanSquare = 0;
          for (const v of x) meanSquare += v * v;
          meanSquare /= n;
          return Math.abs(integral - meanSquare) <= 1e-10 * Math.max(meanSquare, 1e-300) + 1e-300;
        }),
        { seed: 42, numRuns: 200 },
      );
    });

    it('should integrate Hann/50 % white noise to the variance within 1 % (in expectation)', () => {
      // docs/references.md §4 saw 0.3 % for the white-noise Welch/Hann integral; 1 % leaves room for this seed
      const x = normals(256 * 400, 11);
      const r = welch(x, options());
      let integral = 0;
      for (const v of r.psd) integral += v * (256 / 256);
      expect(Math.abs(integral / variance(x) - 1)).toBeLessThan(0.01);
    });
  });

  describe('when the input is a sinusoid on a bin centre (docs/references.md §4)', () => {
    it('should put A²/2 = 2 over the peak bin ±1 with Hann, and a peak of (A²/2)/(1.5·Δf)', () => {
      const fs = 256,
        n = 256,
        f0 = 32,
        amplitude = 2;
      const x = new Float64Array(n * 8).map((_, i) => amplitude * Math.sin((2 * Math.PI * f0 * i) / fs + 0.3));
      const r = welch(x, options({ samplingRate: fs, segmentSamples: n, overlapSamples: n / 2, fftLength: n }));
      const df = fs / n;
      const k = f0 / df;
      const power = (r.psd[k - 1]! + r.psd[k]! + r.psd[k + 1]!) * df;
      expect(power).toBeCloseTo(2, 9);
      expect(r.psd[k]!).toBeCloseTo(2 / (1.5 * df), 9);
    });
  });

  describe('when selecting segments', () => {
    it('should skip segments refused by acceptSegment and average the rest', () => {
      const x = normals(256 * 10, 3);
      const calls: [number, number][] = [];
      const plan = createWelchPlan(
        options({
          acceptSegment: (_x, start, end) => {
            calls.push([start, end]);
            return start < 256 * 4 || start >= 256 * 6;
          },
        }),
      );
      const r = plan.compute(x);
      expect(calls.length).toBe(segmentCount(x.length, 256, 128));
      expect(calls[1]).toEqual([128, 384]);
      expect(r.segmentCount + r.rejectedSegments).toBe(calls.length);
      expect(r.rejectedSegments).toBe(calls.filter(([s]) => !(s < 1024 || s >= 1536)).length);
      // same result as averaging the accepted segments by hand: average of single-segment PSDs
      const single = createWelchPlan(options({ overlapSamples: 0 }));
      const expected = new Float64Array(plan.binCount);
      for (const [start] of calls.filter(([s]) => s < 1024 || s >= 1536)) {
        const p = single.compute(x.subarray(start, start + 256)).psd;
        for (let k = 0; k < expected.length; k++) expected[k]! += p[k]! / r.segmentCount;
      }
      expect(worstRelativeError(r.psd, expected, 0)).toBeLessThan(1e-12);
    });

    it('should throw a RangeError when every segment is rejected', () => {
      expect(() => welch(normals(1024, 1), options({ acceptSegment: () => false }))).toThrow(RangeError);
    });
  });

  describe('when taking the median', () => {
    it('should divide the median periodogram by the bias and equal the mean periodogram for two segments', () => {
      // numpy.median of two values is their mean, and the bias is 1 for n ≤ 2 (scipy _median_bias)
      const x = normals(512, 5);
      const base = options({ overlapSamples: 0 });
      const mean = welch(x, base).psd;
      const med = welch(x, { ...base, average: 'median' }).psd;
      expect(worstRelativeError(med, mean, 0)).toBeLessThan(1e-12);
    });
  });

  describe('when neighbouring segments differ hugely in size (two segments share one complex DFT)', () => {
    it('should still give each segment its own periodogram to 1e-9 relative (median exposes each one)', () => {
      // segments 0–3 are 1e4 times larger than 4–7; pairs (3, 4) mix both sizes
      const x = normals(256 * 8, 21);
      for (let i = 0; i < 256 * 4; i++) x[i]! *= 1e4;
      const r = welch(x, options({ overlapSamples: 0, average: 'median' }));
      const single = createWelchPlan(options({ overlapSamples: 0 }));
      const perSegment = Array.from({ length: 8 }, (_, s) => single.compute(x.subarray(256 * s, 256 * (s + 1))).psd);
      const expected = new Float64Array(r.psd.length).map((_, k) => {
        const values = perSegment.map((p) => p[k]!).sort((a, b) => a - b);
        return (0.5 * (values[3]! + values[4]!)) / medianBias(8);
      });
      expect(worstRelativeError(r.psd, expected, 1e-12)).toBeLessThan(1e-9);
    });
  });

  describe('when reusing a plan', () => {
    it('should write into out and give the same numbers as welch()', () => {
      const x = normals(3000, 9);
      const plan = createWelchPlan(options({ fftLength: 300 }));
      const out = new Float64Array(plan.binCount);
      const r = plan.compute(x, out);
      expect(r.psd).toBe(out);
      expect(Array.from(plan.compute(x).psd)).toEqual(Array.from(out));
      expect(Array.from(welch(x, options({ fftLength: 300 })).psd)).toEqual(Array.from(out));
      expect(plan.binCount).toBe(151);
      expect(plan.frequencies[150]).toBe(128);
    });

    it('should not change when the caller later edits the window array', () => {
      const window = makeWindow('hann', 256);
      const x = normals(2048, 2);
      const plan = createWelchPlan(options({ window }));
      const before = Array.from(plan.compute(x).psd);
      window.fill(1);
      expect(Array.from(plan.compute(x).psd)).toEqual(before);
    });
  });

  describe('when options are wrong', () => {
    const x = normals(1000, 1);
    it.each([
      ['segmentSamples', { segmentSamples: 0 }],
      ['segmentSamples', { segmentSamples: 2.5 }],
      ['overlapSamples', { overlapSamples: 256 }],
      ['overlapSamples', { overlapSamples: -1 }],
      ['fftLength', { fftLength: 255 }],
      ['samplingRate', { samplingRate: Number.NaN }],
      ['samplingRate', { samplingRate: Number.POSITIVE_INFINITY }],
      ['samplingRate', { samplingRate: 0 }],
      ['window length', { window: new Float64Array(255) }],
      ['window', { window: new Float64Array(256) }],
    ] as const)('should throw a RangeError naming %s', (name, bad) => {
      expect(() => welch(x, options(bad as Partial<WelchOptions>))).toThrow(RangeError);
      expect(() => welch(x, options(bad as Partial<WelchOptions>))).toThrow(name);
    });

    it.each([
      ['detrend', { detrend: 'quadratic' }],
      ['average', { average: 'mode' }],
      ['window', { window: [1, 2] }],
    ] as const)('should throw a TypeError naming %s', (name, bad) => {
      expect(() => welch(x, options(bad as unknown as Partial<WelchOptions>))).toThrow(TypeError);
      expect(() => welch(x, options(bad as unknown as Partial<WelchOptions>))).toThrow(name);
    });

    it('should throw a RangeError naming segmentSamples when the signal is shorter than a segment', () => {
      expect(() => welch(x.subarray(0, 100), options())).toThrow(/segmentSamples/);
    });
  });
});

describe('segmentCount', () => {
  describe('when counting like scipy (floor((N − overlap)/(segment − overlap)))', () => {
    it('should drop trailing samples and return 0 for a short record', () => {
      expect(segmentCount(1000, 256, 128)).toBe(6); // (1000−128)/128 = 6.8
      expect(segmentCount(300000, 1000, 500)).toBe(599);
      expect(segmentCount(255, 256, 0)).toBe(0);
      expect(segmentCount(256, 256, 255)).toBe(1);
      expect(() => segmentCount(10, 4, 4)).toThrow(/overlapSamples/);
    });
  });
});

describe('welchFrequencies', () => {
  describe('when building the bin axis', () => {
    it('should give k·fs/n for k up to floor(n/2)', () => {
      expect(Array.from(welchFrequencies(4, 100))).toEqual([0, 25, 50]);
      expect(Array.from(welchFrequencies(5, 100))).toEqual([0, 20, 40]);
      expect(() => welchFrequencies(0, 100)).toThrow(/fftLength/);
      expect(() => welchFrequencies(8, -1)).toThrow(/samplingRate/);
    });
  });
});

describe('oneSidedDensityScale', () => {
  describe('when n is even or odd (scipy.signal.welch one-sided convention)', () => {
    it('should double all interior bins, and Nyquist only when n is odd', () => {
      expect(Array.from(oneSidedDensityScale(4, 1, 1))).toEqual([1, 2, 1]);
      expect(Array.from(oneSidedDensityScale(5, 1, 1))).toEqual([1, 2, 2]);
      expect(Array.from(oneSidedDensityScale(1, 2, 0.5))).toEqual([1]);
      expect(oneSidedDensityScale(1000, 500, 375)[1]).toBeCloseTo(2 / (500 * 375), 18);
      expect(() => oneSidedDensityScale(8, 1, 0)).toThrow(/windowEnergy/);
    });

    it('should equal 2/(fs·Σw²) with Σw² from windowFigures', () => {
      const w = makeWindow('hann', 1000);
      expect(windowFigures(w).energy).toBeCloseTo(375, 9); // periodic Hann: Σw² = 3N/8 (exact, mathematics)
    });
  });
});

describe('medianBias', () => {
  describe('when compared with scipy _median_bias (fixture)', () => {
    it('should match for counts 1..39 to 1e-14', () => {
      for (const { count, bias } of biasFixture.values) expect(Math.abs(medianBias(count) - bias)).toBeLessThan(1e-14);
    });

    it('should tend to ln 2 (median of an exponential / its mean; mathematics)', () => {
      expect(medianBias(100001)).toBeCloseTo(Math.LN2, 4);
      expect(() => medianBias(0)).toThrow(/count/);
    });
  });
});
