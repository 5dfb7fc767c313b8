import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { DetrendKind } from '../../src/dsp/detrend.js';
import { dpss } from '../../src/dsp/dpss.js';
import { createMultitaperPlan, multitaper } from '../../src/dsp/multitaper.js';

interface Case {
  samplingRate: number;
  fftLength: number;
  timeBandwidth: number;
  taperCount: number;
  detrend: DetrendKind;
  signal: number[];
  frequencies: number[];
  equal: number[];
  eigenvalue: number[];
  adaptive: number[];
  adaptiveIterations: number;
  adaptiveDof: number[];
}
// scipy.signal.windows.dpss + numpy.fft.rfft (scipy 1.10.1, numpy 1.24.2) via scripts/make-multitaper-fixtures.py;
// "adaptive" is a numpy mirror of the same Thomson iteration run to tolerance 1e-12.
const fixture = JSON.parse(readFileSync(new URL('../fixtures/multitaper/multitaper.json', import.meta.url), 'utf8')) as { cases: Case[] };

function expectClose(got: Float64Array, expected: number[], relative: number): void {
  expect(got).toHaveLength(expected.length);
  const peak = Math.max(...expected.map(Math.abs));
  expected.forEach((value, k) => expect(Math.abs(got[k]! - value), `bin ${k}`).toBeLessThanOrEqual(relative * Math.abs(value) + 1e-14 * peak));
}

describe('multitaper', () => {
  for (const c of fixture.cases) {
    const label = `N=${c.signal.length}, fftLength=${c.fftLength}, NW=${c.timeBandwidth}, K=${c.taperCount}, detrend ${c.detrend}`;
    const x = Float64Array.from(c.signal);
    const base = { samplingRate: c.samplingRate, timeBandwidth: c.timeBandwidth, taperCount: c.taperCount, fftLength: c.fftLength, detrend: c.detrend };

    describe(`when compared with the scipy/numpy reference (${label})`, () => {
      it('should match equal weighting to 1e-9 relative with ν = 2K inside', () => {
        const r = multitaper(x, { ...base, weighting: 'equal' });
        expectClose(r.psd, c.equal, 1e-9);
        c.frequencies.forEach((f, k) => expect(Math.abs(r.frequencies[k]! - f)).toBeLessThan(1e-12));
        expect(r.degreesOfFreedom[1]).toBe(2 * c.taperCount);
        expect(r.degreesOfFreedom[0]).toBe(c.taperCount);
        expect(r.iterations).toBe(0);
      });
      it('should match eigenvalue weighting Σλ_kŜ_k/Σλ_k to 1e-9 relative', () => {
        expectClose(multitaper(x, { ...base, weighting: 'eigenvalue' }).psd, c.eigenvalue, 1e-9);
      });
      it('should match the adaptive iteration, its iteration count and ν(f) = 2(Σd²)²/Σd⁴', () => {
        const r = multitaper(x, { ...base, weighting: 'adaptive', adaptiveTolerance: 1e-12, adaptiveMaxIterations: 500 });
        expectClose(r.psd, c.adaptive, 1e-9);
        expect(r.iterations).toBe(c.adaptiveIterations);
        const expectedDof = c.adaptiveDof.map((v, k) => (k === 0 || (c.fftLength % 2 === 0 && k === c.adaptiveDof.length - 1) ? v / 2 : v));
        expectClose(r.degreesOfFreedom, expectedDof, 1e-8);
      });
    });
  }

  describe('when equal weighting integrates over frequency', () => {
    it('should equal the tapered mean square (1/K)·Σ_k Σ_t (h_k·y)² exactly (Parseval, docs/references.md §4) to 1e-12', () => {
      const c = fixture.cases[0]!;
      const x = Float64Array.from(c.signal);
      for (const fftLength of [500, 777, 2048]) {
        const r = multitaper(x, { samplingRate: 250, timeBandwidth: 4, taperCount: 7, weighting: 'equal', fftLength, detrend: 'none' });
        const integral = r.psd.reduce((s, v) => s + v, 0) * (250 / fftLength);
        const { tapers } = dpss(500, 4, 7);
        let expected = 0;
        for (const h of tapers) for (let t = 0; t < 500; t++) expected += (h[t]! * x[t]!) ** 2 / 7;
        expect(Math.abs(integral / expected - 1)).toBeLessThan(1e-12);
      }
    });
  });

  describe('when the input is an A = 2 sinusoid on a bin centre', () => {
    it('should peak at the tone and hold about A²/2·mean(λ_k) inside ±W (concentration definition; 1 % for the bin sum standing in for the integral)', () => {
      const n = 500,
        fs = 250;
      const tone = Float64Array.from({ length: n }, (_, t) => 2 * Math.sin((2 * Math.PI * 10 * t) / fs + 0.3));
      const r = multitaper(tone, { samplingRate: fs, timeBandwidth: 4, weighting: 'equal', detrend: 'none' });
      const peak = r.psd.indexOf(Math.max(...r.psd));
      expect(r.frequencies[peak]).toBe(10);
      // W = NW·fs/N = 2 Hz; the positive- and negative-frequency images each hold λ_k of A²/4 inside ±W.
      let inBand = 0;
      r.frequencies.forEach((f, k) => {
        if (Math.abs(f - 10) <= 2) inBand += r.psd[k]! * 0.5;
      });
      const meanLambda = r.concentrations.reduce((s, v) => s + v, 0) / 7;
      expect(Math.abs(inBand / (2 * meanLambda) - 1)).toBeLessThan(0.01);
    });
  });

  describe('when taper concentrations are poor or adaptive weighting does not settle', () => {
    it('should warn for each taper with λ < 0.9 and default K to 2NW − 1', () => {
      const x = Float64Array.from(fixture.cases[0]!.signal);
      const r = multitaper(x, { samplingRate: 250, timeBandwidth: 2, taperCount: 5 });
      expect(r.concentrations).toHaveLength(5);
      expect(r.warnings.filter((w) => w.includes('concentration'))).toHaveLength(r.concentrations.filter((l) => l < 0.9).length);
      expect(r.warnings.some((w) => w.startsWith('taper 4 has concentration'))).toBe(true);
      expect(multitaper(x, { samplingRate: 250, timeBandwidth: 4 }).concentrations).toHaveLength(7);
      expect(multitaper(x, { samplingRate: 250, timeBandwidth: 4 }).warnings).toEqual([]);
    });
    it('should warn when the iteration cap is reached', () => {
      const x = Float64Array.from(fixture.cases[0]!.signal);
      const r = multitaper(x, { samplingRate: 250, timeBandwidth: 4, weighting: 'adaptive', adaptiveMaxIterations: 1 });
      expect(r.iterations).toBe(1);
      expect(r.warnings.some((w) => w.startsWith('adaptive weighting did not converge in 1 iterations'))).toBe(true);
    });
  });

  describe('when a plan is reused across signals', () => {
    it('should give the same numbers as the one-shot function for every weighting', () => {
      const a = Float64Array.from(fixture.cases[0]!.signal);
      const b = a.map((v, i) => v * Math.cos(i / 7));
      for (const weighting of ['equal', 'eigenvalue', 'adaptive'] as const) {
        const options = { samplingRate: 250, timeBandwidth: 3.5, taperCount: 6, weighting, fftLength: 512 };
        const plan = createMultitaperPlan(500, options);
        plan.compute(a);
        expect(Array.from(plan.compute(b).psd)).toEqual(Array.from(multitaper(b, options).psd));
      }
    });
  });

  describe('when the input is constant', () => {
    it('should give a zero spectrum without NaN after mean removal', () => {
      const r = multitaper(new Float64Array(256).fill(3), { samplingRate: 128, timeBandwidth: 3, weighting: 'adaptive' });
      expect(r.psd.every((v) => v === 0)).toBe(true);
      expect(r.degreesOfFreedom.every((v) => Number.isFinite(v))).toBe(true);
    });
  });

  describe('when the arguments are invalid', () => {
    const x = new Float64Array(100);
    it('should throw naming the parameter', () => {
      expect(() => multitaper(x, { samplingRate: 100, timeBandwidth: 4, fftLength: 64 })).toThrow(/fftLength/);
      expect(() => multitaper(x, { samplingRate: -1, timeBandwidth: 4 })).toThrow(/samplingRate/);
      expect(() => multitaper(x, { samplingRate: 100, timeBandwidth: 60 })).toThrow(/timeBandwidth/);
      expect(() => multitaper(x, { samplingRate: 100, timeBandwidth: 4, weighting: 'median' as never })).toThrow(TypeError);
      expect(() => multitaper(x, { samplingRate: 100, timeBandwidth: 4, adaptiveTolerance: 0 })).toThrow(/adaptiveTolerance/);
      expect(() => createMultitaperPlan(100, { samplingRate: 100, timeBandwidth: 4 }).compute(new Float64Array(99))).toThrow(/x must/);
    });
  });
});
