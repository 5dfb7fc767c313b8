/** Welch's averaged, windowed periodogram as a recipe method. */
import { z } from 'zod';
import { perBinDegreesOfFreedom, welchDegreesOfFreedom } from '../dsp/dof.js';
import { createWelchPlan } from '../dsp/welch.js';
import { makeWindow, WINDOW_NAMES } from '../dsp/windows.js';
import { checkTukey, fftWork, float64Bytes, unfit } from './fit.js';
import { defineMethod, type Estimator } from './method.js';
import { commonSettings } from './settings.js';
import { checkBandsAndRatios, checkSpectrumSettings, fitSpectrum, spectrumCost } from './spectrum.js';

export const WelchRecipeSchema = z
  .strictObject({
    method: z.literal('welch'),
    window: z.enum(WINDOW_NAMES).default('hann').describe('taper applied to each segment (periodic form)'),
    tukeyRatio: z.number().min(0).max(1).optional().describe('taper fraction of the tukey window; default 0.5, only with window "tukey"'),
    segmentSeconds: z.number().positive().max(3600).default(2).describe('segment length in seconds'),
    overlap: z.number().min(0).lt(1).default(0.5).describe('fraction of a segment shared with the next one, 0 ≤ overlap < 1'),
    average: z.enum(['mean', 'median']).default('mean').describe('how segment periodograms are combined; median is bias-corrected'),
    ...commonSettings,
  })
  .meta({ id: 'WelchRecipe', description: "Welch's averaged, windowed periodogram." });

export type WelchRecipe = z.output<typeof WelchRecipeSchema>;

const none: readonly string[] = Object.freeze([]);

export const welch = defineMethod({
  name: 'welch',
  schema: WelchRecipeSchema,
  path: 'spectrum',
  leavesOutSegments: true,
  spreadsChannels: true,
  check(recipe) {
    checkTukey(recipe);
    checkSpectrumSettings(recipe);
    checkBandsAndRatios(recipe);
  },
  fit(recipe, shape, limits) {
    return fitSpectrum(recipe, shape, limits, ({ samplingRate: fs, samplesPerEpoch }) => {
      const warnings: string[] = [];
      const exactSegment = recipe.segmentSeconds * fs;
      const segmentSamples = Math.round(exactSegment);
      if (segmentSamples < 2) throw unfit(`a segment of ${recipe.segmentSeconds} s at ${fs} Hz holds ${segmentSamples} sample(s); at least 2 are needed`, '/segmentSeconds');
      if (Math.abs(exactSegment - segmentSamples) > 1e-9 * Math.max(1, exactSegment)) {
        warnings.push(`segmentSeconds ${recipe.segmentSeconds} s is ${exactSegment} samples at ${fs} Hz; rounded to ${segmentSamples} samples (${segmentSamples / fs} s)`);
      }
      if (segmentSamples > samplesPerEpoch) {
        throw unfit(`a segment of ${recipe.segmentSeconds} s (${segmentSamples} samples) is longer than the epoch (${samplesPerEpoch} samples = ${samplesPerEpoch / fs} s)`, '/segmentSeconds');
      }
      return { segmentSamples, overlapSamples: Math.floor(recipe.overlap * segmentSamples), warnings };
    });
  },
  cost(recipe, derived, shape) {
    const n = derived.fftLength;
    // plan scratch (re, im, power) and, for the median, every segment's periodogram
    const scratch = 3 * n + (recipe.average === 'median' ? derived.segmentsPerEpoch * (Math.floor(n / 2) + 1) : 0);
    return spectrumCost(recipe, derived, shape, float64Bytes(scratch), (derived.segmentsPerEpoch / 2) * fftWork(n), recipe.fftLength === null ? '/segmentSeconds' : '/fftLength');
  },
  createEstimator(samplingRate, recipe, derived, segmentFilter): Estimator {
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
  },
});
