import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { detrendInto, type DetrendKind } from '../../src/dsp/detrend.js';
import { binFrequencies, NoSegmentsLeftError, requireWindowEnergy, taperSegment, taperSegmentPair } from '../../src/dsp/spectral-core.js';
import { createWelchPlan } from '../../src/dsp/welch.js';
import { makeWindow } from '../../src/dsp/windows.js';

function normals(n: number, seed: number): Float64Array {
  const random = createRandom(seed);
  return new Float64Array(n).map(() => random.normal() + 0.01 * n);
}

describe('binFrequencies', () => {
  it('should give k·fs/n for k = 0..⌊n/2⌋, as numpy.fft.rfftfreq does for odd and even n (common practice)', () => {
    expect(Array.from(binFrequencies(5, 10))).toEqual([0, 2, 4]);
    expect(Array.from(binFrequencies(4, 10))).toEqual([0, 2.5, 5]);
  });
});

describe('taperSegmentPair', () => {
  const x = normals(300, 3);
  const window = makeWindow('hann', 64);
  for (const detrend of ['none', 'mean', 'linear'] as DetrendKind[]) {
    it(`should load the same samples as tapering each segment on its own (detrend ${detrend})`, () => {
      const re = new Float64Array(100),
        im = new Float64Array(100),
        fit = new Float64Array(2);
      taperSegmentPair(x, 10, 150, window, detrend, fit, re, im);
      const a = new Float64Array(100),
        b = new Float64Array(100),
        scratch = new Float64Array(64);
      taperSegment(x, 10, window, detrend, scratch, a);
      taperSegment(x, 150, window, detrend, scratch, b);
      // Both forms detrend by the same least-squares fit (scipy.signal.detrend) on the same samples.
      for (let j = 0; j < 100; j++) {
        expect(re[j]).toBeCloseTo(a[j]!, 12);
        expect(im[j]).toBeCloseTo(b[j]!, 12);
      }
    });
  }

  it('should leave the second half zero when there is no second segment', () => {
    const re = new Float64Array(64),
      im = new Float64Array(64).fill(7);
    taperSegmentPair(x, 0, -1, window, 'mean', new Float64Array(2), re, im);
    expect(im.every((v) => v === 0)).toBe(true);
    const expected = detrendInto(x.subarray(0, 64), 'mean', new Float64Array(64)).map((v, j) => v * window[j]!);
    expect(Array.from(re)).toEqual(Array.from(expected));
  });
});

describe('requireWindowEnergy', () => {
  it('should refuse a window of zeros by naming the window', () => {
    expect(() => requireWindowEnergy(new Float64Array(8))).toThrow(/window must have finite, non-zero energy/);
  });
});

describe('NoSegmentsLeftError', () => {
  it('should be what a Welch plan throws when its filter refuses every segment, so callers need not read the wording', () => {
    const plan = createWelchPlan({
      samplingRate: 100,
      segmentSamples: 50,
      overlapSamples: 25,
      fftLength: 50,
      window: makeWindow('hann', 50),
      detrend: 'mean',
      average: 'mean',
      acceptSegment: () => false,
    });
    let caught: unknown;
    try {
      plan.compute(normals(200, 1));
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(NoSegmentsLeftError);
    expect(caught).toBeInstanceOf(RangeError);
    expect((caught as NoSegmentsLeftError).total).toBe(7);
  });
});
