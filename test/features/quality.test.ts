import { describe, expect, it } from 'vitest';
import { qualityFlags } from '../../src/features/quality.js';

const sine = (n: number, amplitude: number): Float64Array => Float64Array.from({ length: n }, (_, t) => amplitude * Math.sin((2 * Math.PI * 10 * t) / 256));

describe('qualityFlags', () => {
  describe('when the signal is a clean 10 Hz sinusoid of amplitude 20', () => {
    it('should raise no flag and report peak-to-peak 40 and standard deviation 20/√2 (hand-derived)', () => {
      const r = qualityFlags(sine(256, 20));
      expect(r.flat || r.clipped || r.excessiveAmplitude).toBe(false);
      expect(r.peakToPeak).toBeCloseTo(40, 10);
      expect(r.standardDeviation).toBeCloseTo(20 / Math.SQRT2, 10);
      expect(r.warnings).toEqual([]);
    });
  });

  describe('when the signal is constant', () => {
    it('should flag flat and not clipped', () => {
      const r = qualityFlags(new Float64Array(100).fill(7));
      expect(r.flat).toBe(true);
      expect(r.clipped).toBe(false);
      expect(r.warnings[0]).toMatch(/^flat signal/);
    });
  });

  describe('when the sinusoid saturates at ±15', () => {
    it('should count the samples in runs at the rails', () => {
      const x = sine(256, 20).map((v) => Math.max(-15, Math.min(15, v)));
      let expected = 0;
      x.forEach((v) => {
        if (Math.abs(v) === 15) expected++;
      });
      const r = qualityFlags(x);
      expect(r.clipped).toBe(true);
      expect(r.clippedSamples).toBe(expected);
      expect(r.longestClipRun).toBeGreaterThanOrEqual(5);
      expect(qualityFlags(x, { clipRunSamples: r.longestClipRun + 1 }).clipped).toBe(false);
    });
  });

  describe('when the amplitude exceeds a threshold or samples are not finite', () => {
    it('should flag excessive peak-to-peak amplitude only above maxPeakToPeak', () => {
      expect(qualityFlags(sine(256, 20), { maxPeakToPeak: 39 }).excessiveAmplitude).toBe(true);
      expect(qualityFlags(sine(256, 20), { maxPeakToPeak: 41 }).excessiveAmplitude).toBe(false);
    });
    it('should count non-finite samples and leave them out of the statistics', () => {
      const x = sine(256, 20);
      x[3] = Number.NaN;
      const r = qualityFlags(x);
      expect(r.nonFiniteSamples).toBe(1);
      expect(Number.isFinite(r.standardDeviation)).toBe(true);
      expect(r.warnings[0]).toMatch(/non-finite/);
    });
    it('should throw for invalid options', () => {
      expect(() => qualityFlags(sine(16, 1), { clipRunSamples: 1 })).toThrow(/clipRunSamples/);
      expect(() => qualityFlags(sine(16, 1), { flatThreshold: -1 })).toThrow(/flatThreshold/);
    });
  });
});
