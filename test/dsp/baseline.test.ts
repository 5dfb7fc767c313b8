import { describe, expect, it } from 'vitest';
import { baselineNormalize, baselineRows, type BaselineOptions } from '../../src/dsp/baseline.js';
import { createMorletPlan } from '../../src/dsp/morlet.js';
import { createRandom } from '../../src/common/random.js';

/** a [time][frequency] map from a function of (t, f) */
function map(T: number, F: number, value: (t: number, f: number) => number): Float64Array {
  return Float64Array.from({ length: T * F }, (_, i) => value(Math.floor(i / F), i % F));
}

describe('baselineNormalize', () => {
  describe('when power doubles after a constant baseline (hand-derived values)', () => {
    // 6 times × 2 frequencies; baseline rows 0–1 hold B = 4 (f0) and 0.5 (f1), later rows 2·B
    const trial = map(6, 2, (t, f) => (f === 0 ? 4 : 0.5) * (t < 2 ? 1 : 2));
    const base = { timeCount: 6, frequencyCount: 2, window: { startSample: 0, endSample: 2 } };
    it.each([
      ['decibel', 10 * Math.log10(2)], // 3.0103 dB
      ['percent', 100],
      ['ratio', 2],
    ] as const)('should give %s = %s after the baseline and the neutral value inside it', (mode, after) => {
      const r = baselineNormalize([trial], { ...base, mode });
      const neutral = mode === 'decibel' ? 0 : mode === 'percent' ? 0 : 1;
      for (let t = 0; t < 6; t++)
        for (let f = 0; f < 2; f++) {
          expect(r.average[t * 2 + f]).toBeCloseTo(t < 2 ? neutral : after, 12);
        }
      expect(Array.from(r.baselineMean)).toEqual([4, 0.5]);
      expect(r.warnings).toEqual([]);
    });
  });

  describe('when the mode is zscore', () => {
    it('should use the baseline mean and the n − 1 standard deviation (baseline 1, 2, 3: mean 2, s = 1; P = 5 gives z = 3)', () => {
      const trial = map(5, 1, (t) => [1, 2, 3, 5, 2][t]!);
      const r = baselineNormalize([trial], { mode: 'zscore', timeCount: 5, frequencyCount: 1, window: { startSample: 0, endSample: 3 } });
      expect(Array.from(r.average)).toEqual([-1, 0, 1, 3, 0]);
      expect(r.baselineStandardDeviation[0]).toBe(1);
    });

    it('should give NaN and a warning, not a number, when the baseline has no spread', () => {
      const r = baselineNormalize([map(4, 1, () => 3)], { mode: 'zscore', timeCount: 4, frequencyCount: 1, window: { startSample: 0, endSample: 2 } });
      expect(r.average.every(Number.isNaN)).toBe(true);
      expect(r.warnings[0]).toMatch(/frequency index 0/);
    });
  });

  describe('when trials are averaged and kept', () => {
    it('should normalise the trial mean by its own baseline and each trial by its own', () => {
      const a = map(4, 1, (t) => (t < 2 ? 1 : 3));
      const b = map(4, 1, (t) => (t < 2 ? 3 : 3));
      const r = baselineNormalize([a, b], { mode: 'ratio', timeCount: 4, frequencyCount: 1, window: { startSample: 0, endSample: 2 }, perTrial: true });
      // mean map: 2, 2, 3, 3 → ratio 1, 1, 1.5, 1.5
      expect(Array.from(r.average)).toEqual([1, 1, 1.5, 1.5]);
      expect(Array.from(r.trials![0]!)).toEqual([1, 1, 3, 3]);
      expect(Array.from(r.trials![1]!)).toEqual([1, 1, 1, 1]);
      expect(r.trialCount).toBe(2);
      // the inputs are not modified
      expect(Array.from(a)).toEqual([1, 1, 3, 3]);
    });
  });

  describe('when the baseline is a time range', () => {
    it('should take the rows with start ≤ t ≤ end, both ends included', () => {
      const times = Float64Array.from({ length: 11 }, (_, i) => -0.5 + i * 0.1);
      expect(baselineRows({ startTime: -0.2, endTime: 0, times }, 11)).toEqual({ start: 3, end: 6 });
      expect(() => baselineRows({ startTime: 2, endTime: 3, times }, 11)).toThrow(RangeError);
    });
  });

  describe('when edge cells are excluded', () => {
    it('should leave them out of the statistics and warn where nothing is left', () => {
      const trial = map(4, 2, (t) => t + 1);
      const exclude = map(4, 2, (t, f) => (f === 1 || t === 0 ? 1 : 0));
      const r = baselineNormalize([trial], {
        mode: 'ratio',
        timeCount: 4,
        frequencyCount: 2,
        window: { startSample: 0, endSample: 2 },
        exclude: Uint8Array.from(exclude),
      });
      expect(r.baselineMean[0]).toBe(2); // only row 1 counts
      expect(Array.from(r.baselineCounts)).toEqual([1, 0]);
      expect(Number.isNaN(r.average[1]!)).toBe(true);
      expect(r.warnings).toHaveLength(1);
    });
  });

  describe('when a 10 Hz burst 0.3–0.6 s after the event is in half the channels (invented data)', () => {
    it('should show > 3 dB at 10 Hz inside the burst in burst channels and |dB| < 1 elsewhere', () => {
      const fs = 250,
        epochs = 30;
      const random = createRandom(2024);
      // epoch −1.0 … 1.5 s; Morlet at 6, 10, 20 Hz, 7 cycles; baseline −0.5 … −0.2 s with the edge cells left out
      const plan = createMorletPlan(Math.round(2.5 * fs), { samplingRate: fs, frequencies: [6, 10, 20], cycles: 7 });
      const times = Float64Array.from(plan.times, (t) => t - 1);
      const options: BaselineOptions = {
        mode: 'decibel',
        timeCount: plan.timeCount,
        frequencyCount: 3,
        window: { startTime: -0.5, endTime: -0.2, times },
        exclude: plan.edgeMask,
      };
      const results = [true, false].map((burst) => {
        const maps = Array.from({ length: epochs }, () =>
          plan.power(
            Float64Array.from({ length: plan.length }, (_, i) => {
              const t = i / fs - 1;
              return random.normal() + (burst && t >= 0.3 && t < 0.6 ? 1.5 * Math.sin(2 * Math.PI * 10 * t + random.uniform()) : 0);
            }),
          ),
        );
        const r = baselineNormalize(maps, options);
        expect(r.warnings).toEqual([]);
        // at 6 Hz, 3σ_t = 0.557 s reaches past −0.5 s, so only part of the baseline is used
        expect(r.baselineCounts[0]).toBeLessThan(r.baselineCounts[1]!);
        return r.average;
      });
      const at = (t: number, f: number): number => Math.round((t + 1) * fs) * 3 + f;
      expect(results[0]![at(0.45, 1)]!).toBeGreaterThan(3);
      expect(Math.abs(results[1]![at(0.45, 1)]!)).toBeLessThan(1);
      // 20 Hz is > 4 σ_f = 4·10/7 Hz away from the burst and must not light up
      expect(Math.abs(results[0]![at(0.45, 2)]!)).toBeLessThan(1);
    });
  });

  describe('when the options are wrong', () => {
    const trial = new Float64Array(8);
    const ok: BaselineOptions = { mode: 'decibel', timeCount: 4, frequencyCount: 2, window: { startSample: 0, endSample: 2 } };
    it.each([
      ['mode', { ...ok, mode: 'log' }, TypeError],
      ['endSample', { ...ok, window: { startSample: 2, endSample: 2 } }, RangeError],
      ['startSample', { ...ok, window: { startSample: -1, endSample: 2 } }, RangeError],
      ['timeCount', { ...ok, timeCount: 3 }, RangeError],
      ['exclude', { ...ok, exclude: new Uint8Array(3) }, RangeError],
    ] as const)('should reject a bad %s', (name, options, kind) => {
      expect(() => baselineNormalize([trial], options as unknown as BaselineOptions)).toThrow(kind);
      if (name !== 'timeCount') expect(() => baselineNormalize([trial], options as unknown as BaselineOptions)).toThrow(name);
    });

    it('should reject an empty trial list', () => {
      expect(() => baselineNormalize([], ok)).toThrow(/trials/);
    });
  });
});
