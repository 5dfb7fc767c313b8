import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { analyze } from '../../src/engine/analyze.js';
import type { FeatureRecord, FeatureResult } from '../../src/engine/record.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe } from '../../src/recipes/resolve.js';
import type { Signal } from '../../src/signals/signal.js';

function run(signal: Signal, recipe: unknown) {
  const pinned = normalizeRecipe(recipe);
  return analyze(signal, resolveRecipe(pinned.recipe, pinned.hash, signal), { signalId: 'sig_test', sha256: 'x', recipeId: pinned.id, mode: 'local' }) as FeatureRecord<FeatureResult>;
}

function build(fs: number, epochs: number, channels: string[], samples: number, fill: (e: number, c: number, i: number) => number): Signal {
  const data = new Float64Array(epochs * channels.length * samples);
  for (let e = 0; e < epochs; e++) for (let c = 0; c < channels.length; c++) for (let i = 0; i < samples; i++) data[(e * channels.length + c) * samples + i] = fill(e, c, i);
  return { samplingRate: fs, channels, unit: 'uV', epochCount: epochs, samplesPerEpoch: samples, data };
}

const white = (seed: number, fs: number, epochs: number, samples: number, sigma = 1) => {
  const random = createRandom(seed);
  return build(fs, epochs, ['A'], samples, () => sigma * random.normal());
};

describe('when the method is a periodogram', () => {
  it('should give an on-bin tone of amplitude A the power A²/2 in its band (common practice; docs/references.md §4)', () => {
    const fs = 200;
    const signal = build(fs, 1, ['Oz'], 400, (_e, _c, i) => 3 * Math.cos((2 * Math.PI * 10 * i) / fs));
    const record = run(signal, { method: 'periodogram', detrend: 'none', bands: [{ name: 'alpha', low: 8, high: 13 }] });
    expect(record.recipe.derived).toMatchObject({ segmentSamples: 400, fftLength: 400, segmentsPerEpoch: 1, frequencyResolution: 0.5 });
    expect(record.result.channels[0]!.bands[0]!.absolute).toBeCloseTo(4.5, 10);
  });
});

describe('when the method is multitaper', () => {
  it('should resolve K = 2NW − 1 and W = NW·fs/N, and report 2K degrees of freedom per epoch with equal weights', () => {
    const signal = white(3, 256, 4, 512);
    const record = run(signal, { method: 'multitaper', timeBandwidth: 4, taperWeighting: 'equal', confidence: 0.95 });
    // K = 2NW − 1 = 7 is the usual choice (docs/references.md §3, from memory of Percival & Walden).
    expect(record.recipe.derived).toMatchObject({ taperCount: 7, halfBandwidth: 2, segmentSamples: 512, fftLength: 512 });
    const channel = record.result.channels[0]!;
    // Equal-weight multitaper: 2K χ² degrees of freedom per epoch; four independent epochs add up.
    expect(channel.degreesOfFreedom![10]).toBe(4 * 14);
    expect(channel.degreesOfFreedom![0]).toBe(4 * 7);
    expect(channel.psdLower![10]).toBeLessThan(channel.psd[10]!);
    expect(channel.psdUpper![10]).toBeGreaterThan(channel.psd[10]!);
  });

  it('should integrate white noise to its variance (Parseval, docs/references.md §4) within sampling error', () => {
    const signal = white(4, 256, 20, 512, 2);
    const record = run(signal, { method: 'multitaper', bands: [{ name: 'all', low: 0, high: 128.5 }] });
    // σ² = 4; 20 epochs × 512 samples: the estimate's relative standard error is well below 3 %.
    expect(record.result.channels[0]!.bands[0]!.absolute).toBeGreaterThan(4 * 0.95);
    expect(record.result.channels[0]!.bands[0]!.absolute).toBeLessThan(4 * 1.05);
  });

  it('should refuse more tapers than 2NW by name', () => {
    expect(() => normalizeRecipe({ method: 'multitaper', timeBandwidth: 2, taperCount: 5 })).toThrow(/taperCount 5 exceeds 2·timeBandwidth/);
  });
});

describe('when a Welch recipe asks for confidence intervals', () => {
  it('should report ν = 36N²/(19N − 1) per epoch for Hann at 50 % overlap (Percival & Walden 292b; docs/references.md §2)', () => {
    const signal = white(5, 250, 3, 2500);
    const record = run(signal, { method: 'welch', confidence: 0.95 });
    const n = record.recipe.derived.segmentsPerEpoch;
    expect(n).toBe(9);
    const perEpoch = (36 * n * n) / (19 * n - 1);
    expect(perEpoch).toBeCloseTo(17.152941, 5);
    expect(record.result.channels[0]!.degreesOfFreedom![20]).toBeCloseTo(3 * perEpoch, 9);
  });
});

describe('when features are named in the recipe', () => {
  const fs = 256;
  const random = createRandom(11);
  // White background (σ = 0.5), a 10.25 Hz rhythm of amplitude 4 on a bin (Δf = 0.25 Hz for 4 s
  // segments) and 50 Hz mains of amplitude 3 on Cz. Hand figures used below (docs/references.md §4):
  // tone peak density (A²/2)/(1.5·Δf) = 8/0.375 ≈ 21 µV²/Hz; noise density 2σ²/fs ≈ 0.00195 µV²/Hz.
  const signal = build(fs, 8, ['O1', 'Cz'], 1024, (_e, c, i) => {
    const t = i / fs;
    return 0.5 * random.normal() + 4 * Math.sin(2 * Math.PI * 10.25 * t) + (c === 1 ? 3 * Math.sin(2 * Math.PI * 50 * t) : 0);
  });
  const record = run(signal, {
    method: 'welch',
    segmentSeconds: 4,
    features: { peakFrequency: {}, spectralEdge: { range: [1, 45] }, entropy: {}, centroid: { range: [5, 15] }, lineNoise: {}, powerLaw: { range: [2, 40] } },
  });
  const [o1, cz] = record.result.channels;

  it('should find the alpha peak within 0.05 Hz (a fifth of a bin) of its frequency', () => {
    // Parabolic interpolation around an on-bin tone lands within a fraction of a bin (common practice).
    expect(o1!.features!.peakFrequency!.frequency!).toBeCloseTo(10.25, 1);
    // 21 over 0.00195 is about 40 dB above the background; 10 dB is a wide margin below that.
    expect(o1!.features!.peakFrequency!.heightDb!).toBeGreaterThan(10);
  });

  it('should place the spectral edge and centroid where the tone holds the power', () => {
    // The tone holds 8 µV² against ≈ 0.086 µV² of noise in 1–45 Hz, so half the power is reached within
    // its three Hann bins (10–10.5 Hz) and the spectrum is concentrated in about 3 of 177 bins
    // (entropy near ln 3 / ln 177 ≈ 0.2); the bounds below are margins around those hand figures.
    const sef50 = o1!.features!.spectralEdge!.edges.find((e) => e.percentile === 50)!.frequency!;
    expect(sef50).toBeGreaterThan(9.5);
    expect(sef50).toBeLessThan(11);
    expect(o1!.features!.centroid!.frequency!).toBeCloseTo(10.25, 0);
    expect(o1!.features!.entropy!.value!).toBeGreaterThan(0);
    expect(o1!.features!.entropy!.value!).toBeLessThan(0.8);
  });

  it('should flag mains contamination only on the channel that carries it', () => {
    // Mains puts 4.5 µV² into the ±1 Hz line band (9 bins, 2.25 Hz): mean ≈ 2 µV²/Hz over a noise
    // neighbourhood of ≈ 0.00195 µV²/Hz, a ratio near 1000; without mains the ratio is noise over
    // noise, near 1 (3 is a margin for the spread of the estimates).
    expect(cz!.features!.lineNoise!.ratio!).toBeGreaterThan(100);
    expect(o1!.features!.lineNoise!.ratio!).toBeLessThan(3);
  });

  it('should report a power-law slope near 0 for a white background', () => {
    // White noise has PSD ∝ f⁰ (common practice); the robust fit down-weights the 10 Hz line. 0.2 is
    // a margin for the spread of a 4 s Welch estimate over 2–40 Hz.
    expect(Math.abs(o1!.features!.powerLaw!.slope!)).toBeLessThan(0.2);
    expect(o1!.features!.powerLaw!.inlierFraction!).toBeLessThan(1);
  });

  it('should give the same resultHash when run again', () => {
    const again = run(signal, {
      method: 'welch',
      segmentSeconds: 4,
      features: { peakFrequency: {}, spectralEdge: { range: [1, 45] }, entropy: {}, centroid: { range: [5, 15] }, lineNoise: {}, powerLaw: { range: [2, 40] } },
    });
    expect(again.resultHash).toBe(record.resultHash);
  });
});

describe('when quality flags are asked for', () => {
  it('should flag flat and clipped channels and drop those epochs from the averages when told to', () => {
    const random = createRandom(2);
    const signal = build(100, 4, ['F3', 'F4'], 400, (e, c, i) => {
      if (e === 1 && c === 0) return 0; // flat
      const v = 20 * random.normal();
      if (e === 2 && c === 1) return i >= 100 && i < 120 ? 25 : Math.max(-25, Math.min(25, v)); // held at the +25 rail
      return i % 97 === 0 && e === 3 ? 400 : v; // e = 3: huge spikes
    });
    const record = run(signal, { method: 'welch', segmentSeconds: 1, features: { quality: { maxPeakToPeak: 300, dropFlagged: true } } });
    const q = record.result.quality!;
    expect(q.map((e) => e.index)).toEqual([0, 1, 2, 3]);
    expect(q[1]!.channels[0]!.flat).toBe(true);
    expect(q[2]!.channels[1]!.clipped).toBe(true);
    expect(q[3]!.channels[0]!.excessiveAmplitude).toBe(true);
    expect(record.result.estimate.epochsUsed).toBe(1);
    expect(record.result.estimate.epochsSkipped.map((s) => [s.index, s.reason])).toEqual([
      [1, 'quality'],
      [2, 'quality'],
      [3, 'quality'],
    ]);
    expect(record.result.estimate.epochsSkipped[0]!.detail).toContain('F3: flat');
  });
});

describe('when the background is a power law of known exponent', () => {
  it('should recover the slope −β exactly from a sum of on-bin sinusoids with amplitudes f^(−β/2)', () => {
    // Each on-bin sinusoid of amplitude A puts A²/2 into one periodogram bin (common practice;
    // docs/references.md §4), so the PSD is exactly ∝ f^−β at the bins: the fit must return −β.
    const fs = 128;
    const n = 512;
    const beta = 1.5;
    const random = createRandom(42);
    const phases = Array.from({ length: n / 2 }, () => 2 * Math.PI * random.uniform());
    const signal = build(fs, 1, ['Pz'], n, (_e, _c, i) => {
      let v = 0;
      for (let k = 1; k < n / 2; k++) {
        const f = (k * fs) / n;
        v += f ** (-beta / 2) * Math.cos((2 * Math.PI * k * i) / n + phases[k]!);
      }
      return v;
    });
    const record = run(signal, { method: 'periodogram', detrend: 'none', features: { powerLaw: { range: [2, 40] } }, bands: [{ name: 'x', low: 1, high: 40 }] });
    const fit = record.result.channels[0]!.features!.powerLaw!;
    expect(fit.slope!).toBeCloseTo(-beta, 9);
    expect(fit.rSquared!).toBeCloseTo(1, 9);
    // intercept: log10 of A²/(2Δf) at 1 Hz = log10(1 / (2 · 0.25)).
    expect(fit.intercept!).toBeCloseTo(Math.log10(1 / (2 * (fs / n))), 9);
  });
});
