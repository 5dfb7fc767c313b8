/** The (modified) periodogram of each whole epoch, as a recipe method. */
import { z } from 'zod';
import { createPeriodogramPlan } from '../dsp/periodogram.js';
import { WINDOW_NAMES } from '../dsp/windows.js';
import { checkTukey, fftWork, float64Bytes } from './fit.js';
import { defineMethod } from './method.js';
import { wholeEpoch } from './multitaper.js';
import { commonSettings } from './settings.js';
import { checkBandsAndRatios, checkSpectrumSettings, fitSpectrum, spectrumCost } from './spectrum.js';

export const PeriodogramRecipeSchema = z
  .strictObject({
    method: z.literal('periodogram'),
    window: z.enum(WINDOW_NAMES).default('rectangular').describe('data window over the whole epoch (periodic form)'),
    tukeyRatio: z.number().min(0).max(1).optional().describe('taper fraction of the tukey window; default 0.5, only with window "tukey"'),
    ...commonSettings,
  })
  .meta({ id: 'PeriodogramRecipe', description: 'The (modified) periodogram of each whole epoch.' });

export type PeriodogramRecipe = z.output<typeof PeriodogramRecipeSchema>;

const none: readonly string[] = Object.freeze([]);

export const periodogram = defineMethod({
  name: 'periodogram',
  schema: PeriodogramRecipeSchema,
  path: 'spectrum',
  spreadsChannels: true,
  check(recipe) {
    checkTukey(recipe);
    checkSpectrumSettings(recipe);
    checkBandsAndRatios(recipe);
  },
  fit(recipe, shape, limits) {
    return fitSpectrum(recipe, shape, limits, (epoch) => wholeEpoch(recipe, epoch, shape));
  },
  cost(recipe, derived, shape) {
    const scratch = 2 * derived.segmentSamples + 2 * derived.fftLength;
    return spectrumCost(recipe, derived, shape, float64Bytes(scratch), fftWork(derived.fftLength) / 2, recipe.fftLength === null ? '/epoching' : '/fftLength');
  },
  createEstimator(samplingRate, recipe, derived) {
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
  },
});
