import { z } from 'zod';
import { DETREND_KINDS } from '../dsp/detrend.js';
import { WINDOW_NAMES } from '../dsp/windows.js';
import { DEFAULT_BANDS } from './bands.js';

/** Version of the recipe format. A recipe carrying another version is refused, never reinterpreted. */
export const RECIPE_SCHEMA = 'rhythmetric.recipe/1';

export const BandSchema = z
  .strictObject({
    name: z.string().min(1).max(64).describe('a label of your own, unique within the recipe'),
    low: z.number().min(0).describe('lower edge in Hz, included'),
    high: z.number().positive().describe('upper edge in Hz, excluded'),
  })
  .refine((b) => b.low < b.high, { message: 'low must be below high', path: ['high'] })
  .meta({ id: 'Band', description: 'A frequency band, half-open: low ≤ f < high (Hz).' });

export const RatioSchema = z
  .strictObject({
    name: z.string().min(1).max(64).optional().describe('defaults to "numerator/denominator"'),
    numerator: z.string().min(1).describe('name of a band of this recipe'),
    denominator: z.string().min(1).describe('name of a band of this recipe'),
  })
  .meta({ id: 'BandRatio', description: 'A ratio of two absolute band powers.' });

const common = {
  schema: z.literal(RECIPE_SCHEMA).default(RECIPE_SCHEMA).describe('recipe format version'),
  detrend: z.enum(DETREND_KINDS).default('mean').describe('removed from each segment before windowing'),
  fftLength: z
    .number()
    .int()
    .positive()
    .max(1 << 24)
    .nullable()
    .default(null)
    .describe('FFT length in samples, any integer ≥ the segment length; null means equal to the segment length (no padding)'),
  frequencyRange: z
    .tuple([z.number().min(0), z.number().positive()])
    .nullable()
    .default(null)
    .describe('[low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist'),
  bands: z
    .array(BandSchema)
    .max(64)
    .default(() => DEFAULT_BANDS.map((b) => ({ ...b })))
    .describe('bands for band power; default: IFCN glossary bands with documented edges'),
  ratios: z.array(RatioSchema).max(64).default([]).describe('ratios of absolute band powers'),
  perEpoch: z.boolean().default(false).describe('also report every epoch on its own, not only the mean over epochs'),
  nonFinite: z
    .enum(['reject', 'skip-epoch'])
    .default('reject')
    .describe('what to do with epochs holding NaN or ±Inf samples (gaps): refuse the job, or leave those epochs out'),
};

export const WelchRecipeSchema = z
  .strictObject({
    method: z.literal('welch'),
    window: z.enum(WINDOW_NAMES).default('hann').describe('taper applied to each segment (periodic form)'),
    tukeyRatio: z.number().min(0).max(1).optional().describe('taper fraction of the tukey window; default 0.5, only with window "tukey"'),
    segmentSeconds: z.number().positive().max(3600).default(2).describe('segment length in seconds'),
    overlap: z.number().min(0).lt(1).default(0.5).describe('fraction of a segment shared with the next one, 0 ≤ overlap < 1'),
    average: z.enum(['mean', 'median']).default('mean').describe('how segment periodograms are combined; median is bias-corrected'),
    ...common,
  })
  .meta({ id: 'WelchRecipe', description: "Welch's averaged, windowed periodogram." });

export const RecipeSchema = z.discriminatedUnion('method', [WelchRecipeSchema]).meta({ id: 'Recipe' });

export type RecipeInput = z.input<typeof RecipeSchema>;
export type Recipe = z.output<typeof RecipeSchema>;
export type WelchRecipe = z.output<typeof WelchRecipeSchema>;
export type Band = z.output<typeof BandSchema>;
