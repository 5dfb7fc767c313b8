import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { spectralEdge } from '../../src/features/edge.js';

// numpy reference of the same rule (trapezoid cumulative + np.interp), scripts/make-multitaper-fixtures.py.
const fixture = JSON.parse(readFileSync(new URL('../fixtures/multitaper/spectral-edge.json', import.meta.url), 'utf8')) as {
  cases: Array<{ binWidth: number; range: [number, number]; percentiles: number[]; edges: number[] }>;
};
const grid = (binWidth: number, top: number): Float64Array => Float64Array.from({ length: Math.round(top / binWidth) + 1 }, (_, k) => k * binWidth);
const inverse = (f: Float64Array): Float64Array => f.map((v) => (v > 0 ? 1 / v : 0));

describe('spectralEdge', () => {
  describe('when the PSD is flat on [0, 50] Hz (docs/references.md §7, COMPUTED)', () => {
    it('should give SEF95 = 47.5 Hz and SEF50 = 25 Hz to 1e-12', () => {
      const f = grid(0.5, 60);
      const r = spectralEdge(f, new Float64Array(f.length).fill(3), { range: [0, 50] });
      expect(r.edges.map((e) => e.percentile)).toEqual([50, 95]);
      expect(Math.abs(r.edges[0]!.frequency! - 25)).toBeLessThan(1e-12);
      expect(Math.abs(r.edges[1]!.frequency! - 47.5)).toBeLessThan(1e-12);
      expect(Math.abs(r.totalPower - 150)).toBeLessThan(1e-10);
    });
  });

  describe('when the PSD is 1/f on [1, 40] Hz', () => {
    for (const c of fixture.cases) {
      it(`should match numpy's trapezoid + np.interp values to 1e-12 at Δf = ${c.binWidth} Hz`, () => {
        const f = grid(c.binWidth, 60);
        const r = spectralEdge(f, inverse(f), { range: c.range, percentiles: c.percentiles });
        r.edges.forEach((e, i) => expect(Math.abs(e.frequency! - c.edges[i]!)).toBeLessThan(1e-12));
      });
    }
    it('should approach SEF95 = 40^0.95 = 33.2627 Hz (docs/references.md §7) within 1e-3 Hz on a 0.01 Hz grid', () => {
      const f = grid(0.01, 45);
      const r = spectralEdge(f, inverse(f), { range: [1, 40], percentiles: [95] });
      expect(Math.abs(r.edges[0]!.frequency! - 40 ** 0.95)).toBeLessThan(1e-3);
      expect(Math.abs(40 ** 0.95 - 33.2627)).toBeLessThan(1e-4);
    });
  });

  describe('when the spectrum holds two equal lines at 10 and 20 Hz on a 1 Hz grid', () => {
    it('should give the hand-derived edges SEF50 = 11 Hz (first crossing) and SEF95 = 20.8 Hz', () => {
      // The trapezoid spreads each unit line over ±1 bin: C(10) = 0.5, C(11) = 1 = half of the total 2,
      // C(20) = 1.5, C(21) = 2, so 95 % (1.9) falls 0.4/0.5 of the way from 20 to 21 Hz.
      const f = grid(1, 30);
      const p = new Float64Array(f.length);
      p[10] = 1;
      p[20] = 1;
      const r = spectralEdge(f, p, { range: [0, 30] });
      expect(r.edges[0]!.frequency).toBeCloseTo(11, 12);
      expect(r.edges[1]!.frequency).toBeCloseTo(20.8, 12);
    });
  });

  describe('when the range holds no power or the percentiles are invalid', () => {
    it('should give null edges with a warning', () => {
      const f = grid(1, 30);
      const r = spectralEdge(f, new Float64Array(f.length), { range: [5, 10] });
      expect(r.edges.every((e) => e.frequency === null)).toBe(true);
      expect(r.warnings[0]).toMatch(/no power/);
    });
    it('should throw RangeError naming the argument', () => {
      const f = grid(1, 30);
      expect(() => spectralEdge(f, f, { range: [0, 10], percentiles: [101] })).toThrow(/percentiles/);
      expect(() => spectralEdge(f, f, { range: [10, 0] })).toThrow(/range/);
      expect(() => spectralEdge(f, f.subarray(1), { range: [0, 10] })).toThrow(/psd/);
    });
  });
});
