/**
 * Recipe settings that several methods share: bands, ratios, features, epoching, bad spans, the
 * time–frequency output. Each method module (src/methods/<name>.ts) composes its own strict schema
 * from these and its own settings; the registry joins them into the recipe union.
 */
import { z } from 'zod';
import { DETREND_KINDS } from '../dsp/detrend.js';
import { BASELINE_MODES } from '../dsp/baseline.js';
import type { WINDOW_NAMES } from '../dsp/windows.js';
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

export const Range = z.tuple([z.number().min(0), z.number().positive()]);
const OptionalRange = Range.nullable().default(null).describe("[low, high] Hz, both included; null means the recipe's frequencyRange");

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
        frequency: z
          .union([z.literal(50), z.literal(60)])
          .default(50)
          .describe('mains frequency, Hz'),
        harmonics: z.number().int().min(1).max(10).default(3),
        halfWidth: z.number().positive().default(1).describe('half-width of each line band, Hz'),
        neighborhoodWidth: z.number().positive().default(4).describe('width of the comparison band on each side, Hz'),
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
      epochSeconds: z.number().positive().max(3600).describe('epoch length'),
      stepSeconds: z.number().positive().max(3600).nullable().default(null).describe('time between epoch starts; null = epochSeconds (no overlap)'),
    }),
    z.strictObject({
      mode: z.literal('events'),
      labels: z.array(z.string().min(1)).min(1).max(256).nullable().default(null).describe('event labels to cut around; null = every event of the signal'),
      beforeSeconds: z.number().min(0).max(3600).default(0).describe('data kept before each event'),
      afterSeconds: z.number().positive().max(3600).describe('data kept after each event'),
      baseline: z.tuple([z.number(), z.number()]).nullable().default(null).describe('[start, end) s relative to the event; its mean is subtracted per channel'),
    }),
    z.strictObject({
      mode: z.literal('blocks'),
      labels: z.array(z.string().min(1)).min(1).max(256).describe('labels of the blocks to tile: events with a duration, e.g. "eyes-closed"'),
      epochSeconds: z.number().positive().max(3600).describe('epoch length'),
      stepSeconds: z.number().positive().max(3600).nullable().default(null).describe('time between epoch starts within a block; null = epochSeconds (no overlap)'),
    }),
  ])
  .meta({
    id: 'Epoching',
    description:
      'Cut a continuous signal into epochs: fixed-length, around its events, or fixed-length inside labelled blocks (events with a duration), each epoch carrying its block label. Events come from EDF+ annotations or an upload.',
  });

/** Settings every spectrum method shares, in the order the recipe documents them. */
export const commonSettings = {
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
  confidence: z.number().gt(0).lt(1).nullable().default(null).describe('confidence level of per-bin χ² intervals (psdLower/psdUpper), e.g. 0.95; null: none'),
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
    .enum(['reject', 'skip-epoch', 'bad-span'])
    .default('reject')
    .describe(
      'NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)',
    ),
};

// NW 2 on the 1-s default window or segment gives W = NW/T = ±2 Hz of smoothing: a 6-Hz theta peak
// stays within 4–8 Hz and a 10-Hz alpha peak within 8–12 Hz, so the two rhythms do not blend.
export const TapersSchema = z.strictObject({
  timeBandwidth: z.number().min(0.5).max(50).default(2).describe('NW; the half-bandwidth is NW/T Hz for a window of T s (2 on 1 s: ±2 Hz)'),
  taperCount: z.number().int().min(1).max(200).nullable().default(null).describe('null means ⌊2·NW⌋ − 1'),
});

/** The dsp options of a method that tapers with DPSS `tapers` when named, else with its `window` (spectrogram, connectivity). */
export function taperOptions(recipe: { window: (typeof WINDOW_NAMES)[number]; tukeyRatio?: number | undefined; tapers: z.output<typeof TapersSchema> | null }) {
  if (recipe.tapers) return { tapers: { timeBandwidth: recipe.tapers.timeBandwidth, ...(recipe.tapers.taperCount !== null ? { taperCount: recipe.tapers.taperCount } : {}) } };
  return { window: recipe.window, ...(recipe.tukeyRatio !== undefined ? { tukeyRatio: recipe.tukeyRatio } : {}) };
}

/** Settings shared by the time–frequency and connectivity methods. */
export const timeFrequencyCommon = {
  schema: commonSettings.schema,
  reference: commonSettings.reference,
  epoching: commonSettings.epoching,
  badSpans: commonSettings.badSpans,
  nonFinite: commonSettings.nonFinite,
  frequencyRange: commonSettings.frequencyRange,
};

export const BaselineSchema = z
  .strictObject({
    start: z.number().describe('s, relative to the event (events epoching) or to the epoch start'),
    end: z.number().describe('s, both ends included'),
    mode: z.enum(BASELINE_MODES).default('decibel').describe('decibel 10·log10(P/B), percent 100·(P−B)/B, ratio P/B, zscore (P − mean_B)/sd_B'),
  })
  .meta({ id: 'Baseline', description: 'Normalization of time–frequency power by its mean over a baseline window, per frequency, over trials.' });

export const SummarySchema = z
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

export const timeFrequencyOutput = {
  baseline: BaselineSchema.nullable().default(null),
  output: z.enum(['matrix', 'summary']).default('matrix').describe('matrix: full time × frequency matrices as binary attachments; summary: only the band-and-window averages'),
  summary: SummarySchema,
  perEpoch: z.boolean().default(false).describe("also keep every epoch's matrix (attachments grow with the number of epochs)"),
};

export type Features = z.output<typeof FeaturesSchema>;
export type Epoching = z.output<typeof EpochingSchema>;
export type Band = z.output<typeof BandSchema>;
