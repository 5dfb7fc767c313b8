import { perBinDegreesOfFreedom, welchDegreesOfFreedom } from '../dsp/dof.js';
import { createMultitaperPlan } from '../dsp/multitaper.js';
import { createPeriodogramPlan } from '../dsp/periodogram.js';
import { createWelchPlan } from '../dsp/welch.js';
import { makeWindow } from '../dsp/windows.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';
import type { SpectrumRecipe } from '../recipes/schema.js';

/** One spectrum of one channel of one epoch, with its equivalent degrees of freedom per bin. */
export interface Estimate {
  psd: Float64Array;
  degreesOfFreedom: Float64Array;
  warnings: readonly string[];
  /** Welch: segments averaged and segments left out (bad spans, amplitude) */
  segments: { used: number; leftOut: number };
}

/** Decides per channel whether a Welch segment [start, end) of `x` may be averaged. */
export type SegmentFilter = (x: Float64Array, start: number, end: number) => boolean;

/** A spectral estimator set up once per job (windows, tapers, FFT plans) and reused per channel and epoch. */
export interface Estimator {
  readonly frequencies: Float64Array;
  /** warnings that hold for every estimate (e.g. poorly concentrated tapers) */
  readonly warnings: readonly string[];
  estimate(x: Float64Array): Estimate;
}

const none: readonly string[] = Object.freeze([]);

export function createEstimator(samplingRate: number, resolved: ResolvedRecipe<SpectrumRecipe>, segmentFilter: SegmentFilter | null = null): Estimator {
  const { recipe, derived } = resolved;
  switch (recipe.method) {
    case 'welch': {
      const window = makeWindow(recipe.window, derived.segmentSamples, recipe.tukeyRatio === undefined ? {} : { tukeyRatio: recipe.tukeyRatio });
      const plan = createWelchPlan({
        ...(segmentFilter ? { acceptSegment: segmentFilter } : {}),
        samplingRate,
        segmentSamples: derived.segmentSamples,
        overlapSamples: derived.overlapSamples,
        fftLength: derived.fftLength,
        window,
        detrend: recipe.detrend,
        average: recipe.average,
      });
      const dofFor = new Map<number, Float64Array>();
      const dof = (count: number) => {
        let d = dofFor.get(count);
        if (!d) {
          // With segments left out the overlap structure is broken; the formula for `count` contiguous
          // segments is then an approximation, and a generous one.
          d = perBinDegreesOfFreedom(welchDegreesOfFreedom(window, derived.overlapSamples, count, recipe.average), derived.fftLength);
          dofFor.set(count, d);
        }
        return d;
      };
      return {
        frequencies: plan.frequencies,
        warnings: none,
        estimate: (x) => {
          const r = plan.compute(x);
          return { psd: r.psd, degreesOfFreedom: dof(r.segmentCount), warnings: none, segments: { used: r.segmentCount, leftOut: r.rejectedSegments } };
        },
      };
    }
    case 'multitaper': {
      const plan = createMultitaperPlan(derived.segmentSamples, {
        samplingRate,
        timeBandwidth: recipe.timeBandwidth,
        taperCount: derived.taperCount!,
        weighting: recipe.taperWeighting,
        fftLength: derived.fftLength,
        detrend: recipe.detrend,
      });
      return {
        frequencies: plan.frequencies,
        warnings: plan.warnings,
        estimate: (x) => {
          const r = plan.compute(x);
          return { psd: r.psd, degreesOfFreedom: r.degreesOfFreedom, warnings: r.warnings, segments: { used: 1, leftOut: 0 } };
        },
      };
    }
    case 'periodogram': {
      const plan = createPeriodogramPlan(derived.segmentSamples, {
        samplingRate,
        window: recipe.window,
        ...(recipe.tukeyRatio === undefined ? {} : { tukeyRatio: recipe.tukeyRatio }),
        fftLength: derived.fftLength,
        detrend: recipe.detrend,
      });
      return {
        frequencies: plan.frequencies,
        warnings: none,
        estimate: (x) => {
          const r = plan.compute(x);
          return { psd: r.psd, degreesOfFreedom: r.degreesOfFreedom, warnings: none, segments: { used: 1, leftOut: 0 } };
        },
      };
    }
  }
}
