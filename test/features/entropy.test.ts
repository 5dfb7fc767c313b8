import { describe, expect, it } from 'vitest';
import { spectralEntropy } from '../../src/features/entropy.js';

const f = Float64Array.from({ length: 256 }, (_, k) => k);

describe('spectralEntropy', () => {
  // Check values from docs/references.md §7 (COMPUTED from H = −Σp ln p / ln N).
  describe('when the spectrum is flat, a single line or two equal lines among 256 bins', () => {
    it('should give 1, 0 and ln 2/ln 256 = 0.125 to 1e-12', () => {
      expect(Math.abs(spectralEntropy(f, new Float64Array(256).fill(2), [0, 255]).value! - 1)).toBeLessThan(1e-12);
      const line = new Float64Array(256);
      line[40] = 5;
      expect(spectralEntropy(f, line, [0, 255]).value).toBe(0);
      const two = new Float64Array(256);
      two[40] = 5;
      two[90] = 5;
      const r = spectralEntropy(f, two, [0, 255]);
      expect(r.binCount).toBe(256);
      expect(Math.abs(r.value! - 0.125)).toBeLessThan(1e-12);
    });
    it('should not depend on the PSD scale', () => {
      const p = f.map((v) => 1 / (1 + v));
      const a = spectralEntropy(f, p, [1, 100]).value!;
      const b = spectralEntropy(
        f,
        p.map((v) => v * 1e6),
        [1, 100],
      ).value!;
      expect(Math.abs(a - b)).toBeLessThan(1e-12);
      expect(a).toBeGreaterThan(0);
      expect(a).toBeLessThan(1);
    });
  });

  describe('when only part of the spectrum is selected', () => {
    it('should count N over the closed range only: two equal lines among 16 bins give ln 2/ln 16 = 0.25', () => {
      const p = new Float64Array(256);
      p[3] = 1;
      p[7] = 1;
      p[100] = 50;
      expect(Math.abs(spectralEntropy(f, p, [0, 15]).value! - 0.25)).toBeLessThan(1e-12);
    });
  });

  describe('when the entropy is undefined', () => {
    it('should return null with a warning for no power or a single bin', () => {
      expect(spectralEntropy(f, new Float64Array(256), [0, 10]).warnings[0]).toMatch(/no power/);
      expect(spectralEntropy(f, new Float64Array(256).fill(1), [3.5, 4.5]).value).toBeNull();
    });
    it('should throw for negative power', () => {
      const p = new Float64Array(256).fill(1);
      p[5] = -1;
      expect(() => spectralEntropy(f, p, [0, 10])).toThrow(/psd/);
    });
  });
});
