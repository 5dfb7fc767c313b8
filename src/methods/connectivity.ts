/** Coherence, imaginary coherency and phase locking between channel pairs, as a recipe method. */
import { z } from 'zod';
import { defaultTaperCount } from '../dsp/dpss.js';
import { WINDOW_NAMES } from '../dsp/windows.js';
import { checkBandNames, checkTukey, countBins, epochCountOf, fftWork, float64Bytes, invalid, unfit } from './fit.js';
import { defineMethod } from './method.js';
import { commonSettings, TapersSchema, timeFrequencyCommon } from './settings.js';
import { checkFrequencyRange, extentOf, fitTimeFrequency } from './time-frequency.js';

export const ConnectivityRecipeSchema = z
  .strictObject({
    method: z.literal('connectivity'),
    window: z.enum(WINDOW_NAMES).default('hann'),
    tukeyRatio: z.number().min(0).max(1).optional(),
    tapers: TapersSchema.nullable().default(null).describe('multitaper cross-spectra instead of Welch segments'),
    segmentSeconds: z.number().positive().max(3600).default(1),
    overlap: z.number().min(0).lt(1).default(0.5),
    fftLength: commonSettings.fftLength,
    detrend: commonSettings.detrend,
    pairs: z
      .array(z.tuple([z.string().min(1), z.string().min(1)]))
      .max(10_000)
      .nullable()
      .default(null)
      .describe('channel pairs by name; null means every pair'),
    bands: commonSettings.bands,
    ...timeFrequencyCommon,
  })
  .meta({ id: 'ConnectivityRecipe', description: 'Magnitude-squared coherence, imaginary coherency and phase-locking value between channel pairs.' });

export type ConnectivityRecipe = z.output<typeof ConnectivityRecipeSchema>;

export const connectivity = defineMethod({
  name: 'connectivity',
  schema: ConnectivityRecipeSchema,
  path: 'connectivity',
  check(recipe) {
    checkTukey(recipe);
    checkFrequencyRange(recipe);
    checkBandNames(recipe.bands);
    recipe.pairs?.forEach(([a, b], i) => {
      if (a === b) throw invalid(`pair ${i} joins channel "${a}" to itself`, `/pairs/${i}/1`);
    });
  },
  fit(recipe, shape, limits) {
    const fit = fitTimeFrequency(recipe, shape, limits, {
      seconds: recipe.segmentSeconds,
      pointer: '/segmentSeconds',
      step: (segmentSamples) => segmentSamples - Math.floor(recipe.overlap * segmentSamples),
    });
    recipe.pairs?.forEach(([a, b], i) => {
      [a, b].forEach((name, j) => {
        if (shape.channels && !shape.channels.includes(name)) throw unfit(`pair channel "${name}" is not in the signal`, `/pairs/${i}/${j}`);
      });
    });
    const { fftLength, frequencyResolution, epochSamples } = fit.derived;
    recipe.bands.forEach((band, i) => {
      if (countBins(band.low, band.high, shape.samplingRate, fftLength) === 0) {
        throw unfit(`band "${band.name}" [${band.low}, ${band.high}) Hz holds no frequency bin at a resolution of ${frequencyResolution} Hz; widen it or raise fftLength`, `/bands/${i}`);
      }
    });
    // Phase locking is a statistic across epochs, and coherence's bias and threshold assume several.
    const epochs = recipe.epoching?.mode === 'events' && !shape.events ? null : epochCountOf(recipe, shape, epochSamples!);
    if (epochs !== null && epochs < 2) {
      throw unfit(
        `connectivity needs at least 2 epochs (phase locking is measured across epochs); ${recipe.epoching ? `the epoching cuts ${epochs}` : 'this signal has 1'}: cut it with "epoching" or upload epochs`,
        '/epoching',
      );
    }
    return fit;
  },
  cost(recipe, derived, shape) {
    const { channels, epochs, prepared } = extentOf(recipe, derived, shape, 'every channel');
    const pairs = recipe.pairs?.length ?? (channels * (channels - 1)) / 2;
    const bins = Math.floor(derived.fftLength / 2) + 1;
    const tapers = recipe.tapers ? (recipe.tapers.taperCount ?? defaultTaperCount(recipe.tapers.timeBandwidth)) : 1;
    // per pair: summed and per-epoch cross-spectra, phase sums and the three results; per channel: spectra and auto-spectra
    const arrays = 9 * pairs * bins + 3 * channels * bins + tapers * derived.segmentSamples + 2 * derived.fftLength;
    const bytes = float64Bytes(prepared + arrays);
    const work = epochs * derived.segmentsPerEpoch * tapers * ((channels / 2) * fftWork(derived.fftLength) + 10 * pairs * bins);
    return { bytes, work, driver: '/pairs' };
  },
});
