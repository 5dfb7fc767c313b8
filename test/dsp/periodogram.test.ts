import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { DetrendKind } from '../../src/dsp/detrend.js';
import { createPeriodogramPlan, periodogram } from '../../src/dsp/periodogram.js';
import type { WindowName } from '../../src/dsp/windows.js';

// scipy.signal.periodogram(..., scaling='density') via scripts/make-multitaper-fixtures.py (scipy 1.10.1).
const fixture = JSON.parse(readFileSync(new URL('../fixtures/multitaper/periodogram.json', import.meta.url), 'utf8')) as {
  samplingRate: number;
  signal: number[];
  cases: Array<{ window: WindowName; tukeyRatio: number | null; fftLength: number; detrend: DetrendKind; frequencies: number[]; psd: number[] }>;
};
const x = Float64Array.from(fixture.signal);

describe('periodogram', () => {
  describe('when compared with scipy.signal.periodogram', () => {
    for (const c of fixture.cases) {
      it(`should match to 1e-9 relative for window ${c.window}, fftLength ${c.fftLength}, detrend ${c.detrend}`, () => {
        const r = periodogram(x, {
          samplingRate: fixture.samplingRate,
          window: c.window,
          fftLength: c.fftLength,
          detrend: c.detrend,
          ...(c.tukeyRatio === null ? {} : { tukeyRatio: c.tukeyRatio }),
        });
        expect(r.psd).toHaveLength(c.psd.length);
        const peak = Math.max(...c.psd);
        c.psd.forEach((value, k) => {
          expect(Math.abs(r.psd[k]! - value)).toBeLessThanOrEqual(1e-9 * Math.abs(value) + 1e-13 * peak);
          expect(Math.abs(r.frequencies[k]! - c.frequencies[k]!)).toBeLessThan(1e-12);
        });
      });
    }
  });

  describe('when the window is rectangular and nothing is detrended', () => {
    it('should integrate exactly to the mean square (Parseval, docs/references.md §4) to 1e-12', () => {
      for (const fftLength of [400, 401, 1000]) {
        const r = periodogram(x, { samplingRate: 200, fftLength, detrend: 'none' });
        const integral = r.psd.reduce((s, v) => s + v, 0) * (200 / fftLength);
        const meanSquare = x.reduce((s, v) => s + v * v, 0) / x.length;
        expect(Math.abs(integral / meanSquare - 1)).toBeLessThan(1e-12);
      }
    });
    it('should give ν = 2 inside and 1 at DC and Nyquist', () => {
      const r = periodogram(x, { samplingRate: 200 });
      expect(r.degreesOfFreedom[0]).toBe(1);
      expect(r.degreesOfFreedom[100]).toBe(2);
      expect(r.degreesOfFreedom[200]).toBe(1);
    });
  });

  describe('when an A = 2 sinusoid sits on a bin centre with a Hann window (docs/references.md §4)', () => {
    it('should give a density peak of (A²/2)/(1.5·Δf) and A²/2 over the peak bin ± 1', () => {
      const n = 256,
        fs = 256;
      const tone = Float64Array.from({ length: n }, (_, t) => 2 * Math.sin((2 * Math.PI * 32 * t) / n));
      const r = periodogram(tone, { samplingRate: fs, window: 'hann', detrend: 'none' });
      expect(Math.abs(r.psd[32]! - 2 / 1.5)).toBeLessThan(1e-12);
      expect(Math.abs((r.psd[31]! + r.psd[32]! + r.psd[33]!) * 1 - 2)).toBeLessThan(1e-12);
    });
  });

  describe('when a plan is reused', () => {
    it('should give the same numbers as the one-shot function', () => {
      const plan = createPeriodogramPlan(400, { samplingRate: 200, window: 'hann', fftLength: 512 });
      const a = plan.compute(x);
      const b = periodogram(x, { samplingRate: 200, window: 'hann', fftLength: 512 });
      expect(Array.from(a.psd)).toEqual(Array.from(b.psd));
      expect(Array.from(plan.compute(x).psd)).toEqual(Array.from(b.psd));
    });
  });

  describe('when the arguments are invalid', () => {
    it('should throw naming the parameter', () => {
      expect(() => periodogram(x, { samplingRate: 200, fftLength: 100 })).toThrow(/fftLength/);
      expect(() => periodogram(x, { samplingRate: 0 })).toThrow(/samplingRate/);
      expect(() => createPeriodogramPlan(400, { samplingRate: 200 }).compute(new Float64Array(10))).toThrow(/x must/);
    });
  });
});
