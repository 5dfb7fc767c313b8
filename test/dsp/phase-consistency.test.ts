import { describe, expect, it } from 'vitest';
import { phaseConsistency, phaseConsistencyNull, phaseConsistencyThreshold } from '../../src/dsp/phase-consistency.js';
import { createMorletPlan } from '../../src/dsp/morlet.js';
import { createRandom } from '../../src/common/random.js';
import { readWelchFixture } from '../fixtures/welch/fixture.js';

const nullFixture = readWelchFixture<{ provenance: { scipy: string }; values: { trials: number; mean: number }[] }>('../tf/phase-null.json');

/** `cells` independent cells of n uniform random phases, as re/im per trial */
function randomPhases(n: number, cells: number, seed: number): { re: Float64Array[]; im: Float64Array[] } {
  const random = createRandom(seed);
  const re: Float64Array[] = [],
    im: Float64Array[] = [];
  for (let r = 0; r < n; r++) {
    const phases = Float64Array.from({ length: cells }, () => 2 * Math.PI * random.uniform());
    re.push(phases.map(Math.cos));
    im.push(phases.map(Math.sin));
  }
  return { re, im };
}

describe('phaseConsistencyNull', () => {
  describe(`when compared with the quadrature of ∫(1 − J0(t)^n)/t² dt (scipy ${nullFixture.provenance.scipy})`, () => {
    it.each(nullFixture.values.map((v) => [v.trials, v.mean] as const))('should match E[R] for n = %i within the stated series error', (n, exact) => {
      const { mean } = phaseConsistencyNull(n);
      // n = 1, 2 are closed forms (1 and 2/π); the quadrature's tail beyond T = 4000 is taken as 1/T, which
      // leaves ~1/(2πT²n) ≈ 5e-9 for n = 2, hence 2e-8 there. For n ≥ 3 the
      // three-term series has an O(n⁻³) error, bounded here by 0.15/n³ (3.5e-3 observed at n = 3)
      const tolerance = n <= 2 ? 2e-8 : 0.15 / n ** 3;
      expect(Math.abs(mean - exact) / exact).toBeLessThan(tolerance);
    });
  });

  describe('when its simple forms are checked', () => {
    it('should give √(π/(4n)) as the large-sample mean and exactly 1/√n as the RMS', () => {
      const v = phaseConsistencyNull(25);
      expect(v.largeSampleMean).toBeCloseTo(Math.sqrt(Math.PI) / 10, 15);
      expect(v.rootMeanSquare).toBe(0.2);
      expect(v.mean).toBeGreaterThan(v.largeSampleMean);
      expect(v.mean).toBeLessThan(v.rootMeanSquare);
    });

    it('should reject a trial count that is not a positive integer', () => {
      expect(() => phaseConsistencyNull(0)).toThrow(/trialCount/);
      expect(() => phaseConsistencyNull(2.5)).toThrow(RangeError);
    });
  });
});

describe('phaseConsistency', () => {
  describe('when phases are chosen by hand', () => {
    it('should give 1 for equal phases, 0 for opposite ones and 1/√2 for a quarter turn', () => {
      const r = phaseConsistency([Float64Array.of(2, 1, 1), Float64Array.of(0.5, -3, 0)], [Float64Array.of(2, 0, 0), Float64Array.of(0.5, 0, 4)]);
      expect(r.values[0]).toBeCloseTo(1, 15);
      expect(r.values[1]).toBeCloseTo(0, 15);
      expect(r.values[2]).toBeCloseTo(Math.SQRT1_2, 15);
      expect(r.trialCount).toBe(2);
    });

    it('should count zero coefficients instead of inventing a phase', () => {
      const r = phaseConsistency([Float64Array.of(0), Float64Array.of(1)], [Float64Array.of(0), Float64Array.of(0)]);
      expect(r.zeroCoefficients).toBe(1);
      expect(r.values[0]).toBe(0.5);
    });
  });

  describe('when phases are uniform and independent (seeded Monte Carlo, 20 000 cells)', () => {
    it.each([5, 10, 40])('should average to E[R] and have mean R² = 1/n for n = %i, within 4 standard errors', (n) => {
      const cells = 20000;
      const { re, im } = randomPhases(n, cells, 100 + n);
      const { values, null: expected } = phaseConsistency(re, im);
      let sum = 0,
        squares = 0;
      for (const v of values) {
        sum += v;
        squares += v * v;
      }
      const mean = sum / cells;
      const sd = Math.sqrt(squares / cells - mean * mean);
      expect(Math.abs(mean - expected.mean)).toBeLessThan((4 * sd) / Math.sqrt(cells));
      // E[R²] = 1/n exactly; var(R²) ≤ E[R⁴] = (2n² − n)/n⁴ (planar walk moment), so 4 SE ≤ 4·√((2n−1)/n³)/√cells
      expect(Math.abs(squares / cells - 1 / n)).toBeLessThan((4 * Math.sqrt((2 * n - 1) / n ** 3)) / Math.sqrt(cells));
    });

    it.each([
      [10, 0.05],
      [30, 0.01],
    ] as const)('should exceed the threshold for n = %i in about α = %s of cells (± 4 binomial SD)', (n, alpha) => {
      const cells = 20000;
      const { re, im } = randomPhases(n, cells, 7 * n);
      const r = phaseConsistency(re, im, { alpha });
      expect(r.threshold).toBe(phaseConsistencyThreshold(n, alpha));
      let hits = 0;
      for (const v of r.values) if (v >= r.threshold) hits++;
      expect(Math.abs(hits / cells - alpha)).toBeLessThan(4 * Math.sqrt((alpha * (1 - alpha)) / cells));
    });

    it('should approach √(−ln α / n) for large n (Rayleigh limit)', () => {
      expect(Math.abs(phaseConsistencyThreshold(10000, 0.05) / Math.sqrt(-Math.log(0.05) / 10000) - 1)).toBeLessThan(1e-3);
    });
  });

  describe('when Morlet coefficients of invented trials are used', () => {
    const fs = 250,
      trials = 40;
    const plan = createMorletPlan(Math.round(2 * fs), { samplingRate: fs, frequencies: [6, 10], cycles: 5 });
    // epoch −0.8 … 1.2 s. Channel "locked": a 6 Hz component phase-locked to the event from 0.1 to 0.8 s in
    // every trial. Channel "burst": a 10 Hz burst 0.3–0.6 s with a random phase per trial (induced, not locked).
    const random = createRandom(31);
    const channel = (signal: (t: number, phase: number) => number): ReturnType<typeof phaseConsistency> => {
      const coefficients = Array.from({ length: trials }, () => {
        const phase = 2 * Math.PI * random.uniform();
        return plan.coefficients(Float64Array.from({ length: plan.length }, (_, i) => random.normal() + signal(i / fs - 0.8, phase)));
      });
      return phaseConsistency(
        coefficients.map((c) => c.re),
        coefficients.map((c) => c.im),
        { exclude: plan.edgeMask },
      );
    };
    const locked = channel((t) => (t >= 0.1 && t < 0.8 ? Math.cos(2 * Math.PI * 6 * t) : 0));
    const burst = channel((t, phase) => (t >= 0.3 && t < 0.6 ? 2 * Math.cos(2 * Math.PI * 10 * t + phase) : 0));
    const at = (t: number, j: number): number => Math.round((t + 0.8) * fs) * 2 + j;

    it('should find the locked 6 Hz component above threshold after the event and not before it', () => {
      expect(locked.values[at(0.45, 0)]!).toBeGreaterThan(locked.threshold);
      expect(locked.values[at(0.45, 0)]!).toBeGreaterThan(0.5);
      expect(locked.values[at(-0.3, 0)]!).toBeLessThan(locked.threshold);
    });

    it('should report the edge cells of the Morlet mask as NaN', () => {
      expect(Number.isNaN(locked.values[0]!)).toBe(true);
      expect(locked.values.filter(Number.isNaN).length).toBe(plan.edgeMask.reduce((a, b) => a + b, 0));
    });

    it('should leave the randomly phased 10 Hz burst within the null distribution', () => {
      // R at neighbouring times is strongly correlated (a few independent draws over 0.3 s), and a single
      // draw of R has sd ≈ 0.52·E[R] (Rayleigh), so test against the α = 0.001 threshold, not the mean
      let largest = 0;
      for (let t = 0.3; t < 0.6; t += 0.004) largest = Math.max(largest, burst.values[at(t, 1)]!);
      expect(largest).toBeLessThan(phaseConsistencyThreshold(trials, 0.001));
      expect(burst.values[at(0.45, 1)]!).toBeLessThan(locked.values[at(0.45, 0)]! / 2);
    });
  });

  describe('when the inputs are wrong', () => {
    it('should reject mismatched trials and a bad alpha', () => {
      expect(() => phaseConsistency([new Float64Array(2)], [])).toThrow(RangeError);
      expect(() => phaseConsistency([new Float64Array(2)], [new Float64Array(3)])).toThrow(/trial 0/);
      expect(() => phaseConsistency([new Float64Array(2)], [new Float64Array(2)], { alpha: 1.5 })).toThrow(/alpha/);
      expect(() => phaseConsistency([new Float64Array(2)], [new Float64Array(2)], { exclude: new Uint8Array(1) })).toThrow(/exclude/);
    });
  });
});
