import { perBinDegreesOfFreedom, welchDegreesOfFreedom } from '../dsp/dof.js';
import { createMultitaperPlan } from '../dsp/multitaper.js';
import { createPeriodogramPlan } from '../dsp/periodogram.js';
import { createWelchPlan } from '../dsp/welch.js';
import { makeWindow } from '../dsp/windows.js';
import type { ResolvedRecipe } from '../recipes/resolve.js';

/** One spectrum of one channel of one epoch, with its equivalent degrees of freedom per bin. */
export interface Estimate {
  psd: Float64Array;
  degreesOfFreedom: Float64Array;
  warnings: readonly string[];
}

/** A spectral estimator set up once per job (windows, tapers, FFT plans) and reused per channel and epoch. */
export interface Estimator {
  readonly frequencies: Float64Array;
  /** warnings that hold for every estimate (e.g. poorly concentrated tapers) */
  readonly warnings: readonly string[];
  estimate(x: Float64Array): Estimate;
}

const none: readonly string[] = Object.freeze([]);

export function createEstimator(samplingRate: number, resolved: ResolvedRecipe): Estimator {
  const { recipe, derived } = resolved;
  switch (recipe.method) {
    case 'welch': {
      const window = makeWindow(recipe.window, derived.segmentSamples, recipe.tukeyRatio === undefined ? {} : { tukeyRatio: recipe.tukeyRatio });
      const plan = createWelchPlan({
        samplingRate,
        segmentSamples: derived.segmentSamples,
        overlapSamples: derived.overlapSamples,
        fftLength: derived.fftLength,
        window,
        detrend: recipe.detrend,
        average: recipe.average,
      });
      const dof = perBinDegreesOfFreedom(welchDegreesOfFreedom(window, derived.overlapSamples, derived.segmentsPerEpoch, recipe.average), derived.fftLength);
      return { frequencies: plan.frequencies, warnings: none, estimate: (x) => ({ psd: plan.compute(x).psd, degreesOfFreedom: dof, warnings: none }) };
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
      const shared = new Set(plan.warnings);
      return {
        frequencies: plan.frequencies,
        warnings: plan.warnings,
        estimate: (x) => {
          const r = plan.compute(x);
          return { psd: r.psd, degreesOfFreedom: r.degreesOfFreedom, warnings: r.warnings.filter((w) => !shared.has(w)) };
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
          return { psd: r.psd, degreesOfFreedom: r.degreesOfFreedom, warnings: none };
        },
      };
    }
  }
}
