import { describe, expect, it } from 'vitest';
import { lineNoiseRatio } from '../../src/features/line-noise.js';

const f = Float64Array.from({ length: 513 }, (_, k) => k * 0.25); // 0..128 Hz

describe('lineNoiseRatio', () => {
  describe('when the spectrum is flat', () => {
    it('should give a ratio of 1 at 50, 100 Hz and skip 150 Hz (past the last bin) with a warning', () => {
      const r = lineNoiseRatio(f, new Float64Array(513).fill(2), { lineFrequency: 50 });
      expect(r.harmonics.map((h) => h.frequency)).toEqual([50, 100]);
      expect(r.ratio).toBeCloseTo(1, 14);
      expect(r.maxRatio).toBeCloseTo(1, 14);
      expect(r.warnings[0]).toMatch(/^harmonic 3 \(150 Hz\)/);
    });
  });

  describe('when a line of power P sits in one 0.25 Hz bin on a unit flat PSD', () => {
    it('should give the hand-derived ratio 1 + (P/Δf)/9 over 9 line bins and 32 neighbour bins', () => {
      // Line band 49..51 Hz holds 9 bins; neighbours 1 < |f − 50| ≤ 5 Hz hold 2·16 bins.
      const p = new Float64Array(513).fill(1);
      p[200] = 1 + 2.25 / 0.25; // 50 Hz
      p[400] = 1 + 0.45 / 0.25; // 100 Hz, P = 0.45 → 1.2
      const r = lineNoiseRatio(f, p, { lineFrequency: 50, harmonics: 2 });
      expect(r.harmonics[0]!.lineBins).toBe(9);
      expect(r.harmonics[0]!.neighborhoodBins).toBe(32);
      expect(r.ratio).toBeCloseTo(2, 12);
      expect(r.harmonics[0]!.ratioDb).toBeCloseTo(10 * Math.log10(2), 12);
      expect(r.harmonics[1]!.ratio).toBeCloseTo(1.2, 12);
      expect(r.maxRatio).toBeCloseTo(2, 12);
    });
    it('should see nothing at 60 Hz when the line is at 50 Hz', () => {
      const p = new Float64Array(513).fill(1);
      p[200] = 10;
      expect(lineNoiseRatio(f, p, { lineFrequency: 60, harmonics: 1 }).ratio).toBeCloseTo(1, 14);
      p[240] = 10;
      expect(lineNoiseRatio(f, p, { lineFrequency: 60, harmonics: 1 }).ratio).toBeCloseTo(2, 12);
    });
  });

  describe('when the options are invalid', () => {
    it('should throw RangeError naming the option', () => {
      const p = new Float64Array(513).fill(1);
      expect(() => lineNoiseRatio(f, p, { lineFrequency: 0 })).toThrow(/lineFrequency/);
      expect(() => lineNoiseRatio(f, p, { lineFrequency: 50, harmonics: 0 })).toThrow(/harmonics/);
      expect(() => lineNoiseRatio(f, p, { lineFrequency: 50, halfWidth: 0 })).toThrow(/halfWidth/);
    });
  });
});
