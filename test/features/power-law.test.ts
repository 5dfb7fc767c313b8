import { describe, expect, it } from 'vitest';
import { fitPowerLaw, powerLawLog10 } from '../../src/features/power-law.js';

const f = Float64Array.from({ length: 241 }, (_, k) => k * 0.25);
/** P = 10^intercept · f^−β, the power-law model itself (hand-derived expected values). */
const powerLaw = (intercept: number, beta: number): Float64Array => f.map((v) => (v > 0 ? 10 ** (intercept - beta * Math.log10(v)) : 0));

describe('fitPowerLaw', () => {
  describe('when the PSD is an exact power law 1/f^β', () => {
    for (const beta of [0, 1, 1.7, 2.5]) {
      it(`should recover β = ${beta} and the intercept to 1e-10 with R² = 1 (exact fit)`, () => {
        const r = fitPowerLaw(f, powerLaw(2.3, beta), { range: [2, 40] });
        expect(Math.abs(-r.slope! - beta)).toBeLessThan(1e-10);
        expect(Math.abs(r.intercept! - 2.3)).toBeLessThan(1e-10);
        expect(r.residualRms!).toBeLessThan(1e-12);
        if (beta > 0) expect(Math.abs(r.rSquared! - 1)).toBeLessThan(1e-12);
        expect(r.binCount).toBe(153);
        expect(r.inlierFraction).toBe(1);
        expect(Math.abs(powerLawLog10(r, 10)! - (2.3 - beta))).toBeLessThan(1e-10);
      });
    }
  });

  describe('when an alpha peak sits on a 1/f^1.5 background', () => {
    // Peak: 4× the background at 10 Hz, Gaussian with σ = 1 Hz at 10.2 Hz (synthetic).
    const background = powerLaw(1.2, 1.5);
    const p = background.map((v, k) => v + 4 * background[40]! * Math.exp(-((f[k]! - 10.2) ** 2) / 2));
    it('should keep the robust exponent within 1e-6 of 1.5 while ordinary least squares is pulled off by more than 0.05', () => {
      const robust = fitPowerLaw(f, p, { range: [2, 40] });
      const ordinary = fitPowerLaw(f, p, { range: [2, 40], robust: false });
      expect(Math.abs(-robust.slope! - 1.5)).toBeLessThan(1e-6);
      expect(Math.abs(robust.intercept! - 1.2)).toBeLessThan(1e-6);
      expect(Math.abs(-ordinary.slope! - 1.5)).toBeGreaterThan(0.05);
      expect(robust.inlierFraction!).toBeLessThan(1);
      expect(robust.rSquared!).toBeLessThan(1);
    });
  });

  describe('when bins have zero power or the range is too narrow', () => {
    it('should skip unusable bins with a warning', () => {
      const p = powerLaw(0, 1);
      p[20] = 0;
      const r = fitPowerLaw(f, p, { range: [0, 10] });
      expect(r.warnings[0]).toMatch(/skipped 2 bin/);
      expect(Math.abs(-r.slope! - 1)).toBeLessThan(1e-10);
    });
    it('should return nulls with a warning for fewer than 3 usable bins', () => {
      const r = fitPowerLaw(f, powerLaw(0, 1), { range: [5, 5.3] });
      expect(r.slope).toBeNull();
      expect(powerLawLog10(r, 5)).toBeNull();
      expect(r.warnings.at(-1)).toMatch(/at least 3 usable bins/);
    });
    it('should throw for a bad maxIterations', () => {
      expect(() => fitPowerLaw(f, powerLaw(0, 1), { range: [1, 10], maxIterations: 0 })).toThrow(/maxIterations/);
    });
  });
});
