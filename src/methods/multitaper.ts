/** Thomson's multitaper estimate with DPSS tapers over each whole epoch, as a recipe method. */
import { z } from 'zod';
import { defaultTaperCount } from '../dsp/dpss.js';
import { createMultitaperPlan, TAPER_WEIGHTINGS } from '../dsp/multitaper.js';
import { fftWork, float64Bytes, invalid, unfit, type SignalShape } from './fit.js';
import { defineMethod } from './method.js';
import { commonSettings } from './settings.js';
import { checkBandsAndRatios, checkSpectrumSettings, fitSpectrum, spectrumCost, type Segmenting, type SpectrumSettings } from './spectrum.js';

export const MultitaperRecipeSchema = z
  .strictObject({
    method: z.literal('multitaper'),
    timeBandwidth: z.number().min(0.5).max(50).default(4).describe('NW; the half-bandwidth is NW·fs/N Hz for an epoch of N samples'),
    taperCount: z.number().int().min(1).max(200).nullable().default(null).describe('K; null means ⌊2·NW⌋ − 1'),
    taperWeighting: z.enum(TAPER_WEIGHTINGS).default('adaptive').describe('equal, eigenvalue (λ_k) or adaptive (Thomson 1982) weights'),
    ...commonSettings,
  })
  .meta({ id: 'MultitaperRecipe', description: 'Thomson multitaper estimate with DPSS (Slepian) tapers over each whole epoch.' });

export type MultitaperRecipe = z.output<typeof MultitaperRecipeSchema>;

/**
 * Multitaper and periodogram estimates use each whole epoch as one segment; bad spans of an
 * unepoched signal can then only keep or drop that one epoch, which the record says.
 */
export function wholeEpoch(recipe: SpectrumSettings, shape: SignalShape, original: SignalShape): Segmenting {
  const warnings: string[] = [];
  if (recipe.epoching === null && (original.epochCount ?? 1) === 1 && (recipe.badSpans.labels.length > 0 || recipe.badSpans.peakToPeak !== null)) {
    warnings.push(`bad spans leave out Welch segments or epochs; ${recipe.method} on an unepoched signal can only use or skip whole epochs`);
  }
  return { segmentSamples: shape.samplesPerEpoch, overlapSamples: 0, warnings };
}

export const multitaper = defineMethod({
  name: 'multitaper',
  schema: MultitaperRecipeSchema,
  path: 'spectrum',
  spreadsChannels: true,
  check(recipe) {
    checkSpectrumSettings(recipe);
    if (recipe.taperCount !== null && recipe.taperCount > 2 * recipe.timeBandwidth) {
      throw invalid(
        `taperCount ${recipe.taperCount} exceeds 2·timeBandwidth = ${2 * recipe.timeBandwidth}: tapers past 2NW are poorly concentrated; use at most ⌊2NW⌋ (⌊2NW⌋ − 1 is the usual choice)`,
        '/taperCount',
      );
    }
    checkBandsAndRatios(recipe);
  },
  fit(recipe, shape, limits) {
    const fit = fitSpectrum(recipe, shape, limits, (epoch) => wholeEpoch(recipe, epoch, shape));
    const { segmentSamples } = fit.derived;
    const taperCount = recipe.taperCount ?? defaultTaperCount(recipe.timeBandwidth);
    if (taperCount > segmentSamples) throw unfit(`taperCount ${taperCount} exceeds the epoch length (${segmentSamples} samples)`, '/taperCount');
    fit.derived.taperCount = taperCount;
    fit.derived.halfBandwidth = (recipe.timeBandwidth * shape.samplingRate) / segmentSamples;
    return fit;
  },
  cost(recipe, derived, shape) {
    const n = derived.segmentSamples;
    const K = derived.taperCount ?? 1;
    const bins = Math.floor(derived.fftLength / 2) + 1;
    // K tapers of n samples (and the tridiagonal solve behind them), FFT scratch, K eigenspectra
    const scratch = (K + 4) * n + 2 * derived.fftLength + K * bins;
    const iterations = recipe.taperWeighting === 'adaptive' ? 20 : 1;
    return spectrumCost(recipe, derived, shape, float64Bytes(scratch), (K / 2) * fftWork(derived.fftLength) + iterations * K * bins, recipe.fftLength === null ? '/taperCount' : '/fftLength');
  },
  createEstimator(samplingRate, recipe, derived) {
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
  },
});
