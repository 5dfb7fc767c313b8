import { describe, expect, it } from 'vitest';
import type { PowerLawFit } from '../../src/features/power-law.js';
import { peakFrequency } from '../../src/features/peak.js';
import { multitaper } from '../../src/dsp/multitaper.js';
import { periodogram } from '../../src/dsp/periodogram.js';

const f = Float64Array.from({ length: 241 }, (_, k) => k * 0.25);
const flatBackground = (log10Level: number): PowerLawFit => ({
  intercept: log10Level,
  slope: 0,
  rSquared: 1,
  residualRms: 0,
  binCount: 10,
  inlierFraction: 1,
  warnings: [],
});
const powerLaw = (intercept: number, beta: number): Float64Array => f.map((v) => (v > 0 ? 10 ** (intercept - beta * Math.log10(v)) : 0));

describe('peakFrequency', () => {
  describe('when the peak is Gaussian in frequency (a parabola in ln P)', () => {
    it('should recover the centre and height exactly (parabolic interpolation is exact here) to 1e-9', () => {
      const p = f.map((v) => Math.exp(-((v - 10.3) ** 2) / (2 * 0.8 ** 2)));
      const r = peakFrequency(f, p, { range: [8, 13], background: flatBackground(-3) });
      expect(Math.abs(r.frequency! - 10.3)).toBeLessThan(1e-9);
      expect(Math.abs(r.power! - 1)).toBeLessThan(1e-9);
      expect(r.heightDb!).toBeGreaterThan(29);
    });
  });

  describe('when a Hann-windowed sinusoid falls between bins', () => {
    it('should land within 0.02 bin of the tone (log-parabolic interpolation on the Hann main lobe)', () => {
      for (const tone of [10, 10.1, 10.25, 10.4, 10.5]) {
        const n = 256,
          fs = 64;
        const x = Float64Array.from({ length: n }, (_, t) => Math.sin((2 * Math.PI * tone * t) / fs));
        const r = periodogram(x, { samplingRate: fs, window: 'hann', detrend: 'none' });
        const peak = peakFrequency(
          r.frequencies,
          r.psd.map((v) => v + 1e-6),
          { range: [8, 13], background: flatBackground(-6) },
        );
        expect(Math.abs(peak.frequency! - tone) / (fs / n), `tone ${tone}`).toBeLessThan(0.02);
      }
    });
  });

  describe('when an alpha peak sits on a 1/f background', () => {
    const background = powerLaw(1.2, 1.5);
    const p = background.map((v, k) => v + 4 * background[40]! * Math.exp(-((f[k]! - 10.2) ** 2) / 2));
    it('should find it near 10.2 Hz (the sloping background pulls it down by < 0.1 Hz) against the fitted background', () => {
      const r = peakFrequency(f, p, { range: [8, 13] });
      expect(Math.abs(r.frequency! - 10.2)).toBeLessThan(0.1);
      // At 10 Hz the peak is 5× the background: ≈ 7 dB.
      expect(Math.abs(r.heightDb! - 10 * Math.log10(1 + 4 * Math.exp(-(0.2 ** 2) / 2)))).toBeLessThan(0.2);
      expect(Math.abs(-r.background.slope! - 1.5)).toBeLessThan(1e-6);
    });
    it('should pick the local maximum standing highest above the background when there are two', () => {
      const q = p.map((v, k) => v + 8 * background[48]! * Math.exp(-((f[k]! - 12) ** 2) / 0.5));
      expect(Math.abs(peakFrequency(f, q, { range: [8, 13] }).frequency! - 12)).toBeLessThan(0.1);
    });
  });

  describe('when nothing stands above the background', () => {
    it('should return null with a warning for a pure 1/f spectrum (no local maximum)', () => {
      const r = peakFrequency(f, powerLaw(1, 1), { range: [8, 13] });
      expect(r.frequency).toBeNull();
      expect(r.warnings).toContain('no local maximum in [8, 13] Hz');
    });
    it('should return null with a warning when the bump is below minHeightDb', () => {
      const background = powerLaw(1, 1);
      // A narrow bump 1.8× the background (2.55 dB): a local maximum, but below the 3 dB default.
      const p = background.map((v, k) => v * (1 + 0.8 * Math.exp(-((f[k]! - 10) ** 2) / (2 * 0.5 ** 2))));
      const r = peakFrequency(f, p, { range: [8, 13] });
      expect(r.frequency).toBeNull();
      expect(r.warnings.at(-1)).toMatch(/^no peak in \[8, 13\] Hz stands 3 dB above the power-law background/);
      // With a 2 dB threshold it counts; the 1/f slope pulls the maximum below 10 Hz by < 0.1 Hz.
      expect(Math.abs(peakFrequency(f, p, { range: [8, 13], minHeightDb: 2 }).frequency! - 10)).toBeLessThan(0.1);
    });
  });

  describe('when a 10.3 Hz tone in noise goes through the multitaper estimator', () => {
    it('should report the tone within W/2 = 0.25 Hz (multitaper turns a line into a plateau of width 2W = 1 Hz)', () => {
      const fs = 128,
        n = 512;
      // Deterministic noise-like samples (sine-hash, uniform on [−½, ½)), synthetic.
      const x = Float64Array.from({ length: n }, (_, t) => {
        const h = Math.sin((t + 1) * 12.9898) * 43758.5453;
        return h - Math.floor(h) - 0.5 + 0.5 * Math.sin((2 * Math.PI * 10.3 * t) / fs);
      });
      const r = multitaper(x, { samplingRate: fs, timeBandwidth: 2, weighting: 'adaptive' });
      const peak = peakFrequency(r.frequencies, r.psd, { range: [8, 13] });
      expect(Math.abs(peak.frequency! - 10.3)).toBeLessThan(0.25);
      expect(peak.heightDb!).toBeGreaterThan(10);
    });
  });
});
