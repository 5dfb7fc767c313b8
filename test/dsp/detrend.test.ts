import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DETREND_KINDS, detrendInto, type DetrendKind } from '../../src/dsp/detrend.js';
import { float32s, float64s, readWelchFixture } from '../fixtures/welch/fixture.js';

interface DetrendCase {
  length: number;
  x32: string;
  mean: string;
  linear: string;
}
const fixture = readWelchFixture<{ provenance: { scipy: string }; cases: DetrendCase[] }>('./detrend.json');

function maxAbs(a: Float64Array): number {
  let m = 0;
  for (const v of a) m = Math.max(m, Math.abs(v));
  return m;
}

describe('detrendInto', () => {
  describe(`when compared with scipy.signal.detrend (scipy ${fixture.provenance.scipy})`, () => {
    it.each(fixture.cases.map((c) => [c.length, c] as const))('should match type=constant and type=linear for N = %i', (_n, c) => {
      const x = float32s(c.x32);
      const scale = Math.max(maxAbs(x), 1);
      for (const [kind, expected] of [
        ['mean', float64s(c.mean)],
        ['linear', float64s(c.linear)],
      ] as const) {
        const out = detrendInto(x, kind, new Float64Array(x.length));
        // tolerance: 1e-12 of the input's largest magnitude (least-squares rounding differs in method)
        for (let i = 0; i < x.length; i++) expect(Math.abs(out[i]! - expected[i]!)).toBeLessThan(1e-12 * scale);
      }
    });
  });

  describe('when the input is exactly a line (mathematics)', () => {
    it('should leave zeros for linear and the centred line for mean', () => {
      const x = new Float64Array(101).map((_, i) => 3 - 0.25 * i);
      const linear = detrendInto(x, 'linear', new Float64Array(101));
      expect(maxAbs(linear)).toBeLessThan(1e-13);
      const mean = detrendInto(x, 'mean', new Float64Array(101));
      expect(mean[50]).toBeCloseTo(0, 13);
      expect(mean[0]).toBeCloseTo(12.5, 12);
    });
  });

  describe('when checking the least-squares normal equations (fast-check)', () => {
    it('should leave a residual with zero sum and zero correlation with the index', () => {
      fc.assert(
        fc.property(fc.float64Array({ minLength: 2, maxLength: 300, min: -1e4, max: 1e4, noNaN: true }), (x) => {
          const r = detrendInto(x, 'linear', new Float64Array(x.length));
          let sum = 0,
            moment = 0;
          for (let i = 0; i < r.length; i++) {
            sum += r[i]!;
            moment += i * r[i]!;
          }
          const bound = 1e-10 * Math.max(maxAbs(x), 1e-300) * x.length * x.length;
          return Math.abs(sum) <= bound && Math.abs(moment) <= bound * x.length;
        }),
        { seed: 3, numRuns: 200 },
      );
    });
  });

  describe('when writing in place or copying', () => {
    it('should accept out === input and copy for none', () => {
      const x = Float64Array.from([1, 2, 4]);
      expect(detrendInto(x, 'mean', x)).toBe(x);
      [-4 / 3, -1 / 3, 5 / 3].forEach((v, i) => expect(x[i]).toBeCloseTo(v, 15));
      const y = Float64Array.from([5, 6]);
      const out = new Float64Array(2);
      expect(Array.from(detrendInto(y, 'none', out))).toEqual([5, 6]);
      expect(Array.from(detrendInto(Float64Array.from([9]), 'linear', new Float64Array(1)))).toEqual([0]);
    });
  });

  describe('when arguments are wrong', () => {
    it('should throw naming the parameter', () => {
      expect(DETREND_KINDS).toEqual(['none', 'mean', 'linear']);
      expect(() => detrendInto(new Float64Array(4), 'quadratic' as DetrendKind, new Float64Array(4))).toThrow(TypeError);
      expect(() => detrendInto(new Float64Array(4), 'mean', new Float64Array(3))).toThrow(/out/);
    });
  });
});
