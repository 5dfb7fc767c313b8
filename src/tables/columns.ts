/**
 * The columns of feature tables. One list per level drives the CSV header, the Parquet schema, the
 * README and the OpenAPI description, so the four cannot drift apart.
 */

/** How a column's cells are typed: in Parquet as DOUBLE, INT64, UTF8 strings and BOOLEAN. */
export type ColumnType = 'string' | 'integer' | 'double' | 'boolean';

export interface Column {
  name: string;
  type: ColumnType;
  /** physical unit of the values; `signal unit` is the record's `input.unit` (µV for most EEG) */
  unit: string | null;
  meaning: string;
}

/** One cell; `null` is an empty CSV cell and a Parquet null. */
export type Cell = string | number | boolean | null;

/** One row, positionally aligned with its table's columns. */
export type Row = Cell[];

/**
 * Levels of a feature table: the grain of one row.
 * - spectrum records (welch, multitaper, periodogram): `bands`, `ratios`, `features`, `spectra`,
 *   and `quality` when the recipe names the quality feature;
 * - morlet and spectrogram records with `summary` windows: `summary`;
 * - connectivity records: `pair-bands`, `pair-spectra`.
 */
export const TABLE_LEVELS = ['bands', 'ratios', 'features', 'spectra', 'quality', 'summary', 'pair-bands', 'pair-spectra'] as const;
export type TableLevel = (typeof TABLE_LEVELS)[number];

const c = (name: string, type: ColumnType, unit: string | null, meaning: string): Column => ({ name, type, unit, meaning });

/** Where the row sits: first the entry (run-level tables) and its metadata, then the epoch. */
export const ENTRY_COLUMN = c('entry', 'string', null, 'the study entry the row comes from (run-level tables only)');
export const SIGNAL_COLUMN = c('signal', 'string', null, 'id of the stored signal the record was computed from');
export const LOCATION_COLUMNS: readonly Column[] = [
  c('scope', 'string', null, '"mean" over every used epoch, "label-mean" over the epochs of one event or block label, or "epoch" for one epoch'),
  c('epoch', 'integer', null, 'index of the analysed epoch (as in the record); empty for means'),
  c('epochStart', 'double', 's', 'start of the epoch, in seconds from the start of the stored signal; empty for means and for uploaded epochs, which have no time line'),
  c('label', 'string', null, 'event or block label of the epoch (events or blocks epoching), or of a label mean; empty otherwise'),
];
export const CHANNEL_COLUMN = c('channel', 'string', null, 'channel name');
export const PAIR_COLUMNS: readonly Column[] = [c('channelA', 'string', null, 'first channel of the pair'), c('channelB', 'string', null, 'second channel of the pair')];
/** Provenance closes every row. */
export const PROVENANCE_COLUMNS: readonly Column[] = [
  c('recipe', 'string', null, 'id of the pinned recipe'),
  c('resultHash', 'string', null, "SHA-256 of the record's canonical result: rows with equal hashes come from identical results"),
];

const BAND_COLUMNS: readonly Column[] = [
  c('band', 'string', null, 'band name from the recipe'),
  c('low', 'double', 'Hz', 'lower band edge, included'),
  c('high', 'double', 'Hz', 'upper band edge, excluded'),
];

/** Value columns of each level that do not depend on the recipe. */
export const LEVEL_COLUMNS: Record<Exclude<TableLevel, 'features'>, readonly Column[]> = {
  bands: [
    ...BAND_COLUMNS,
    c('absolute', 'double', 'signal unit²', 'Σ PSD·Δf over the bins low ≤ f < high'),
    c('relative', 'double', '1', "absolute over the same sum across the recipe's frequencyRange; empty when that total is 0"),
    c('decibels', 'double', 'dB re 1 signal unit²', '10·log10(absolute); empty when absolute is 0'),
    c('bins', 'integer', null, 'frequency bins summed'),
  ],
  ratios: [
    c('ratio', 'string', null, 'ratio name (default "numerator/denominator")'),
    c('numerator', 'string', null, 'band over the line'),
    c('denominator', 'string', null, 'band under the line'),
    c('value', 'double', '1', 'absolute power of the numerator band over that of the denominator band; empty when the denominator is 0'),
  ],
  spectra: [c('frequency', 'double', 'Hz', 'bin frequency'), c('psd', 'double', 'signal unit²/Hz', 'one-sided power spectral density')],
  quality: [
    c('used', 'boolean', null, 'whether the epoch entered the averages'),
    c('flat', 'boolean', null, 'standard deviation at or below flatThreshold'),
    c('clipped', 'boolean', null, "a run of clipRunSamples samples at the epoch's minimum or maximum"),
    c('excessiveAmplitude', 'boolean', null, 'peak-to-peak above maxPeakToPeak'),
    c('peakToPeak', 'double', 'signal unit', 'max − min of the epoch'),
    c('standardDeviation', 'double', 'signal unit', 'standard deviation of the epoch'),
    c('longestClipRun', 'integer', null, "longest run of samples at the epoch's minimum or maximum"),
  ],
  summary: [
    c('window', 'string', null, 'name of the band-and-window summary from the recipe'),
    c('low', 'double', 'Hz', 'lower frequency, included'),
    c('high', 'double', 'Hz', 'upper frequency, excluded'),
    c('start', 'double', 's', 'window start, included (relative to the event or the epoch start)'),
    c('end', 'double', 's', 'window end, excluded'),
    c(
      'value',
      'double',
      'signal unit² (morlet), signal unit²/Hz (spectrogram), or the baseline mode',
      'mean of the trial-averaged (normalized) power over the cells, edge cells left out; empty when no cell is left',
    ),
    c('cells', 'integer', null, 'time–frequency cells averaged'),
  ],
  'pair-bands': [
    ...BAND_COLUMNS,
    c('bins', 'integer', null, 'frequency bins in the band'),
    c('coherence', 'double', '1', 'magnitude-squared coherence over the band'),
    c('imaginaryCoherency', 'double', '1', 'imaginary part of coherency over the band'),
    c('phaseLocking', 'double', '1', 'phase-locking value across epochs over the band; empty with fewer than 2 epochs'),
  ],
  'pair-spectra': [
    c('frequency', 'double', 'Hz', 'bin frequency'),
    c('coherence', 'double', '1', 'magnitude-squared coherence'),
    c('imaginaryCoherency', 'double', '1', 'imaginary part of coherency'),
    c('phaseLocking', 'double', '1', 'phase-locking value across epochs; empty with fewer than 2 epochs'),
  ],
};

/** Spectra columns present when the recipe asks for `confidence`. */
export const CONFIDENCE_COLUMNS: readonly Column[] = [
  c('psdLower', 'double', 'signal unit²/Hz', 'lower χ² confidence bound of the PSD'),
  c('psdUpper', 'double', 'signal unit²/Hz', 'upper χ² confidence bound of the PSD'),
  c('degreesOfFreedom', 'double', null, 'equivalent degrees of freedom behind the bounds'),
];

/** Feature columns, each present when the recipe names the feature; `<…>` stands for a recipe value. */
export const FEATURE_COLUMNS: Record<string, readonly Column[]> = {
  peakFrequency: [
    c('peakFrequency', 'double', 'Hz', 'frequency of the highest peak above the power-law background; empty when none stands out'),
    c('peakPower', 'double', 'signal unit²/Hz', 'PSD at the peak'),
    c('peakHeight', 'double', 'dB', 'height of the peak above the background'),
  ],
  centroid: [c('centroid', 'double', 'Hz', 'power-weighted mean frequency Σf·P/ΣP')],
  spectralEdge: [c('spectralEdge<percentile>', 'double', 'Hz', 'frequency below which <percentile> % of the power in the range lies (a "." in the percentile is written "_")')],
  entropy: [c('entropy', 'double', '1', 'normalized spectral entropy, 0…1')],
  powerLaw: [
    c('powerLawIntercept', 'double', 'log10 signal unit²/Hz', 'log10 of the fitted PSD at 1 Hz'),
    c('powerLawSlope', 'double', '1', 'd log10 PSD / d log10 f (−1 for 1/f)'),
    c('powerLawRSquared', 'double', '1', 'coefficient of determination of the fit'),
    c('powerLawResidualRms', 'double', 'decades', 'RMS of the log10 residuals'),
    c('powerLawInlierFraction', 'double', '1', 'fraction of bins the robust fit kept'),
  ],
  lineNoise: [
    c('lineNoiseRatio', 'double', '1', 'mean PSD in the line band over the mean PSD beside it (1 = none), at the mains frequency'),
    c('lineNoiseMaxRatio', 'double', '1', 'the largest ratio over the mains frequency and its harmonics'),
    c('lineNoise<frequency>Hz', 'double', '1', 'the ratio at each harmonic'),
  ],
  quality: [
    c('flat', 'boolean', null, 'quality flag of the epoch and channel (epoch rows only)'),
    c('clipped', 'boolean', null, 'quality flag of the epoch and channel (epoch rows only)'),
    c('excessiveAmplitude', 'boolean', null, 'quality flag of the epoch and channel (epoch rows only)'),
  ],
};

/** Column names that entry metadata keys may not take, since every table has these columns. */
export const RESERVED_COLUMN_NAMES: ReadonlySet<string> = new Set([
  ENTRY_COLUMN.name,
  SIGNAL_COLUMN.name,
  ...LOCATION_COLUMNS.map((col) => col.name),
  CHANNEL_COLUMN.name,
  ...PAIR_COLUMNS.map((col) => col.name),
  ...PROVENANCE_COLUMNS.map((col) => col.name),
  ...Object.values(LEVEL_COLUMNS).flatMap((cols) => cols.map((col) => col.name)),
  ...CONFIDENCE_COLUMNS.map((col) => col.name),
  ...Object.values(FEATURE_COLUMNS).flatMap((cols) => cols.map((col) => col.name)),
]);

/** Which records give which level. */
export const LEVELS_BY_KIND = {
  spectrum: ['bands', 'ratios', 'features', 'spectra'],
  timeFrequency: ['summary'],
  connectivity: ['pair-bands', 'pair-spectra'],
} as const;
