import { describe, expect, it } from 'vitest';
import { createSpectrogramPlan, spectrogram, type SpectrogramOptions } from '../../src/dsp/spectrogram.js';
import { welch } from '../../src/dsp/welch.js';
import { makeWindow, type WindowName } from '../../src/dsp/windows.js';
import type { DetrendKind } from '../../src/dsp/detrend.js';
import { createRandom } from '../../src/common/random.js';
import { float32s, float64s, readWelchFixture, worstRelativeError } from '../fixtures/welch/fixture.js';

interface SpectrogramCase {
  name: string;
  samplingRate: number;
  segmentSamples: number;
  overlapSamples: number;
  fftLength: number;
  window: WindowName | null;
  timeBandwidth?: number;
  taperCount?: number;
  detrend: DetrendKind;
  x32: string;
  frequencies: string;
  times: string;
  power: string;
  timeCount: number;
  frequencyCount: number;
}
const fixture = readWelchFixture<{ provenance: { scipy: string }; cases: SpectrogramCase[] }>('../tf/spectrogram.json');

function optionsOf(c: SpectrogramCase): SpectrogramOptions {
  const base = { samplingRate: c.samplingRate, segmentSamples: c.segmentSamples, overlapSamples: c.overlapSamples, fftLength: c.fftLength, detrend: c.detrend };
  return c.window === null ? { ...base, tapers: { timeBandwidth: c.timeBandwidth!, taperCount: c.taperCount! } } : { ...base, window: c.window };
}

describe('spectrogram', () => {
  describe(`when compared with scipy.signal.spectrogram (scipy ${fixture.provenance.scipy}, density, mode psd)`, () => {
    it.each(fixture.cases.map((c) => [c.name, c] as const))('should match %s to 1e-9 relative', (_name, c) => {
      const result = spectrogram(float32s(c.x32), optionsOf(c));
      expect(result.timeCount).toBe(c.timeCount);
      expect(result.frequencyCount).toBe(c.frequencyCount);
      // brief: ≤ 1e-9 relative on bins above 1e-12 of the peak; times and frequencies as scipy gives them
      expect(worstRelativeError(result.power, float64s(c.power), 1e-12)).toBeLessThan(1e-9);
      expect(worstRelativeError(result.times, float64s(c.times), 0)).toBeLessThan(1e-14);
      expect(worstRelativeError(result.frequencies, float64s(c.frequencies), 0)).toBeLessThan(1e-14);
      expect(result.taperCount).toBe(c.taperCount ?? 1);
    });
  });

  describe('when the window positions are averaged', () => {
    it('should give the Welch PSD of the same segments (Welch 1967: the mean of the modified periodograms)', () => {
      const random = createRandom(7);
      const x = Float64Array.from({ length: 3000 }, () => random.normal());
      const options = { samplingRate: 200, segmentSamples: 250, overlapSamples: 125, fftLength: 250, detrend: 'linear' as const };
      const s = spectrogram(x, { ...options, window: 'hann' });
      const w = welch(x, { ...options, window: makeWindow('hann', 250), average: 'mean' });
      const mean = new Float64Array(s.frequencyCount);
      for (let t = 0; t < s.timeCount; t++) for (let k = 0; k < s.frequencyCount; k++) mean[k] = mean[k]! + s.power[t * s.frequencyCount + k]! / s.timeCount;
      expect(s.timeCount).toBe(w.segmentCount);
      expect(worstRelativeError(mean, w.psd, 0)).toBeLessThan(1e-12);
    });
  });

  describe('when a tone burst is analysed', () => {
    it('should place it at its time and frequency within half a window and one bin', () => {
      // invented burst: 40 Hz from 2.0 s to 2.5 s in white noise at 500 Hz, 128-sample windows
      const fs = 500;
      const random = createRandom(11);
      const x = Float64Array.from({ length: 5 * fs }, (_, i) => 0.2 * random.normal() + (i >= 2 * fs && i < 2.5 * fs ? Math.sin((2 * Math.PI * 40 * i) / fs) : 0));
      const s = spectrogram(x, { samplingRate: fs, segmentSamples: 128, overlapSamples: 96 });
      let best = 0;
      for (let i = 1; i < s.power.length; i++) if (s.power[i]! > s.power[best]!) best = i;
      const t = s.times[Math.floor(best / s.frequencyCount)]!;
      const f = s.frequencies[best % s.frequencyCount]!;
      expect(Math.abs(f - 40)).toBeLessThanOrEqual(fs / 128);
      expect(t).toBeGreaterThanOrEqual(2.0 - 128 / fs / 2);
      expect(t).toBeLessThanOrEqual(2.5 + 128 / fs / 2);
    });
  });

  describe('when white noise is integrated over frequency (Parseval, common practice)', () => {
    it('should give the mean square of each window within 1e-12 with a rectangular window and no detrend', () => {
      const random = createRandom(3);
      const x = Float64Array.from({ length: 1024 }, () => random.normal());
      const s = spectrogram(x, { samplingRate: 128, segmentSamples: 128, overlapSamples: 0, window: 'rectangular', detrend: 'none' });
      const df = 128 / 128;
      for (let t = 0; t < s.timeCount; t++) {
        let integral = 0,
          meanSquare = 0;
        for (let k = 0; k < s.frequencyCount; k++) integral += s.power[t * s.frequencyCount + k]! * df;
        for (let j = 0; j < 128; j++) meanSquare += x[t * 128 + j]! ** 2 / 128;
        expect(Math.abs(integral - meanSquare) / meanSquare).toBeLessThan(1e-12);
      }
    });
  });

  describe('when a plan is reused', () => {
    it('should give the same numbers as a fresh call and honour out', () => {
      const random = createRandom(5);
      const a = Float64Array.from({ length: 600 }, () => random.normal());
      const b = Float64Array.from({ length: 600 }, () => random.normal());
      const options: SpectrogramOptions = { samplingRate: 100, segmentSamples: 100, overlapSamples: 50, tapers: { timeBandwidth: 2 } };
      const plan = createSpectrogramPlan(600, options);
      plan.compute(a);
      const out = new Float64Array(plan.timeCount * plan.frequencyCount);
      const again = plan.compute(b, out);
      expect(again.power).toBe(out);
      expect(Array.from(out)).toEqual(Array.from(spectrogram(b, options).power));
      expect(again.taperCount).toBe(3);
      expect(again.degreesOfFreedom).toBe(6);
    });
  });

  describe('when the options are wrong', () => {
    const x = new Float64Array(500);
    it.each([
      ['segmentSamples', { samplingRate: 100, segmentSamples: 600, overlapSamples: 0 }, RangeError],
      ['overlapSamples', { samplingRate: 100, segmentSamples: 100, overlapSamples: 100 }, RangeError],
      ['fftLength', { samplingRate: 100, segmentSamples: 100, overlapSamples: 0, fftLength: 50 }, RangeError],
      ['samplingRate', { samplingRate: 0, segmentSamples: 100, overlapSamples: 0 }, RangeError],
      ['window', { samplingRate: 100, segmentSamples: 100, overlapSamples: 0, window: 'kaiser' }, TypeError],
      ['window', { samplingRate: 100, segmentSamples: 100, overlapSamples: 0, window: 'hann', tapers: { timeBandwidth: 2 } }, TypeError],
      ['detrend', { samplingRate: 100, segmentSamples: 100, overlapSamples: 0, detrend: 'quadratic' }, TypeError],
    ] as const)('should reject a bad %s', (name, options, kind) => {
      expect(() => spectrogram(x, options as unknown as SpectrogramOptions)).toThrow(kind);
      expect(() => spectrogram(x, options as unknown as SpectrogramOptions)).toThrow(name === 'window' ? /window/ : new RegExp(name));
    });
  });
});
