import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitPowerLaw } from '../../bench/power-law-fit.js';

describe('fitPowerLaw', () => {
  it('recovers a and b of exact power laws', () => {
    // From the definition: ln(a·n^b) = ln a + b·ln n is a line, so least squares returns it exactly.
    const n = [1, 2, 4, 8];
    for (const [a, b] of [
      [3, 2],
      [5, 0.5],
      [0.002, 1],
      [7, -1],
    ] as const) {
      const fit = fitPowerLaw(
        n,
        n.map((v) => a * v ** b),
      );
      expect(fit.b).toBeCloseTo(b, 12);
      expect(fit.a).toBeCloseTo(a, 12);
      expect(fit.r2).toBeCloseTo(1, 12);
    }
  });

  it('gives b = 0 for a flat series', () => {
    // From the definition: a constant has exponent 0 and lies on the line.
    expect(fitPowerLaw([10, 20, 40], [4, 4, 4])).toEqual({ a: 4, b: 0, r2: 1 });
  });

  it('matches a hand-derived least-squares slope on points off the line', () => {
    // Hand-derived: log2 n = [0, 1, 2], log2 y = [0, 1, 3]; slope = Σ(x−x̄)(z−z̄)/Σ(x−x̄)² = 3/2 = 1.5,
    // intercept z̄ − b·x̄ = 4/3 − 1.5 = −1/6 (base 2, so a = 2^(−1/6)); r² = 3²/(2·(14/3)) = 27/28.
    const fit = fitPowerLaw([1, 2, 4], [1, 2, 8]);
    expect(fit.b).toBeCloseTo(1.5, 12);
    expect(fit.a).toBeCloseTo(2 ** (-1 / 6), 12);
    expect(fit.r2).toBeCloseTo(27 / 28, 12);
  });

  it('fits n·log n over a doubling range with an exponent a little above 1', () => {
    // Common practice: n log n grows faster than n but slower than any n^(1+ε) in the limit; over
    // 512…4096 the local slope d ln(n ln n)/d ln n = 1 + 1/ln n lies between 1.12 and 1.16.
    const n = [512, 1024, 2048, 4096];
    const { b } = fitPowerLaw(
      n,
      n.map((v) => v * Math.log(v)),
    );
    expect(b).toBeGreaterThan(1 + 1 / Math.log(4096));
    expect(b).toBeLessThan(1 + 1 / Math.log(512));
  });

  it('gives an exponent unchanged by the order of the points and by the scale of y', () => {
    // From the definition: least squares does not depend on point order, and y·c only moves ln a
    // (a itself is checked on exact laws above: with slopes of ~10^7 here it under- or overflows).
    fc.assert(
      fc.property(
        // Sizes are whole numbers; two that differ by 1 near 10^6 still give a slope up to ~10^7, so
        // the comparison below is relative to the slope's size.
        fc.array(fc.tuple(fc.integer({ min: 1, max: 1_000_000 }), fc.double({ min: 1e-6, max: 1e6, noNaN: true })), { minLength: 2, maxLength: 8 }),
        fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
        (points, c) => {
          fc.pre(new Set(points.map((p) => p[0])).size > 1);
          const fit = fitPowerLaw(
            points.map((p) => p[0]),
            points.map((p) => p[1]),
          );
          const reversed = [...points].reverse();
          const other = fitPowerLaw(
            reversed.map((p) => p[0]),
            reversed.map((p) => c * p[1]),
          );
          expect(Math.abs(other.b - fit.b)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(fit.b)));
        },
      ),
    );
  });

  it('refuses input it cannot fit, naming what and where', () => {
    expect(() => fitPowerLaw([1, 2], [1])).toThrow(/n has 2 values but y has 1/);
    expect(() => fitPowerLaw([1], [1])).toThrow(/at least 2 points/);
    expect(() => fitPowerLaw([1, 0], [1, 2])).toThrow(/n\[1\] is 0/);
    expect(() => fitPowerLaw([1, 2], [1, Number.NaN])).toThrow(/y\[1\] is NaN/);
    expect(() => fitPowerLaw([3, 3], [1, 2])).toThrow(/every n is 3/);
  });
});
