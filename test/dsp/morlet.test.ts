import { describe, expect, it } from 'vitest';
import { createMorletPlan, DEFAULT_EDGE_SIGMAS, logFrequencies, morletPower, morletWavelet, POWER_FACTOR, SPECTRUM_CACHE_BYTES, waveletCacheBytes, type MorletOptions } from '../../src/dsp/morlet.js';
import { complexFftPlan } from '../../src/dsp/fft.js';
import { createRandom } from '../../src/common/random.js';
import { float32s, float64s, readWelchFixture } from '../fixtures/welch/fixture.js';

interface MorletCase {
  samplingRate: number;
  frequencies: number[];
  cycles: number[];
  x32: string;
  re: string;
  im: string;
}
const fixture = readWelchFixture<{ provenance: { numpy: string }; case: MorletCase }>('../tf/morlet.json');

/** largest |a − b| over all entries, divided by the largest |b| (a scale-free error for complex fields) */
function worstScaledError(aRe: Float64Array, aIm: Float64Array, bRe: Float64Array, bIm: Float64Array): number {
  let peak = 0,
    worst = 0;
  for (let i = 0; i < bRe.length; i++) {
    peak = Math.max(peak, Math.hypot(bRe[i]!, bIm[i]!));
    worst = Math.max(worst, Math.hypot(aRe[i]! - bRe[i]!, aIm[i]! - bIm[i]!));
  }
  return worst / peak;
}

function noise(n: number, seed: number, scale = 1): Float64Array {
  const random = createRandom(seed);
  return Float64Array.from({ length: n }, () => scale * random.normal());
}

/**
 * w[n] = Σ_{m<N} x[m]·ψ̃[n − m] straight from the published formula (Tallon-Baudry et al. 1996):
 * ψ̃[k] = exp(2πi·f·k/fs)·exp(−(k/fs)²/(2σ_t²))/G, σ_t = n_c/(2πf), |k| ≤ M = ceil(6σ_t·fs), with G
 * the envelope sum over the full ±M, built here without the module's wavelet code.
 */
function direct(x: Float64Array, fs: number, f: number, cycles: number): { re: Float64Array; im: Float64Array; M: number } {
  const sigma = cycles / (2 * Math.PI * f);
  const M = Math.ceil(6 * sigma * fs);
  let G = 0;
  for (let k = -M; k <= M; k++) G += Math.exp(-((k / fs) ** 2) / (2 * sigma * sigma));
  const re = new Float64Array(x.length),
    im = new Float64Array(x.length);
  for (let n = 0; n < x.length; n++) {
    let sr = 0,
      si = 0;
    for (let m = 0; m < x.length; m++) {
      const k = n - m;
      if (Math.abs(k) > M) continue;
      const envelope = Math.exp(-((k / fs) ** 2) / (2 * sigma * sigma)) / G;
      const angle = (2 * Math.PI * f * k) / fs;
      sr += x[m]! * envelope * Math.cos(angle);
      si += x[m]! * envelope * Math.sin(angle);
    }
    re[n] = sr;
    im[n] = si;
  }
  return { re, im, M };
}

/** column j of a [time][frequency] field */
function column(field: Float64Array, F: number, j: number): Float64Array {
  return Float64Array.from({ length: field.length / F }, (_, i) => field[i * F + j]!);
}

describe('morletWavelet', () => {
  describe('when its spreads are measured (docs/references.md §7, f = 10 Hz, n_c = 7, COMPUTED values)', () => {
    const fs = 1000;
    const w = morletWavelet(10, 7, fs);

    it('should state σ_t = 0.111408 s, σ_f = 1.428571 Hz and σ_t·σ_f = 1/(2π)', () => {
      expect(w.sigmaTime).toBeCloseTo(0.111408, 6);
      expect(w.sigmaFrequency).toBeCloseTo(1.428571, 6);
      expect(Math.abs(w.sigmaTime * w.sigmaFrequency - 1 / (2 * Math.PI))).toBeLessThan(1e-15);
    });

    it('should have an envelope whose second moment gives σ_t and whose FWHM is 0.262347 s, to 1e-6', () => {
      let mass = 0,
        moment = 0,
        above = 0;
      const peak = Math.hypot(w.re[w.halfWidth]!, w.im[w.halfWidth]!);
      for (let j = 0; j < w.re.length; j++) {
        const t = (j - w.halfWidth) / fs;
        const a = Math.hypot(w.re[j]!, w.im[j]!);
        mass += a;
        moment += t * t * a;
        if (a >= peak / 2) above++;
      }
      expect(Math.abs(Math.sqrt(moment / mass) - 0.111408) / 0.111408).toBeLessThan(1e-5);
      // samples at or above half amplitude span the FWHM to within one sample period
      expect(Math.abs(above / fs - 0.262347)).toBeLessThanOrEqual(1 / fs);
    });

    it('should have an amplitude spectrum of spread σ_f and a power spectrum of spread σ_f/√2 (the √2 remark of §7)', () => {
      const n = 1 << 16;
      const re = new Float64Array(n),
        im = new Float64Array(n);
      re.set(w.re);
      im.set(w.im);
      complexFftPlan(n).transform(re, im);
      let m1 = 0,
        s1 = 0,
        m2 = 0,
        s2 = 0;
      for (let k = 0; k < n; k++) {
        const nu = ((k <= n / 2 ? k : k - n) * fs) / n;
        // moments over ±8σ_f: beyond it only the truncation ripple (~1e-8) remains, which the (ν − f)² weight would inflate
        if (Math.abs(nu - 10) > 8 * w.sigmaFrequency) continue;
        const amplitude = Math.hypot(re[k]!, im[k]!);
        m1 += amplitude;
        s1 += (nu - 10) ** 2 * amplitude;
        m2 += amplitude ** 2;
        s2 += (nu - 10) ** 2 * amplitude ** 2;
      }
      expect(Math.abs(Math.sqrt(s1 / m1) - 1.428571) / 1.428571).toBeLessThan(1e-5);
      expect(Math.abs(Math.sqrt(s2 / m2) - 1.428571 / Math.SQRT2) / (1.428571 / Math.SQRT2)).toBeLessThan(1e-5);
      // unit gain at the centre frequency, by the DTFT at exactly 10 Hz (off the FFT grid)
      let dtRe = 0,
        dtIm = 0;
      for (let j = 0; j < w.re.length; j++) {
        const angle = (-2 * Math.PI * 10 * (j - w.halfWidth)) / fs;
        dtRe += w.re[j]! * Math.cos(angle) - w.im[j]! * Math.sin(angle);
        dtIm += w.re[j]! * Math.sin(angle) + w.im[j]! * Math.cos(angle);
      }
      expect(Math.abs(dtRe - 1)).toBeLessThan(1e-12);
      expect(Math.abs(dtIm)).toBeLessThan(1e-12);
    });
  });
});

describe('morletPower', () => {
  describe(`when compared with numpy.convolve (numpy ${fixture.provenance.numpy}, sampled unit-gain wavelets)`, () => {
    it('should give the same coefficients to 1e-10 of the largest', () => {
      const c = fixture.case;
      const x = float32s(c.x32);
      // one frequency at a time, each with its own cycle count as in the fixture
      const F = c.frequencies.length;
      const re = new Float64Array(x.length * F),
        im = new Float64Array(x.length * F);
      c.frequencies.forEach((f, j) => {
        const w = createMorletPlan(x.length, { samplingRate: c.samplingRate, frequencies: [f], cycles: c.cycles[j]! }).coefficients(x);
        for (let i = 0; i < x.length; i++) {
          re[i * F + j] = w.re[i]!;
          im[i * F + j] = w.im[i]!;
        }
      });
      expect(worstScaledError(re, im, float64s(c.re), float64s(c.im))).toBeLessThan(1e-10);
    });
  });

  describe('when compared with a direct time-domain convolution', () => {
    it.each([
      ['growing cycles', 900, { low: 3, high: 80, count: 6 }],
      // at 2 Hz the wavelet (M = 836 samples each side) is longer than the epoch: only ±299 lags are kept
      ['wavelets longer than the epoch', 300, [2, 2.5, 60]],
    ] as const)('should agree to 1e-12 at every time and frequency (%s)', (_name, length, frequencies) => {
      const fs = 250;
      const x = noise(length, 21);
      const options: MorletOptions = { samplingRate: fs, frequencies, cycles: { low: 7, high: 10 } };
      const plan = createMorletPlan(x.length, options);
      const { re, im } = plan.coefficients(x);
      const F = plan.frequencyCount;
      const dRe = new Float64Array(re.length),
        dIm = new Float64Array(im.length);
      for (let j = 0; j < F; j++) {
        const w = morletWavelet(plan.frequencies[j]!, plan.cycles[j]!, fs);
        const M = w.halfWidth;
        for (let n = 0; n < x.length; n++) {
          let sr = 0,
            si = 0;
          // w(n) = Σ_m x[n − m]·ψ̃[m], zero outside the epoch
          for (let m = -M; m <= M; m++) {
            const k = n - m;
            if (k < 0 || k >= x.length) continue;
            sr += x[k]! * w.re[m + M]!;
            si += x[k]! * w.im[m + M]!;
          }
          dRe[n * F + j] = sr;
          dIm[n * F + j] = si;
        }
      }
      expect(worstScaledError(re, im, dRe, dIm)).toBeLessThan(1e-12);
    });
  });

  describe('when the wavelet is longer than the epoch (its lags beyond N − 1 never meet the signal)', () => {
    it.each([
      // M = 836 and 669 against N = 300; 60 Hz (M = 28) is an ordinary short wavelet beside them
      [300, 250, [2, 2.5, 60]],
      // 500 Hz, N = 1000: M = 1672 (2 Hz), 1013 (3.3 Hz, just over N − 1), 998 (3.35 Hz, just under)
      [1000, 500, [2, 3.3, 3.35, 45]],
    ] as const)("should equal the direct sum with the full wavelet to 1e-12 of each frequency's largest (N = %s, %s Hz)", (length, fs, frequencies) => {
      const x = noise(length, 8);
      const plan = createMorletPlan(length, { samplingRate: fs, frequencies, cycles: 7 });
      const w = plan.powerAndCoefficients(x);
      const F = plan.frequencyCount;
      frequencies.forEach((f, j) => {
        const d = direct(x, fs, f, 7);
        if (f < 3.34) expect(d.M).toBeGreaterThan(length - 1);
        expect(worstScaledError(column(w.re, F, j), column(w.im, F, j), d.re, d.im)).toBeLessThan(1e-12);
        const power = column(w.power, F, j);
        let peak = 0,
          worst = 0;
        for (let i = 0; i < length; i++) {
          const p = POWER_FACTOR * (d.re[i]! ** 2 + d.im[i]! ** 2);
          peak = Math.max(peak, p);
          worst = Math.max(worst, Math.abs(power[i]! - p));
        }
        expect(worst / peak).toBeLessThan(1e-12);
      });
    });

    it.each([1, 2, 3, 4, 5])('should equal the direct sum for an epoch of %s samples (odd transform lengths 1, 3, 5, 9 among them)', (length) => {
      const fs = 100;
      const x = noise(length, 30 + length);
      const plan = createMorletPlan(length, { samplingRate: fs, frequencies: [5, 20], cycles: 7 });
      const w = plan.coefficients(x);
      [5, 20].forEach((f, j) => {
        const d = direct(x, fs, f, 7);
        expect(worstScaledError(column(w.re, 2, j), column(w.im, 2, j), d.re, d.im)).toBeLessThan(1e-12);
      });
    });

    it('should keep the lags each epoch length needs when two lengths share a transform length', () => {
      // 2 Hz at 500 Hz (M = 1672): N = 1000 keeps ±999 lags and N = 1020 keeps ±1019, both in a
      // 2048-point transform; the second plan must not reuse the first one's shorter kernel
      const fs = 500;
      createMorletPlan(1000, { samplingRate: fs, frequencies: [2], cycles: 7 }).power(noise(1000, 5));
      const x = noise(1020, 6);
      const w = createMorletPlan(1020, { samplingRate: fs, frequencies: [2], cycles: 7 }).coefficients(x);
      const d = direct(x, fs, 2, 7);
      expect(worstScaledError(w.re, w.im, d.re, d.im)).toBeLessThan(1e-12);
    });
  });

  describe('when only every d-th time is kept (decimation; d | L folds the product onto L/d bins)', () => {
    it.each([
      [301, 2],
      [301, 3],
      [301, 7],
      [301, 12],
      [301, 400],
      [1000, 4],
      [1000, 9],
      [5, 1000],
    ])('should equal the direct sum at every d-th sample (N = %s, decimation %s)', (length, decimation) => {
      const fs = 250,
        frequencies = [2, 9, 60];
      const x = noise(length, 40 + decimation);
      const plan = createMorletPlan(length, { samplingRate: fs, frequencies, cycles: 7, decimation });
      expect(plan.timeCount).toBe(Math.ceil(length / decimation));
      const w = plan.powerAndCoefficients(x);
      // power() writes frequencies in pairs and can accumulate: the same bits as the combined pass
      expect(Array.from(plan.power(x))).toEqual(Array.from(w.power));
      const twice = plan.power(x);
      plan.power(x, twice, true);
      expect(Array.from(twice)).toEqual(Array.from(w.power, (p) => p + p));
      frequencies.forEach((f, j) => {
        const d = direct(x, fs, f, 7);
        const keep = (v: Float64Array): Float64Array => Float64Array.from({ length: plan.timeCount }, (_, i) => v[i * decimation]!);
        const dRe = keep(d.re),
          dIm = keep(d.im);
        expect(worstScaledError(column(w.re, 3, j), column(w.im, 3, j), dRe, dIm)).toBeLessThan(1e-12);
        const power = column(w.power, 3, j);
        let peak = 0,
          worst = 0;
        for (let i = 0; i < plan.timeCount; i++) {
          const p = POWER_FACTOR * (dRe[i]! ** 2 + dIm[i]! ** 2);
          peak = Math.max(peak, p);
          worst = Math.max(worst, Math.abs(power[i]! - p));
        }
        expect(worst / peak).toBeLessThan(1e-12);
      });
    });
  });

  describe('when the input is a sinusoid A·cos(2πft + φ)', () => {
    it.each([
      [10.3, 7, 3],
      [4.1, 3, 0.5],
      [37, 12, 2],
    ])('should give power A²/2 away from the edges (f = %s Hz, %s cycles, A = %s), to 1e-6', (f, cycles, A) => {
      const fs = 500;
      const x = Float64Array.from({ length: 3000 }, (_, i) => A * Math.cos((2 * Math.PI * f * i) / fs + 0.7));
      const result = morletPower(x, { samplingRate: fs, frequencies: [f], cycles });
      expect(result.powerFactor).toBe(POWER_FACTOR);
      let checked = 0;
      for (let i = 0; i < result.timeCount; i++) {
        if (result.edgeMask[i] === 1) continue;
        // inside ±3σ_t of the edges the Gaussian tail beyond the epoch (≤ 1.1 % amplitude) is cut off;
        // check where ±6σ_t (the whole wavelet) fits, so the identity must hold to truncation error
        const reach = 6 * result.sigmaTime[0]! * fs;
        if (i < reach || x.length - 1 - i < reach) continue;
        expect(Math.abs(result.power[i]! - (A * A) / 2) / ((A * A) / 2)).toBeLessThan(1e-6);
        checked++;
      }
      expect(checked).toBeGreaterThan(100);
    });

    it('should give coefficients whose angle is the instantaneous phase 2πft + φ', () => {
      const fs = 400,
        f = 12,
        phase = 0.7;
      const x = Float64Array.from({ length: 2000 }, (_, i) => Math.cos((2 * Math.PI * f * i) / fs + phase));
      const { re, im } = createMorletPlan(x.length, { samplingRate: fs, frequencies: [f] }).coefficients(x);
      const i = 1000;
      const expected = (2 * Math.PI * f * i) / fs + phase;
      const diff = Math.atan2(im[i]!, re[i]!) - expected;
      expect(Math.abs(Math.atan2(Math.sin(diff), Math.cos(diff)))).toBeLessThan(1e-6);
      expect(Math.abs(Math.hypot(re[i]!, im[i]!) - 0.5)).toBeLessThan(1e-6);
    });
  });

  describe('when a 10 Hz burst sits 0.3–0.6 s after the event (invented data)', () => {
    it('should peak inside the burst and within σ_f of 10 Hz', () => {
      const fs = 500;
      const random = createRandom(99);
      // epoch from −0.5 s to 1.5 s around the event
      const x = Float64Array.from({ length: 2 * fs }, (_, i) => {
        const t = i / fs - 0.5;
        return 0.3 * random.normal() + (t >= 0.3 && t < 0.6 ? 2 * Math.sin(2 * Math.PI * 10 * t) : 0);
      });
      const result = morletPower(x, { samplingRate: fs, frequencies: { low: 4, high: 40, count: 30 }, cycles: 7 });
      let best = 0;
      for (let i = 0; i < result.power.length; i++) if (result.edgeMask[i] === 0 && result.power[i]! > result.power[best]!) best = i;
      const t = result.times[Math.floor(best / result.frequencyCount)]! - 0.5;
      const j = best % result.frequencyCount;
      const f = result.frequencies[j]!;
      expect(Math.abs(f - 10)).toBeLessThanOrEqual(result.sigmaFrequency[j]!);
      expect(t).toBeGreaterThanOrEqual(0.3);
      expect(t).toBeLessThanOrEqual(0.6);
    });
  });

  describe('when edges are marked', () => {
    it(`should mark exactly the times within ${DEFAULT_EDGE_SIGMAS}·σ_t of either end (f = 10 Hz, 7 cycles, 1 kHz: 3σ_t = 334.2 samples)`, () => {
      const plan = createMorletPlan(2000, { samplingRate: 1000, frequencies: [10, 40], cycles: 7 });
      const marked = (j: number): number[] => Array.from({ length: plan.timeCount }, (_, i) => i).filter((i) => plan.edgeMask[i * 2 + j] === 1);
      const ten = marked(0);
      expect(ten.filter((i) => i < 1000).at(-1)).toBe(334);
      expect(ten.find((i) => i > 1000)).toBe(1999 - 334);
      expect(ten.length).toBe(2 * 335);
      // at 40 Hz: 3σ_t·fs = 3·7/(2π·40)·1000 = 83.56
      expect(marked(1).length).toBe(2 * 84);
    });

    it('should follow edgeSigmas and mark nothing for k = 0', () => {
      const plan = createMorletPlan(500, { samplingRate: 100, frequencies: [5], edgeSigmas: 0 });
      expect(plan.edgeMask.every((v) => v === 0)).toBe(true);
    });
  });

  describe('when frequencies, cycles and decimation are derived', () => {
    it('should log-space 40 frequencies from 2 to 45 Hz with a constant ratio and exact ends', () => {
      const f = logFrequencies(2, 45, 40);
      expect(f[0]).toBe(2);
      expect(f[39]).toBe(45);
      const ratio = (45 / 2) ** (1 / 39);
      for (let i = 1; i < 40; i++) expect(Math.abs(f[i]! / f[i - 1]! - ratio)).toBeLessThan(1e-13);
    });

    it('should grow cycles linearly from 3 at 2 Hz to 10 at 40 Hz (6.5 at 21 Hz)', () => {
      const plan = createMorletPlan(100, { samplingRate: 100, frequencies: [2, 21, 40], cycles: { low: 3, high: 10 } });
      expect(Array.from(plan.cycles)).toEqual([3, 6.5, 10]);
      expect(plan.sigmaTime[1]).toBeCloseTo(6.5 / (2 * Math.PI * 21), 15);
    });

    it('should keep every d-th sample of the full-rate power when decimating', () => {
      const x = noise(1001, 4);
      const options: MorletOptions = { samplingRate: 200, frequencies: [6, 15, 33] };
      const full = morletPower(x, options);
      const thin = morletPower(x, { ...options, decimation: 4 });
      expect(thin.timeCount).toBe(251);
      expect(thin.times[250]).toBeCloseTo(1000 / 200, 12);
      // the decimated outputs come from a shorter (folded) inverse transform: equal up to rounding
      let peak = 0;
      for (const p of full.power) peak = Math.max(peak, p);
      for (let i = 0; i < thin.timeCount; i++) {
        for (let j = 0; j < 3; j++) {
          expect(Math.abs(thin.power[i * 3 + j]! - full.power[i * 4 * 3 + j]!)).toBeLessThan(1e-12 * peak);
          expect(thin.edgeMask[i * 3 + j]).toBe(full.edgeMask[i * 4 * 3 + j]);
        }
      }
    });

    it('should give identical numbers from a reused plan and from a fresh one', () => {
      const options: MorletOptions = { samplingRate: 256, frequencies: { low: 2, high: 45, count: 8 } };
      const plan = createMorletPlan(512, options);
      const a = noise(512, 1),
        b = noise(512, 2);
      plan.power(a);
      expect(Array.from(plan.power(b))).toEqual(Array.from(morletPower(b, options).power));
    });

    it('should add each power to what out holds when accumulating, bit for bit the sum of separate calls', () => {
      // an odd frequency count exercises the paired writes and the single last one
      const plan = createMorletPlan(400, { samplingRate: 200, frequencies: [3, 7, 12, 20, 33], cycles: 5 });
      const trials = [noise(400, 4), noise(400, 5), noise(400, 6)];
      const expected = new Float64Array(plan.timeCount * plan.frequencyCount);
      for (const x of trials) {
        const p = plan.power(x);
        for (let k = 0; k < expected.length; k++) expected[k]! += p[k]!;
      }
      const sum = new Float64Array(expected.length);
      for (const x of trials) expect(plan.power(x, sum, true)).toBe(sum);
      expect(Array.from(sum)).toEqual(Array.from(expected));
      expect(() => plan.power(trials[0]!, undefined, true)).toThrow(/accumulate needs an out array/);
    });

    it('should keep its wavelet-spectrum cache within its byte budget, and plans working after evictions', () => {
      // 2^17-sample epochs: each spectrum is about 1–2 MB, so 60 distinct frequencies overflow 64 MiB.
      const length = 1 << 17;
      const x = noise(length, 9);
      const first = createMorletPlan(length, { samplingRate: 1000, frequencies: [40], cycles: 7 });
      const before = first.power(x);
      for (let k = 0; k < 60; k++) {
        createMorletPlan(length, { samplingRate: 1000, frequencies: [41 + k], cycles: 7 });
        expect(waveletCacheBytes()).toBeLessThanOrEqual(SPECTRUM_CACHE_BYTES);
      }
      // the first plan's spectrum has left the cache; the plan still holds it and gives the same bits
      expect(Array.from(first.power(x))).toEqual(Array.from(before));
    });

    it('should give the same bits from one combined pass as from power() and coefficients()', () => {
      const plan = createMorletPlan(500, { samplingRate: 250, frequencies: [4, 10, 30], cycles: 6 });
      const x = noise(500, 3);
      const both = plan.powerAndCoefficients(x);
      const w = plan.coefficients(x);
      expect(Array.from(both.power)).toEqual(Array.from(plan.power(x)));
      expect(Array.from(both.re)).toEqual(Array.from(w.re));
      expect(Array.from(both.im)).toEqual(Array.from(w.im));
    });
  });

  describe('when the plan reports its inverse-transform lengths (the cost bench/morlet.ts times)', () => {
    // Module note (common practice: a circular convolution of period L ≥ N + R, R = min(M, N − 1),
    // has no aliases in outputs 0..N − 1); the lengths are the smallest m·2^a ≥ N + R, m ∈ {1, 3, 5, 9},
    // cut to L/d when the decimation d divides L. Checked here from that rule, not from the module's code.
    const smallest = (n: number): number => Math.min(...[1, 3, 5, 9].map((m) => m * 2 ** Math.max(0, Math.ceil(Math.log2(n / m)))));
    it('should report, per frequency, the smallest alias-free length of the kinds the FFT does fastest', () => {
      const fs = 500,
        length = 1000;
      const plan = createMorletPlan(length, { samplingRate: fs, frequencies: { low: 2, high: 45, count: 40 }, cycles: 7 });
      expect(plan.inverseLengths).toHaveLength(40);
      plan.frequencies.forEach((f, j) => {
        const reach = Math.min(Math.ceil((6 * 7 * fs) / (2 * Math.PI * f)), length - 1);
        expect(plan.inverseLengths[j]).toBe(smallest(length + reach));
        expect(plan.inverseLengths[j]).toBeGreaterThanOrEqual(length + reach);
      });
      // 2 Hz: the wavelet (M = 1672) outlasts the epoch, R = 999 and L = 2048; 45 Hz: M = 75, L = 1152 = 9·2^7
      expect(plan.inverseLengths[0]).toBe(2048);
      expect(plan.inverseLengths[39]).toBe(1152);
    });

    it('should report L/d when the decimation d divides L', () => {
      const plan = createMorletPlan(1000, { samplingRate: 500, frequencies: [45], cycles: 7, decimation: 4 });
      // 1152 = 4·288: the product folds onto 288 bins
      expect(plan.inverseLengths[0]).toBe(smallest(1000 + 75) / 4);
    });
  });

  describe('when the options are wrong', () => {
    const x = new Float64Array(300);
    it.each([
      ['frequency', { samplingRate: 100, frequencies: [60] }, RangeError],
      ['frequency', { samplingRate: 100, frequencies: [0] }, RangeError],
      ['frequencies', { samplingRate: 100, frequencies: [] }, RangeError],
      ['frequencies.high', { samplingRate: 100, frequencies: { low: 10, high: 5, count: 3 } }, RangeError],
      ['cycles', { samplingRate: 100, frequencies: [10], cycles: -1 }, RangeError],
      ['decimation', { samplingRate: 100, frequencies: [10], decimation: 0 }, RangeError],
      ['edgeSigmas', { samplingRate: 100, frequencies: [10], edgeSigmas: Number.NaN }, RangeError],
      ['samplingRate', { samplingRate: -1, frequencies: [10] }, RangeError],
    ] as const)('should reject a bad %s', (name, options, kind) => {
      expect(() => morletPower(x, options as unknown as MorletOptions)).toThrow(kind);
      expect(() => morletPower(x, options as unknown as MorletOptions)).toThrow(name);
    });
  });
});
