/** Complex Morlet wavelet power by FFT convolution, as a recipe method. */
import { z } from 'zod';
import { createMorletPlan, logFrequencies, POWER_FACTOR, SUPPORT_SIGMAS } from '../dsp/morlet.js';
import { fftWork, float64Bytes, invalid, unfit } from './fit.js';
import { defineMethod } from './method.js';
import { timeFrequencyCommon, timeFrequencyOutput } from './settings.js';
import { checkFrequencyRange, checkOutput, checkOutputValues, extentOf, fitTimeFrequency, matrixBytes } from './time-frequency.js';

export const MorletRecipeSchema = z
  .strictObject({
    method: z.literal('morlet'),
    frequencies: z
      .union([z.array(z.number().positive()).min(1).max(512), z.strictObject({ low: z.number().positive(), high: z.number().positive(), count: z.number().int().min(1).max(512) })])
      .default({ low: 2, high: 45, count: 40 })
      .describe('a list of Hz, or a log-spaced range'),
    cycles: z
      .union([z.number().min(1).max(100), z.strictObject({ low: z.number().min(1).max(100), high: z.number().min(1).max(100) })])
      .default(7)
      .describe('cycles per wavelet: fixed, or growing linearly from low (lowest frequency) to high (highest)'),
    decimation: z.number().int().min(1).max(1000).default(1).describe('keep every n-th output time'),
    phaseConsistency: z.boolean().default(false).describe('also the inter-trial phase consistency |mean e^{iφ}| per time and frequency'),
    ...timeFrequencyCommon,
    ...timeFrequencyOutput,
  })
  .meta({ id: 'MorletRecipe', description: 'Complex Morlet wavelet power by FFT convolution; a sinusoid of amplitude A gives A²/2.' });

export type MorletRecipe = z.output<typeof MorletRecipeSchema>;

/**
 * A wavelet whose ±3σ_t span (the edge criterion of the record's edge mask) is more than this many
 * times the epoch it is applied to is refused: every output time would be edge-contaminated, its
 * frequency resolution would describe a signal the epoch does not hold, and its sampled support
 * (±6σ_t) would cost memory and time out of all proportion to the epoch.
 */
export const MAX_WAVELET_TO_EPOCH = 4;

/** The wavelets of a recipe: frequency (Hz), cycles, and the JSON pointer that names the frequency. */
function wavelets(recipe: MorletRecipe): { frequency: number; cycles: number; pointer: string }[] {
  const list = Array.isArray(recipe.frequencies) ? Float64Array.from(recipe.frequencies) : logFrequencies(recipe.frequencies.low, recipe.frequencies.high, recipe.frequencies.count);
  let lo = Infinity,
    hi = -Infinity;
  for (const f of list) {
    lo = Math.min(lo, f);
    hi = Math.max(hi, f);
  }
  const pointerOf = (i: number, f: number) => (Array.isArray(recipe.frequencies) ? `/frequencies/${i}` : f === lo ? '/frequencies/low' : '/frequencies/high');
  // cycles as the plan resolves them: fixed, or linear in frequency from low to high (dsp/morlet.ts)
  const cycles = recipe.cycles;
  return Array.from(list, (frequency, i) => ({
    frequency,
    cycles: typeof cycles === 'number' ? cycles : cycles.low + (cycles.high - cycles.low) * (hi > lo ? (frequency - lo) / (hi - lo) : 0),
    pointer: pointerOf(i, frequency),
  }));
}

export const morlet = defineMethod({
  name: 'morlet',
  schema: MorletRecipeSchema,
  path: 'time-frequency',
  check(recipe) {
    checkFrequencyRange(recipe);
    const f = recipe.frequencies;
    if (!Array.isArray(f) && f.low >= f.high && f.count > 1) throw invalid('frequencies.low must be below frequencies.high', '/frequencies/high');
    if (typeof recipe.cycles === 'object' && recipe.cycles.low > recipe.cycles.high) throw invalid('cycles.low must not exceed cycles.high', '/cycles/high');
    checkOutput(recipe);
  },
  fit(recipe, shape, limits) {
    const fit = fitTimeFrequency(recipe, shape, limits, null);
    const fs = shape.samplingRate;
    const nyquist = fs / 2;
    const list = Array.isArray(recipe.frequencies) ? recipe.frequencies : [recipe.frequencies.low, recipe.frequencies.high];
    list.forEach((f, i) => {
      if (f >= nyquist) {
        const pointer = Array.isArray(recipe.frequencies) ? `/frequencies/${i}` : i === 0 ? '/frequencies/low' : '/frequencies/high';
        throw unfit(`wavelet frequency ${f} Hz is not below the Nyquist frequency ${nyquist} Hz`, pointer);
      }
    });
    const epochSeconds = fit.derived.epochSamples! / fs;
    for (const w of wavelets(recipe)) {
      const span = (6 * w.cycles) / (2 * Math.PI * w.frequency);
      if (span > MAX_WAVELET_TO_EPOCH * epochSeconds) {
        throw unfit(
          `the wavelet at ${w.frequency} Hz with ${w.cycles} cycles spans ±3σ_t = ${span.toPrecision(3)} s (σ_t = cycles/(2π·frequency)), more than ${MAX_WAVELET_TO_EPOCH} times the epoch of ${epochSeconds} s; raise frequencies, lower cycles, or analyse longer epochs`,
          w.pointer,
        );
      }
    }
    const times = Math.ceil(fit.derived.epochSamples! / recipe.decimation);
    const count = Array.isArray(recipe.frequencies) ? recipe.frequencies.length : recipe.frequencies.count;
    checkOutputValues(recipe, shape, limits, times, count, recipe.phaseConsistency ? 1 : 0);
    return fit;
  },
  cost(recipe, derived, shape) {
    const fs = shape.samplingRate;
    const n = derived.epochSamples!;
    const { channels, epochs, prepared } = extentOf(recipe, derived, shape);
    const all = wavelets(recipe);
    let waveletPeak = 0,
      spectra = 0,
      build = 0,
      perTrial = 0;
    for (const w of all) {
      const halfWidth = Math.ceil((SUPPORT_SIGMAS * w.cycles * fs) / (2 * Math.PI * w.frequency));
      // the sampled wavelet (complex, ±6σ_t) exists while its spectrum is made, one at a time
      waveletPeak = Math.max(waveletPeak, 2 * (2 * halfWidth + 1));
      const size = 2 * (n + Math.min(halfWidth, n - 1));
      spectra += size;
      build += 40 * (2 * halfWidth + 1) + fftWork(size);
      perTrial += fftWork(size / recipe.decimation) / 2;
    }
    const times = Math.ceil(n / recipe.decimation);
    const extra = recipe.phaseConsistency ? 2 : 0;
    const bytes = float64Bytes(prepared + waveletPeak + spectra + 4 * 2 * n) + matrixBytes(recipe, channels, epochs, times, all.length, extra);
    const work = build + channels * epochs * (fftWork(2 * n) + perTrial);
    const driver = waveletPeak > spectra + times * all.length ? '/frequencies' : recipe.perEpoch ? '/perEpoch' : '/decimation';
    return { bytes, work, driver };
  },
  createTrialTransform(recipe, _derived, samplingRate, samplesPerEpoch) {
    const plan = createMorletPlan(samplesPerEpoch, { samplingRate, frequencies: recipe.frequencies, cycles: recipe.cycles, decimation: recipe.decimation });
    // One set of convolutions gives both; summaries never use the coefficients.
    const withPhase = recipe.phaseConsistency && recipe.output === 'matrix';
    return {
      times: plan.times,
      frequencies: plan.frequencies,
      edgeMask: plan.edgeMask,
      extra: { edgeSigmas: plan.edgeSigmas, powerFactor: POWER_FACTOR, cycles: Array.from(plan.cycles) },
      transform: withPhase ? (x) => plan.powerAndCoefficients(x) : (x, sum) => ({ power: sum ? plan.power(x, sum, true) : plan.power(x) }),
    };
  },
});
