import { describe, expect, it } from 'vitest';
import { WINDOW_NAMES, makeWindow, windowFigures, type WindowName } from '../../src/dsp/windows.js';
import { float64s, readWelchFixture } from '../fixtures/welch/fixture.js';

interface WindowCase {
  window: WindowName;
  tukeyRatio: number | null;
  length: number;
  values: string;
}
const fixture = readWelchFixture<{ provenance: { scipy: string }; windows: WindowCase[] }>('./windows.json');

/** Symmetric window of length N from the periodic one of length N−1 (w_sym[n] = f(2πn/(N−1))). */
function symmetric(name: WindowName, length: number): Float64Array {
  const periodic = makeWindow(name, length - 1);
  const w = new Float64Array(length);
  w.set(periodic);
  w[length - 1] = periodic[0]!;
  return w;
}

// Harris (1978) coefficients as listed in docs/references.md §1; ENBW closed form (a0² + ½Σa_k²)/a0²
const COSINE_SUMS: [WindowName, number[]][] = [
  ['hann', [0.5, 0.5]],
  ['hamming', [0.54, 0.46]],
  ['blackman', [0.42, 0.5, 0.08]],
  ['blackman-harris', [0.35875, 0.48829, 0.14128, 0.01168]],
];

describe('makeWindow', () => {
  describe(`when compared with scipy.signal.get_window(fftbins=True) (scipy ${fixture.provenance.scipy})`, () => {
    it.each(fixture.windows.map((c) => [`${c.window}${c.tukeyRatio === null ? '' : ` ${c.tukeyRatio}`} N=${c.length}`, c] as const))('should match %s to 1e-14 absolute', (_label, c) => {
      const w = makeWindow(c.window, c.length, c.tukeyRatio === null ? undefined : { tukeyRatio: c.tukeyRatio });
      const expected = float64s(c.values);
      expect(w.length).toBe(expected.length);
      for (let i = 0; i < w.length; i++) expect(Math.abs(w[i]! - expected[i]!)).toBeLessThan(1e-14);
    });

    it('should cover every window name', () => {
      expect(new Set(fixture.windows.map((c) => c.window))).toEqual(new Set(WINDOW_NAMES));
    });
  });

  describe('when the window is periodic (DFT-even)', () => {
    it('should satisfy w[n] = w[N−n] and not repeat w[0] at the end', () => {
      const w = makeWindow('hann', 1000);
      for (let n = 1; n < 1000; n++) expect(w[n]).toBe(w[1000 - n]);
      expect(w[0]).toBe(0);
      expect(w[999]).toBeGreaterThan(0);
    });

    it('should make a Tukey window of ratio 0 rectangular and of ratio 1 a Hann window (scipy definitions)', () => {
      expect(Array.from(makeWindow('tukey', 64, { tukeyRatio: 0 }))).toEqual(Array.from(makeWindow('rectangular', 64)));
      expect(Array.from(makeWindow('tukey', 64, { tukeyRatio: 1 }))).toEqual(Array.from(makeWindow('hann', 64)));
    });
  });

  describe('when the cache is involved', () => {
    it("should hand out copies, so one caller cannot change another's window", () => {
      const a = makeWindow('blackman', 128);
      a.fill(7);
      const b = makeWindow('blackman', 128);
      expect(b[0]).toBeCloseTo(0, 15);
      expect(b).not.toBe(a);
    });
  });

  describe('when arguments are wrong', () => {
    it('should throw naming the parameter', () => {
      expect(() => makeWindow('hanning' as WindowName, 8)).toThrow(TypeError);
      expect(() => makeWindow('hann', 0)).toThrow(/length/);
      expect(() => makeWindow('hann', 3.5)).toThrow(RangeError);
      expect(() => makeWindow('tukey', 8, { tukeyRatio: 1.5 })).toThrow(/tukeyRatio/);
      expect(() => makeWindow('tukey', 8, { tukeyRatio: Number.NaN })).toThrow(/tukeyRatio/);
    });
  });
});

describe('windowFigures', () => {
  describe('when compared with the closed forms of Harris (1978) (docs/references.md §1, COMPUTED)', () => {
    it.each(COSINE_SUMS)('should give CG = a0 and the ENBW closed form for %s at N = 4096 to 1e-9', (name, a) => {
      const f = windowFigures(makeWindow(name, 4096));
      const closedEnbw = (a[0]! ** 2 + 0.5 * a.slice(1).reduce((s, v) => s + v * v, 0)) / a[0]! ** 2;
      expect(Math.abs(f.coherentGain - a[0]!)).toBeLessThan(1e-9);
      expect(Math.abs(f.noiseBandwidthBins - closedEnbw)).toBeLessThan(1e-9);
      expect(f.sum).toBeCloseTo(4096 * a[0]!, 9);
    });

    it('should give the COMPUTED ENBW column: Hann 1.5, Hamming 1.362826, Blackman 1.726757, Blackman–Harris 2.004353', () => {
      const expected: [WindowName, number][] = [
        ['hann', 1.5],
        ['hamming', 1.362826],
        ['blackman', 1.726757],
        ['blackman-harris', 2.004353],
      ];
      for (const [name, enbw] of expected) expect(Math.abs(windowFigures(makeWindow(name, 4096)).noiseBandwidthBins - enbw)).toBeLessThan(1e-6);
    });

    it('should give the scallop losses −20·log10(2/π) (rectangle) and −20·log10(8/(3π)) (Hann) to 1e-6 dB', () => {
      expect(Math.abs(windowFigures(makeWindow('rectangular', 4096)).scallopLossDb + 20 * Math.log10(2 / Math.PI))).toBeLessThan(1e-6);
      expect(Math.abs(windowFigures(makeWindow('hann', 4096)).scallopLossDb + 20 * Math.log10(8 / (3 * Math.PI)))).toBeLessThan(1e-6);
    });

    it('should match the COMPUTED scallop-loss column at N = 4096 to 1e-3 dB', () => {
      // docs/references.md §1 table: Hamming 1.7514, Blackman 1.0989, Blackman–Harris 0.8256 dB (Harris's printed
      // Hamming 1.78 is marked ✗ there and is not used)
      const expected: [WindowName, number][] = [
        ['rectangular', 3.9224],
        ['hann', 1.4236],
        ['hamming', 1.7514],
        ['blackman', 1.0989],
        ['blackman-harris', 0.8256],
      ];
      for (const [name, sl] of expected) expect(Math.abs(windowFigures(makeWindow(name, 4096)).scallopLossDb - sl)).toBeLessThan(1e-3);
    });

    it("should agree with Harris's printed Table I at its own precision (MEMORY values, unmarked cells only)", () => {
      const rows: [WindowName, number, number, number][] = [
        // name, CG (2 dp), ENBW (2 dp), scallop loss (2 dp)
        ['rectangular', 1.0, 1.0, 3.92],
        ['hann', 0.5, 1.5, 1.42],
        ['blackman', 0.42, 1.73, 1.1],
        ['blackman-harris', 0.36, 2.0, 0.83],
      ];
      for (const [name, cg, enbw, sl] of rows) {
        const f = windowFigures(makeWindow(name, 4096));
        expect(Math.abs(f.coherentGain - cg)).toBeLessThanOrEqual(0.005);
        expect(Math.abs(f.noiseBandwidthBins - enbw)).toBeLessThanOrEqual(0.005);
        expect(Math.abs(f.scallopLossDb - sl)).toBeLessThanOrEqual(0.005);
      }
    });
  });

  describe('when telling symmetric from periodic windows (docs/references.md §1)', () => {
    it.each([16, 128, 1000, 1001])('should give exactly 1.5 bins for a periodic Hann and 1.5·N/(N−1) for a symmetric one (N = %i)', (n) => {
      expect(Math.abs(windowFigures(makeWindow('hann', n)).noiseBandwidthBins - 1.5)).toBeLessThan(1e-12);
      expect(Math.abs(windowFigures(symmetric('hann', n)).noiseBandwidthBins - (1.5 * n) / (n - 1))).toBeLessThan(1e-12);
    });

    it('should reproduce the MathWorks enbw reference examples (symmetric windows; READ per docs/references.md §1)', () => {
      const hz = (w: Float64Array, fs: number): number => (windowFigures(w).noiseBandwidthBins * fs) / w.length;
      expect(windowFigures(symmetric('hamming', 1000)).noiseBandwidthBins).toBeCloseTo(1.3638, 4);
      expect(hz(symmetric('hann', 1000), 10e3)).toBeCloseTo(15.015, 4);
      expect(hz(symmetric('hann', 128), 1e3)).toBeCloseTo(11.811, 3);
      expect(hz(symmetric('flat-top', 10000), 44.1e3)).toBeCloseTo(16.6285, 4);
    });
  });

  describe('when the window is degenerate', () => {
    it('should report energy and sum of any window and reject an empty or zero-sum one', () => {
      const f = windowFigures(Float64Array.from([1, 2, 3]));
      expect(f.energy).toBe(14);
      expect(f.sum).toBe(6);
      expect(f.coherentGain).toBe(2);
      expect(() => windowFigures(new Float64Array(0))).toThrow(RangeError);
      expect(() => windowFigures(Float64Array.from([1, -1]))).toThrow(/sum/);
    });
  });
});
