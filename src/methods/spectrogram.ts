/** Short-time spectrogram (one window or DPSS tapers) as a recipe method. */
import { z } from 'zod';
import { defaultTaperCount } from '../dsp/dpss.js';
import { createSpectrogramPlan } from '../dsp/spectrogram.js';
import { WINDOW_NAMES } from '../dsp/windows.js';
import { checkTukey, fftWork, float64Bytes, unfit } from './fit.js';
import { defineMethod } from './method.js';
import { commonSettings, taperOptions, TapersSchema, timeFrequencyCommon, timeFrequencyOutput } from './settings.js';
import { checkFrequencyRange, checkOutput, checkOutputValues, extentOf, fitTimeFrequency, matrixBytes } from './time-frequency.js';

export const SpectrogramRecipeSchema = z
  .strictObject({
    method: z.literal('spectrogram'),
    window: z.enum(WINDOW_NAMES).default('hann'),
    tukeyRatio: z.number().min(0).max(1).optional(),
    tapers: TapersSchema.nullable().default(null).describe('DPSS tapers for a multitaper spectrogram, instead of window'),
    // 1 s holds four cycles of 4 Hz, the lowest theta frequency, and with NW 2 gives ±2 Hz; a step of a
    // tenth of the window samples its time smoothing ten times over without repeating it more.
    segmentSeconds: z.number().positive().max(60).default(1).describe('length of the sliding window'),
    stepSeconds: z.number().positive().max(60).default(0.1).describe('time between window centres'),
    fftLength: commonSettings.fftLength,
    detrend: commonSettings.detrend,
    ...timeFrequencyCommon,
    ...timeFrequencyOutput,
  })
  .meta({ id: 'SpectrogramRecipe', description: 'Short-time spectrogram: one-sided PSD in a sliding window (or DPSS tapers).' });

export type SpectrogramRecipe = z.output<typeof SpectrogramRecipeSchema>;

/** Bins of the one-sided spectrum of `fftLength` points inside [low, high] Hz. */
function binsInRange(fftLength: number, samplingRate: number, [low, high]: [number, number]): number {
  let n = 0;
  for (let k = 0; k <= fftLength >> 1; k++) {
    const f = (k * samplingRate) / fftLength;
    if (f >= low && f <= high) n++;
  }
  return n;
}

export const spectrogram = defineMethod({
  name: 'spectrogram',
  schema: SpectrogramRecipeSchema,
  path: 'time-frequency',
  check(recipe) {
    checkTukey(recipe);
    checkFrequencyRange(recipe);
    checkOutput(recipe);
  },
  fit(recipe, shape, limits) {
    const fit = fitTimeFrequency(recipe, shape, limits, {
      seconds: recipe.segmentSeconds,
      pointer: '/segmentSeconds',
      step: (segmentSamples) => {
        const step = Math.round(recipe.stepSeconds * shape.samplingRate);
        if (step < 1 || step > segmentSamples) throw unfit(`stepSeconds must be between one sample and the window length (${segmentSamples / shape.samplingRate} s)`, '/stepSeconds');
        return step;
      },
    });
    checkOutputValues(recipe, shape, limits, fit.derived.segmentsPerEpoch, Math.floor(fit.derived.fftLength / 2) + 1, 0);
    return fit;
  },
  cost(recipe, derived, shape) {
    const { channels, epochs, prepared } = extentOf(recipe, derived, shape);
    const times = derived.segmentsPerEpoch;
    const full = Math.floor(derived.fftLength / 2) + 1;
    const kept = binsInRange(derived.fftLength, shape.samplingRate, derived.frequencyRange);
    const tapers = recipe.tapers ? (recipe.tapers.taperCount ?? defaultTaperCount(recipe.tapers.timeBandwidth)) : 1;
    // a trial's full matrix and the plan's scratch, beside the kept matrices
    const scratch = float64Bytes(times * full + 4 * derived.fftLength + tapers * derived.segmentSamples);
    const bytes = float64Bytes(prepared) + matrixBytes(recipe, channels, epochs, times, kept, 0) + scratch;
    const work = channels * epochs * times * tapers * (fftWork(derived.fftLength) / 2);
    return { bytes, work, driver: recipe.perEpoch ? '/perEpoch' : '/stepSeconds' };
  },
  createTrialTransform(recipe, derived, samplingRate, samplesPerEpoch) {
    const plan = createSpectrogramPlan(samplesPerEpoch, {
      samplingRate,
      segmentSamples: derived.segmentSamples,
      overlapSamples: derived.overlapSamples,
      fftLength: derived.fftLength,
      detrend: recipe.detrend,
      ...taperOptions(recipe),
    });
    const [lo, hi] = derived.frequencyRange;
    const columns = Array.from(plan.frequencies.keys()).filter((k) => plan.frequencies[k]! >= lo && plan.frequencies[k]! <= hi);
    const full = plan.frequencyCount;
    return {
      times: plan.times,
      frequencies: Float64Array.from(columns, (k) => plan.frequencies[k]!),
      edgeMask: null,
      extra: {},
      transform: (x) => {
        const p = plan.compute(x).power;
        if (columns.length === full) return { power: p };
        const out = new Float64Array(plan.timeCount * columns.length);
        for (let t = 0; t < plan.timeCount; t++) columns.forEach((k, j) => (out[t * columns.length + j] = p[t * full + k]!));
        return { power: out };
      },
    };
  },
});
