import { describe, expect, it } from 'vitest';
import { binsInRange, spectralCentroid } from '../../src/features/centroid.js';

const f = Float64Array.from({ length: 101 }, (_, k) => k * 0.5);

describe('spectralCentroid', () => {
  describe('when the spectrum holds two tones or is flat', () => {
    it('should give the power-weighted mean frequency (hand-derived)', () => {
      const two = new Float64Array(101);
      two[16] = 1;
      two[24] = 1; // 8 Hz and 12 Hz, equal power
      expect(spectralCentroid(f, two, [0, 50]).frequency).toBeCloseTo(10, 12);
      two[24] = 3; // (8·1 + 12·3)/4 = 11
      expect(spectralCentroid(f, two, [0, 50]).frequency).toBeCloseTo(11, 12);
      expect(spectralCentroid(f, new Float64Array(101).fill(1), [0, 50]).frequency).toBeCloseTo(25, 12);
    });
    it('should return null with a warning when the range holds no power', () => {
      const r = spectralCentroid(f, new Float64Array(101), [1, 5]);
      expect(r.frequency).toBeNull();
      expect(r.warnings[0]).toMatch(/no power/);
    });
  });
});

describe('binsInRange', () => {
  describe('when a closed range is selected', () => {
    it('should include both edges and reject unordered frequencies', () => {
      expect(binsInRange(f, f, [1, 2])).toEqual({ start: 2, end: 5 });
      expect(binsInRange(f, f, [1.1, 1.4])).toEqual({ start: 3, end: 3 });
      expect(() => binsInRange(Float64Array.of(0, 2, 1), Float64Array.of(1, 1, 1), [0, 2])).toThrow(/increasing/);
    });
  });
});
