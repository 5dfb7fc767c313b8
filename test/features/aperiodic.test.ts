import { describe, expect, it } from 'vitest';
import { aperiodicLog10Power, fitAperiodic } from '../../src/features/aperiodic.js';

const f = Float64Array.from({ length: 241 }, (_, k) => k * 0.25);
/** P = 10^offset · f^−β, the aperiodic model itself (hand-derived expected values). */
const powerLaw = (offset: number, beta: number): Float64Array => f.map((v) => (v > 0 ? 10 ** (offset - beta * Math.log10(v)) : 0));

describe('fitAperiodic', () => {
  describe('when the PSD is an exact power law 1/f^β', () => {
    for (const beta of [0, 1, 1.7, 2.5]) {
      it(`should recover β = ${beta} and the offset to 1e-10 with R² = 1 (exact fit)`, () => {
        const r = fitAperiodic(f, powerLaw(2.3, beta), { range: [2, 40] });
        expect(Math.abs(r.exponent! - beta)).toBeLessThan(1e-10);
        expect(Math.abs(r.offset! - 2.3)).toBeLessThan(1e-10);
        expect(r.rmsError!).toBeLessThan(1e-12);
        if (beta > 0) expect(Math.abs(r.rSquared! - 1)).toBeLessThan(1e-12);
        expect(r.binCount).toBe(153);
        expect(r.inlierFraction).toBe(1);
        expect(Math.abs(aperiodicLog10Power(r, 10)! - (2.3 - beta))).toBeLessThan(1e-10);
      });
    }
  });

  describe('when an alpha peak sits on a 1/f^1.5 background', () => {
    // Peak: 4× the background at 10 Hz, Gaussian with σ = 1 Hz at 10.2 Hz (synthetic).
    const background = powerLaw(1.2, 1.5);
    const p = background.map((v, k) => v + 4 * background[40]! * Math.exp(-((f[k]! - 10.2) ** 2) / 2));
    it('should keep the robust exponent within 1e-6 of 1.5 while ordinary least squares is pulled off by more than 0.05', () => {
      const robust = fitAperiodic(f, p, { range: [2, 40] });
      const ordinary = fitAperiodic(f, p, { range: [2, 40], robust: false });
      expect(Math.abs(robust.exponent! - 1.5)).toBeLessThan(1e-6);
      expect(Math.abs(robust.offset! - 1.2)).toBeLessThan(1e-6);
      expect(Math.abs(ordinary.exponent! - 1.5)).toBeGreaterThan(0.05);
      expect(robust.inlierFraction!).toBeLessThan(1);
      expect(robust.rSquared!).toBeLessThan(1);
    });
  });

  describe('when bins have zero power or the range is too narrow', () => {
    it('should skip unusable bins with a warning', () => {
      const p = powerLaw(0, 1);
      p[20] = 0;
      const r = fitAperiodic(f, p, { range: [0, 10] });
      expect(r.warnings[0]).toMatch(/skipped 2 bin/);
      expect(Math.abs(r.exponent! - 1)).toBeLessThan(1e-10);
    });
    it('should return nulls with a warning for fewer than 3 usable bins', () => {
      const r = fitAperiodic(f, powerLaw(0, 1), { range: [5, 5.3] });
      expect(r.exponent).toBeNull();
      expect(aperiodicLog10Power(r, 5)).toBeNull();
      expect(r.warnings.at(-1)).toMatch(/at least 3 usable bins/);
    });
    it('should throw for a bad maxIterations', () => {
      expect(() => fitAperiodic(f, powerLaw(0, 1), { range: [1, 10], maxIterations: 0 })).toThrow(/maxIterations/);
    });
  });
});
