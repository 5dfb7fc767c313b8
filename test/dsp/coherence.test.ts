import { describe, expect, it } from 'vitest';
import { crossSpectralConnectivity, type ConnectivityOptions } from '../../src/dsp/coherence.js';
import { phaseConsistencyNull } from '../../src/dsp/phase-consistency.js';
import type { DetrendKind } from '../../src/dsp/detrend.js';
import type { WindowName } from '../../src/dsp/windows.js';
import { createRandom } from '../../src/common/random.js';
import { float32s, float64s, readWelchFixture, worstRelativeError } from '../fixtures/welch/fixture.js';

interface CoherenceCase {
  name: string;
  samplingRate: number;
  segmentSamples: number;
  overlapSamples: number;
  fftLength: number;
  window: WindowName;
  detrend: DetrendKind;
  x32: string;
  y32: string;
  frequencies: string;
  coherence: string;
}
const fixture = readWelchFixture<{ provenance: { scipy: string }; cases: CoherenceCase[] }>('../tf/coherence.json');

function noise(n: number, random: ReturnType<typeof createRandom>): Float64Array {
  return Float64Array.from({ length: n }, () => random.normal());
}

describe('crossSpectralConnectivity', () => {
  describe(`when compared with scipy.signal.coherence (scipy ${fixture.provenance.scipy})`, () => {
    it.each(fixture.cases.map((c) => [c.name, c] as const))('should match %s to 1e-9 relative', (_name, c) => {
      const r = crossSpectralConnectivity([[float32s(c.x32), float32s(c.y32)]], {
        samplingRate: c.samplingRate,
        segmentSamples: c.segmentSamples,
        overlapSamples: c.overlapSamples,
        fftLength: c.fftLength,
        window: c.window,
        detrend: c.detrend,
      });
      const expected = float64s(c.coherence);
      // after mean or line removal the DC bin is 0/0 on both sides (rounding noise), so it is left out there
      const from = c.detrend === 'none' ? 0 : 1;
      expect(worstRelativeError(r.coherence[0]!.subarray(from), expected.subarray(from), 1e-12)).toBeLessThan(1e-9);
      expect(worstRelativeError(r.frequencies, float64s(c.frequencies), 0)).toBeLessThan(1e-14);
      expect(r.method).toBe('welch');
    });
  });

  describe('when a channel is flat', () => {
    // scipy.signal.coherence gives NaN at every frequency for a constant input (0/0; computed with
    // scipy 1.10, docs/references.md §7). The paired real FFT must not lend the flat channel rounding
    // noise from its partner: before the fix such a pair showed coherence up to 0.83.
    const random = createRandom(7);
    const live = noise(2048, random),
      other = noise(2048, random);
    const constant = new Float64Array(2048).fill(3.1),
      zero = new Float64Array(2048);
    const options: ConnectivityOptions = { samplingRate: 256, segmentSamples: 256, overlapSamples: 128, window: 'hann', detrend: 'mean' };

    it('should give NaN coherence, imaginary coherency and phase locking for every pair it is in', () => {
      const epochs = [0, 1, 2].map((e) => [live.subarray(e * 512, e * 512 + 1024), constant.subarray(0, 1024), other.subarray(e * 512, e * 512 + 1024)]);
      const r = crossSpectralConnectivity(epochs, { ...options, bands: [{ name: 'alpha', low: 8, high: 13 }] });
      expect(r.flatChannels).toEqual([1]);
      for (const p of [0, 2]) {
        expect(r.pairs[p]).toContain(1);
        expect(Array.from(r.coherence[p]!).every(Number.isNaN)).toBe(true);
        expect(Array.from(r.imaginaryCoherency[p]!).every(Number.isNaN)).toBe(true);
        expect(Array.from(r.phaseLocking![p]!).every(Number.isNaN)).toBe(true);
        expect(Number.isNaN(r.bands[0]!.coherence[p]!)).toBe(true);
      }
      // the live pair is untouched by its flat neighbour: the same as computed without it, to rounding
      const alone = crossSpectralConnectivity(
        epochs.map(([a, , b]) => [a!, b!]),
        options,
      );
      expect(worstRelativeError(r.coherence[1]!, alone.coherence[0]!, 1e-12)).toBeLessThan(1e-12);
    });

    it('should treat an all-zero channel without detrending as flat, and a constant one as live', () => {
      const zeros = crossSpectralConnectivity([[live.subarray(0, 1024), zero.subarray(0, 1024)]], { ...options, detrend: 'none' });
      expect(zeros.flatChannels).toEqual([1]);
      expect(Array.from(zeros.coherence[0]!).every(Number.isNaN)).toBe(true);
      // a constant of 3.1 without detrending has real power at the lowest bins: it is a signal
      const offset = crossSpectralConnectivity([[live.subarray(0, 1024), constant.subarray(0, 1024)]], { ...options, detrend: 'none' });
      expect(offset.flatChannels).toEqual([]);
      expect(Number.isFinite(offset.coherence[0]![0]!)).toBe(true);
    });
  });

  describe('when the channels are independent white noise (seeded Monte Carlo)', () => {
    it('should average to 1/n and exceed 1 − α^{1/(n−1)} in about α of bins (16 non-overlapped segments; docs/references.md §7: 0.0625 and 0.181036)', () => {
      const random = createRandom(16);
      const values: number[] = [];
      let result;
      for (let run = 0; run < 50; run++) {
        result = crossSpectralConnectivity([[noise(16 * 128, random), noise(16 * 128, random)]], {
          samplingRate: 128,
          segmentSamples: 128,
          overlapSamples: 0,
          window: 'hann',
        });
        // interior bins only: DC and Nyquist DFTs are real, with half the degrees of freedom
        for (let k = 1; k < 64; k++) values.push(result.coherence[0]![k]!);
      }
      expect(result!.effectiveSegments).toBe(16);
      expect(result!.coherenceBias).toBe(0.0625);
      expect(result!.coherenceThreshold).toBeCloseTo(0.181036, 6);
      const mean = values.reduce((a, b) => a + b, 0) / values.length;
      // Ĉ ~ Beta(1, n − 1) under the null: sd = √((n−1)/(n²(n+1))) = 0.0587; 4 standard errors over 3150 bins
      expect(Math.abs(mean - 0.0625)).toBeLessThan((4 * 0.0587) / Math.sqrt(values.length));
      const alarms = values.filter((v) => v > result!.coherenceThreshold).length / values.length;
      expect(Math.abs(alarms - 0.05)).toBeLessThan(4 * Math.sqrt((0.05 * 0.95) / values.length));
    });

    it('should report 1/n_eff from the overlap-corrected degrees of freedom with Hann at 50 % overlap, within 5 % of Monte Carlo', () => {
      const random = createRandom(50);
      let sum = 0,
        count = 0,
        result;
      for (let run = 0; run < 60; run++) {
        // 16 segments of 128 with 64-sample steps: 17·64 samples
        result = crossSpectralConnectivity([[noise(17 * 64, random), noise(17 * 64, random)]], {
          samplingRate: 128,
          segmentSamples: 128,
          overlapSamples: 64,
          window: 'hann',
        });
        for (let k = 1; k < 64; k++) {
          sum += result.coherence[0]![k]!;
          count++;
        }
      }
      // ν = 36·16²/(19·16 − 1) = 30.416 (docs/references.md §2), n_eff = ν/2 = 15.21; docs/references.md §7 reports a
      // Monte Carlo mean of 0.0647 for this case (informative, no closed form)
      expect(result!.segmentCount).toBe(16);
      expect(result!.effectiveSegments).toBeCloseTo((36 * 256) / (19 * 16 - 1) / 2, 9);
      expect(Math.abs(sum / count - result!.coherenceBias) / result!.coherenceBias).toBeLessThan(0.05);
    });

    it('should give a phase-locking value across epochs near its null mean, and multitaper MSC near 1/(K·epochs)', () => {
      const random = createRandom(77);
      const epochs = Array.from({ length: 30 }, () => [noise(256, random), noise(256, random)]);
      const r = crossSpectralConnectivity(epochs, { samplingRate: 256, segmentSamples: 256, overlapSamples: 0, tapers: { timeBandwidth: 3, taperCount: 5 } });
      expect(r.method).toBe('multitaper');
      expect(r.effectiveSegments).toBe(150);
      const interior = (v: Float64Array): number => {
        let s = 0;
        for (let k = 1; k < 128; k++) s += v[k]!;
        return s / 127;
      };
      // PLV over 30 epochs: E[R_30] = 0.1627 (phaseConsistencyNull); bins are nearly independent (127 of them),
      // single-draw sd ≈ 0.52·E[R], so 4 SE ≈ 0.19·E[R]
      expect(r.phaseLockingNull!.mean).toBe(phaseConsistencyNull(30).mean);
      expect(Math.abs(interior(r.phaseLocking![0]!) - r.phaseLockingNull!.mean)).toBeLessThan(0.19 * r.phaseLockingNull!.mean);
      // MSC over 150 tapered spectra: Beta(1, 149) mean 1/150, sd ≈ 1/150; adjacent bins share taper leakage (±3 bins),
      // so allow 4 SE of 127/7 independent bins
      expect(Math.abs(interior(r.coherence[0]!) - 1 / 150)).toBeLessThan((4 * (1 / 150)) / Math.sqrt(127 / 7));
    });
  });

  describe('when the channels share a delayed signal', () => {
    // y(t) = x(t − τ) + noise with τ = 5 ms; at 20 Hz, 2πfτ = 0.63 rad < π, so Im coherency > 0 (j lags i)
    const fs = 200,
      random = createRandom(8);
    const source = noise(4000 + 1, random);
    const x = source.subarray(1);
    const y = Float64Array.from(source.subarray(0, 4000), (v) => v + 0.1 * random.normal());
    const options: ConnectivityOptions = { samplingRate: fs, segmentSamples: 200, overlapSamples: 100, bands: [{ name: 'beta', low: 14, high: 30 }] };
    const r = crossSpectralConnectivity([[x, y]], options);
    const k20 = 20;

    it('should give MSC near 1 and a positive imaginary coherency of sin(2πfτ)·|coherency|', () => {
      expect(r.coherence[0]![k20]!).toBeGreaterThan(0.95);
      const expected = Math.sin(2 * Math.PI * 20 * 0.005) * Math.sqrt(r.coherence[0]![k20]!);
      expect(Math.abs(r.imaginaryCoherency[0]![k20]! - expected)).toBeLessThan(0.02);
    });

    it('should flip the sign of the imaginary part when the pair is reversed, and average bands over low ≤ f < high', () => {
      const reversed = crossSpectralConnectivity([[x, y]], { ...options, pairs: [[1, 0]] });
      expect(reversed.imaginaryCoherency[0]![k20]).toBeCloseTo(-r.imaginaryCoherency[0]![k20]!, 12);
      expect(r.bands[0]!.binCount).toBe(16);
      let sum = 0;
      for (let k = 14; k < 30; k++) sum += r.coherence[0]![k]!;
      expect(r.bands[0]!.coherence[0]).toBeCloseTo(sum / 16, 14);
    });

    it('should give an imaginary coherency near 0 for zero-lag mixing (Nolte et al. 2004)', () => {
      const random2 = createRandom(9);
      const s = noise(4000, random2);
      const a = Float64Array.from(s, (v) => v + 0.5 * random2.normal());
      const b = Float64Array.from(s, (v) => 0.7 * v + 0.5 * random2.normal());
      const mixed = crossSpectralConnectivity([[a, b]], { samplingRate: fs, segmentSamples: 200, overlapSamples: 100 });
      // MSC is high, yet Im coherency only carries estimation noise, of order √(1/n_eff) = 0.16 at most
      expect(mixed.coherence[0]![k20]!).toBeGreaterThan(0.5);
      let largest = 0;
      for (let k = 1; k < 100; k++) largest = Math.max(largest, Math.abs(mixed.imaginaryCoherency[0]![k]!));
      expect(largest).toBeLessThan(0.25);
    });
  });

  describe('when the phase lag is the same in every epoch', () => {
    it('should give a phase-locking value near 1 at that frequency', () => {
      const fs = 100,
        random = createRandom(12);
      const epochs = Array.from({ length: 20 }, () => {
        const phase = 2 * Math.PI * random.uniform();
        const t = (i: number): number => i / fs;
        return [
          Float64Array.from({ length: 200 }, (_, i) => Math.cos(2 * Math.PI * 10 * t(i) + phase) + 0.3 * random.normal()),
          Float64Array.from({ length: 200 }, (_, i) => Math.cos(2 * Math.PI * 10 * t(i) + phase - 0.8) + 0.3 * random.normal()),
        ];
      });
      const r = crossSpectralConnectivity(epochs, { samplingRate: fs, segmentSamples: 100, overlapSamples: 50 });
      expect(r.epochCount).toBe(20);
      expect(r.phaseLocking![0]![10]!).toBeGreaterThan(0.95);
    });
  });

  describe('when the pairs, bands or inputs are wrong', () => {
    const x = new Float64Array(256).map((_, i) => Math.sin(i));
    const ok: ConnectivityOptions = { samplingRate: 128, segmentSamples: 64, overlapSamples: 32 };
    it.each([
      ['pairs', { ...ok, pairs: [[0, 0]] }],
      ['pairs', { ...ok, pairs: [[0, 3]] }],
      ['bands', { ...ok, bands: [{ name: 'thin', low: 10.2, high: 10.5 }] }],
      ['bands', { ...ok, bands: [{ name: 'upside-down', low: 12, high: 8 }] }],
      ['segmentSamples', { ...ok, segmentSamples: 512 }],
      ['alpha', { ...ok, alpha: 0 }],
    ] as const)('should reject bad %s', (name, options) => {
      expect(() => crossSpectralConnectivity([[x, x]], options as unknown as ConnectivityOptions)).toThrow(RangeError);
      expect(() => crossSpectralConnectivity([[x, x]], options as unknown as ConnectivityOptions)).toThrow(name);
    });

    it('should reject one channel and ragged epochs', () => {
      expect(() => crossSpectralConnectivity([[x]], ok)).toThrow(/two channels/);
      expect(() =>
        crossSpectralConnectivity(
          [
            [x, x],
            [x, x.subarray(1)],
          ],
          ok,
        ),
      ).toThrow(/epochs\[1\]\[1\]/);
    });

    it('should list every pair i < j by default', () => {
      const r = crossSpectralConnectivity([[x, x.map((v) => -v), x.map((v) => 2 * v)]], ok);
      expect(r.pairs).toEqual([
        [0, 1],
        [0, 2],
        [1, 2],
      ]);
      expect(r.phaseLocking).toBeUndefined();
    });
  });
});
