import { z } from 'zod';
import { DETREND_KINDS } from '../dsp/detrend.js';
import { TAPER_WEIGHTINGS } from '../dsp/multitaper.js';
import { BASELINE_MODES } from '../dsp/baseline.js';
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

const Range = z.tuple([z.number().min(0), z.number().positive()]);
const OptionalRange = Range.nullable().default(null).describe('[low, high] Hz, both included; null means the recipe\'s frequencyRange');

/** Spectral features, each computed only when named (an empty object takes every default). */
export const FeaturesSchema = z
  .strictObject({
    peakFrequency: z
      .strictObject({
        range: Range.default([7, 14]).describe('search range, Hz; default 7–14 Hz, around the adult alpha rhythm (common practice)'),
        minHeightDb: z.number().min(0).max(60).default(3).describe('how far a peak must stand above the power-law background, dB'),
      })
      .optional()
      .describe('frequency of the highest local maximum above the 1/f background, refined by a parabola through the log spectrum'),
    centroid: z.strictObject({ range: OptionalRange }).optional().describe('power-weighted mean frequency'),
    spectralEdge: z
      .strictObject({
        percentiles: z.array(z.number().gt(0).lt(100)).min(1).max(20).default([50, 95]),
        range: OptionalRange,
      })
      .optional()
      .describe('frequencies below which the given percentages of the power in the range lie (trapezoid cumulative power, linear interpolation)'),
    entropy: z.strictObject({ range: OptionalRange }).optional().describe('Shannon entropy of the normalized PSD over the range, divided by ln(bins): 0…1'),
    powerLaw: z
      .strictObject({
        range: Range.default([1, 40]).describe('fitting range, Hz'),
        robust: z.boolean().default(true).describe('down-weight peaks (iteratively reweighted, bisquare)'),
      })
      .optional()
      .describe('the aperiodic (1/f) background: a line log10 PSD = intercept + slope·log10 f fitted over the range'),
    lineNoise: z
      .strictObject({
        frequency: z.union([z.literal(50), z.literal(60)]).default(50).describe('mains frequency, Hz'),
        harmonics: z.number().int().min(1).max(10).default(3),
        halfWidth: z.number().positive().default(1).describe('half-width of each line band, Hz'),
        neighbourhoodWidth: z.number().positive().default(4).describe('width of the comparison band on each side, Hz'),
      })
      .optional()
      .describe('mean PSD in narrow bands at the mains frequency and its harmonics over the mean PSD around them (1 means none)'),
    quality: z
      .strictObject({
        flatThreshold: z.number().min(0).default(1e-6).describe('a standard deviation at or below this (signal unit) is a flat channel'),
        clipRunSamples: z.number().int().min(2).default(5).describe('consecutive samples at the epoch minimum or maximum that count as clipping'),
        maxPeakToPeak: z.number().positive().nullable().default(null).describe('peak-to-peak amplitude (signal unit) above which an epoch is flagged; null: not checked'),
        dropFlagged: z.boolean().default(false).describe('leave epochs with any flagged channel out of the averages'),
      })
      .optional()
      .describe('time-domain flags per channel and epoch: flat, clipped, excessive amplitude'),
  })
  .meta({ id: 'Features' });

export const EpochingSchema = z
  .discriminatedUnion('mode', [
    z.strictObject({
      mode: z.literal('fixed'),
      lengthSeconds: z.number().positive().max(3600).describe('epoch length'),
      stepSeconds: z.number().positive().max(3600).nullable().default(null).describe('time between epoch starts; null = lengthSeconds (no overlap)'),
    }),
    z.strictObject({
      mode: z.literal('events'),
      labels: z.array(z.string().min(1)).min(1).max(256).nullable().default(null).describe("event labels to cut around; null = every event of the signal"),
      beforeSeconds: z.number().min(0).max(3600).default(0).describe('data kept before each event'),
      afterSeconds: z.number().positive().max(3600).describe('data kept after each event'),
      baseline: z.tuple([z.number(), z.number()]).nullable().default(null).describe('[start, end) s relative to the event; its mean is subtracted per channel'),
    }),
    z.strictObject({
      mode: z.literal('blocks'),
      labels: z.array(z.string().min(1)).min(1).max(256).describe('labels of the blocks to tile: events with a duration, e.g. "eyes-closed"'),
      lengthSeconds: z.number().positive().max(3600).describe('epoch length'),
      stepSeconds: z.number().positive().max(3600).nullable().default(null).describe('time between epoch starts within a block; null = lengthSeconds (no overlap)'),
    }),
  ])
  .meta({
    id: 'Epoching',
    description:
      'Cut a continuous signal into epochs: fixed-length, around its events, or fixed-length inside labelled blocks (events with a duration), each epoch carrying its block label. Events come from EDF+ annotations or an upload.',
  });

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
    .describe('FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)'),
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
  confidence: z
    .number()
    .gt(0)
    .lt(1)
    .nullable()
    .default(null)
    .describe('confidence level of per-bin χ² intervals (psdLower/psdUpper), e.g. 0.95; null: none'),
  features: FeaturesSchema.default({}).describe('spectral features to compute, by name'),
  reference: z
    .union([z.enum(['none', 'average']), z.strictObject({ channel: z.string().min(1) })])
    .default('none')
    .describe('re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)'),
  epoching: EpochingSchema.nullable().default(null).describe('cut a continuous signal into epochs first; null = use the epochs as uploaded'),
  badSpans: z
    .strictObject({
      labels: z.array(z.string().min(1)).max(256).default([]).describe('events with these labels mark bad spans [onset, onset + duration]'),
      peakToPeak: z.number().positive().nullable().default(null).describe('an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out'),
    })
    .default({ labels: [], peakToPeak: null })
    .describe('time spans left out: a Welch segment or an epoch overlapping one is not averaged'),
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

export const MultitaperRecipeSchema = z
  .strictObject({
    method: z.literal('multitaper'),
    timeBandwidth: z.number().min(0.5).max(50).default(4).describe('NW; the half-bandwidth is NW·fs/N Hz for an epoch of N samples'),
    taperCount: z.number().int().min(1).max(200).nullable().default(null).describe('K; null means ⌊2·NW⌋ − 1'),
    taperWeighting: z.enum(TAPER_WEIGHTINGS).default('adaptive').describe('equal, eigenvalue (λ_k) or adaptive (Thomson 1982) weights'),
    ...common,
  })
  .meta({ id: 'MultitaperRecipe', description: 'Thomson multitaper estimate with DPSS (Slepian) tapers over each whole epoch.' });

export const PeriodogramRecipeSchema = z
  .strictObject({
    method: z.literal('periodogram'),
    window: z.enum(WINDOW_NAMES).default('rectangular').describe('data window over the whole epoch (periodic form)'),
    tukeyRatio: z.number().min(0).max(1).optional().describe('taper fraction of the tukey window; default 0.5, only with window "tukey"'),
    ...common,
  })
  .meta({ id: 'PeriodogramRecipe', description: 'The (modified) periodogram of each whole epoch.' });

const TapersSchema = z.strictObject({
  timeBandwidth: z.number().min(0.5).max(50).default(3),
  taperCount: z.number().int().min(1).max(200).nullable().default(null).describe('null means ⌊2·NW⌋ − 1'),
});

/** Settings shared by the time–frequency and connectivity methods. */
const timeFrequencyCommon = {
  schema: common.schema,
  reference: common.reference,
  epoching: common.epoching,
  badSpans: common.badSpans,
  nonFinite: common.nonFinite,
  frequencyRange: common.frequencyRange,
};

const BaselineSchema = z
  .strictObject({
    start: z.number().describe('s, relative to the event (events epoching) or to the epoch start'),
    end: z.number().describe('s, both ends included'),
    mode: z.enum(BASELINE_MODES).default('decibel').describe('decibel 10·log10(P/B), percent 100·(P−B)/B, ratio P/B, zscore (P − mean_B)/sd_B'),
  })
  .meta({ id: 'Baseline', description: 'Normalization of time–frequency power by its mean over a baseline window, per frequency, over trials.' });

const SummarySchema = z
  .array(
    z.strictObject({
      name: z.string().min(1).max(64),
      low: z.number().min(0).describe('Hz, included'),
      high: z.number().positive().describe('Hz, excluded'),
      start: z.number().describe('s, included (same time origin as baseline)'),
      end: z.number().describe('s, excluded'),
    }),
  )
  .max(256)
  .default([])
  .describe('band-and-window averages of the (normalized) power per channel');

const timeFrequencyOutput = {
  baseline: BaselineSchema.nullable().default(null),
  output: z.enum(['matrix', 'summary']).default('matrix').describe('matrix: full time × frequency matrices as binary attachments; summary: only the band-and-window averages'),
  summary: SummarySchema,
  perTrial: z.boolean().default(false).describe('also keep every trial\'s matrix (attachments grow with the number of epochs)'),
};

export const SpectrogramRecipeSchema = z
  .strictObject({
    method: z.literal('spectrogram'),
    window: z.enum(WINDOW_NAMES).default('hann'),
    tukeyRatio: z.number().min(0).max(1).optional(),
    tapers: TapersSchema.nullable().default(null).describe('DPSS tapers for a multitaper spectrogram, instead of window'),
    windowSeconds: z.number().positive().max(60).default(0.5).describe('length of the sliding window'),
    stepSeconds: z.number().positive().max(60).default(0.05).describe('time between window centres'),
    fftLength: common.fftLength,
    detrend: common.detrend,
    ...timeFrequencyCommon,
    ...timeFrequencyOutput,
  })
  .meta({ id: 'SpectrogramRecipe', description: 'Short-time spectrogram: one-sided PSD in a sliding window (or DPSS tapers).' });

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

export const ConnectivityRecipeSchema = z
  .strictObject({
    method: z.literal('connectivity'),
    window: z.enum(WINDOW_NAMES).default('hann'),
    tukeyRatio: z.number().min(0).max(1).optional(),
    tapers: TapersSchema.nullable().default(null).describe('multitaper cross-spectra instead of Welch segments'),
    segmentSeconds: z.number().positive().max(3600).default(1),
    overlap: z.number().min(0).lt(1).default(0.5),
    fftLength: common.fftLength,
    detrend: common.detrend,
    pairs: z
      .array(z.tuple([z.string().min(1), z.string().min(1)]))
      .max(10_000)
      .nullable()
      .default(null)
      .describe('channel pairs by name; null means every pair'),
    bands: common.bands,
    ...timeFrequencyCommon,
  })
  .meta({ id: 'ConnectivityRecipe', description: 'Magnitude-squared coherence, imaginary coherency and phase-locking value between channel pairs.' });

export const METHODS = ['welch', 'multitaper', 'periodogram', 'spectrogram', 'morlet', 'connectivity'] as const;
export const SPECTRUM_METHODS = ['welch', 'multitaper', 'periodogram'] as const;

export const RecipeSchema = z
  .discriminatedUnion('method', [WelchRecipeSchema, MultitaperRecipeSchema, PeriodogramRecipeSchema, SpectrogramRecipeSchema, MorletRecipeSchema, ConnectivityRecipeSchema])
  .meta({ id: 'Recipe' });

export type RecipeInput = z.input<typeof RecipeSchema>;
export type Recipe = z.output<typeof RecipeSchema>;
export type WelchRecipe = z.output<typeof WelchRecipeSchema>;
export type MultitaperRecipe = z.output<typeof MultitaperRecipeSchema>;
export type PeriodogramRecipe = z.output<typeof PeriodogramRecipeSchema>;
export type Features = z.output<typeof FeaturesSchema>;
export type SpectrogramRecipe = z.output<typeof SpectrogramRecipeSchema>;
export type MorletRecipe = z.output<typeof MorletRecipeSchema>;
export type ConnectivityRecipe = z.output<typeof ConnectivityRecipeSchema>;
export type SpectrumRecipe = WelchRecipe | MultitaperRecipe | PeriodogramRecipe;
export type TimeFrequencyRecipe = SpectrogramRecipe | MorletRecipe;

export function isSpectrumRecipe(recipe: Recipe): recipe is SpectrumRecipe {
  return recipe.method === 'welch' || recipe.method === 'multitaper' || recipe.method === 'periodogram';
}
export type Epoching = z.output<typeof EpochingSchema>;
export type Band = z.output<typeof BandSchema>;
