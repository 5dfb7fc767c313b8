import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { bandPowers, bandRatios, totalPower } from '../../src/features/bands.js';
import { DEFAULT_BANDS } from '../../src/recipes/bands.js';

/** A spectrum on a 0.5 Hz grid from 0 to 64 Hz (fs = 128 Hz, n = 256). */
function grid(values: (f: number) => number) {
  const frequencies = Float64Array.from({ length: 129 }, (_, k) => (k * 128) / 256);
  return { frequencies, psd: frequencies.map(values) };
}

describe('bandPowers', () => {
  it('should let contiguous bands add up to the total, so their relative powers sum to 1', () => {
    const random = createRandom(9);
    const { frequencies, psd } = grid(() => random.uniform());
    const bands = [
      { name: 'a', low: 1, high: 4 },
      { name: 'b', low: 4, high: 8 },
      { name: 'c', low: 8, high: 13 },
      { name: 'd', low: 13, high: 30 },
      { name: 'e', low: 30, high: 45.5 },
    ];
    const powers = bandPowers(frequencies, psd, bands, [1, 45], 0.5);
    const sum = powers.reduce((s, p) => s + p.relative!, 0);
    // Half-open bands [low, high) tile [1, 45.5) with no bin counted twice or missed (DESIGN.md definition).
    expect(sum).toBeCloseTo(1, 14);
    expect(powers.reduce((s, p) => s + p.absolute, 0)).toBeCloseTo(totalPower(frequencies, psd, [1, 45], 0.5), 12);
  });

  it.each([4, 8, 13, 30])('should count a bin exactly at %d Hz in the band above it, not below (half-open convention)', (edge) => {
    const { frequencies, psd } = grid((f) => (f === edge ? 1 : 0));
    const powers = bandPowers(frequencies, psd, DEFAULT_BANDS, [0, 64], 0.5);
    const holder = powers.filter((p) => p.absolute > 0);
    expect(holder).toHaveLength(1);
    expect(holder[0]!.low).toBe(edge);
    expect(holder[0]!.absolute).toBe(0.5);
  });

  it('should report absolute = Σ PSD·Δf, decibels = 10·log10(absolute), and null dB for zero power', () => {
    const { frequencies, psd } = grid((f) => (f >= 8 && f < 13 ? 2 : 0));
    const [alpha, theta] = bandPowers(frequencies, psd, [DEFAULT_BANDS[2]!, DEFAULT_BANDS[1]!], [0, 64], 0.5);
    expect(alpha!.bins).toBe(10);
    expect(alpha!.absolute).toBe(10);
    expect(alpha!.decibels).toBe(10);
    expect(alpha!.relative).toBe(1);
    expect(theta!.absolute).toBe(0);
    expect(theta!.decibels).toBeNull();
  });

  it('should form ratios of absolute powers by band name', () => {
    const { frequencies, psd } = grid((f) => (f >= 4 && f < 8 ? 3 : f >= 13 && f < 30 ? 1 : 0));
    const powers = bandPowers(frequencies, psd, DEFAULT_BANDS, [0, 64], 0.5);
    const [ratio, none] = bandRatios(powers, [
      { name: 'theta/beta', numerator: 'theta', denominator: 'beta' },
      { name: 'beta/alpha', numerator: 'beta', denominator: 'alpha' },
    ]);
    // theta: 8 bins × 3 × 0.5 = 12; beta: 34 bins × 1 × 0.5 = 17.
    expect(ratio!.value).toBeCloseTo(12 / 17, 15);
    expect(none!.value).toBeNull();
  });
});
