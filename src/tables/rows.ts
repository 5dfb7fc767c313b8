import { DomainError } from '../common/errors.js';
import type { ChannelFeatures, ChannelQuality, FeatureRecord, FeatureResult, TimeFrequencyResult } from '../engine/record.js';
import {
  CHANNEL_COLUMN,
  CONFIDENCE_COLUMNS,
  ENTRY_COLUMN,
  FEATURE_COLUMNS,
  LEVEL_COLUMNS,
  LEVELS_BY_KIND,
  LOCATION_COLUMNS,
  PAIR_COLUMNS,
  PROVENANCE_COLUMNS,
  SIGNAL_COLUMN,
  type Cell,
  type Column,
  type Row,
  type TableLevel,
} from './columns.js';

/** Entry metadata as studies hold it: string or number values under validated keys. */
export type EntryMetadata = Record<string, string | number>;

/** What a row knows beyond the record: the study entry it belongs to. */
export interface TableContext {
  entryId?: string;
  metadata?: EntryMetadata;
}

export interface TableLayoutOptions {
  /**
   * Metadata columns in order, with their types (see {@link metadataColumns}). Rows whose entry
   * lacks a key get an empty cell there; keys not listed are not written.
   * @defaultValue none
   */
  metadata?: readonly { name: string; type: 'string' | 'double' }[];
  /** Whether rows carry the `entry` column (run-level tables). @defaultValue false */
  entry?: boolean;
}

type Getter = (ch: ChannelFeatures, quality: ChannelQuality | undefined) => Cell;

/** The columns of one table, fixed before the first row so that writers can stream. */
export interface TableLayout {
  readonly level: TableLevel;
  readonly columns: readonly Column[];
  readonly metadataKeys: readonly string[];
  readonly entry: boolean;
  /** features level: one getter per feature column */
  readonly features: readonly Getter[];
  readonly confidence: boolean;
}

type RecordKind = keyof typeof LEVELS_BY_KIND;

function kindOf(record: FeatureRecord): RecordKind {
  const method = record.recipe.method;
  if (method === 'connectivity') return 'connectivity';
  if (method === 'morlet' || method === 'spectrogram') return 'timeFrequency';
  return 'spectrum';
}

/** The levels this record can give, in {@link TABLE_LEVELS} order. */
export function tableLevels(record: FeatureRecord): TableLevel[] {
  const kind = kindOf(record);
  if (kind === 'timeFrequency') {
    return (record.result as TimeFrequencyResult).channels.some((ch) => ch.summary && ch.summary.length > 0) ? ['summary'] : [];
  }
  if (kind === 'connectivity') return [...LEVELS_BY_KIND.connectivity];
  const result = record.result as FeatureResult;
  const levels: TableLevel[] = ['bands'];
  if (result.channels.some((ch) => ch.ratios.length > 0)) levels.push('ratios');
  if (featureGetters(record).length > 0) levels.push('features');
  levels.push('spectra');
  if (result.quality) levels.push('quality');
  return levels;
}

/** Metadata columns for a set of entries: keys in first-seen order; a key numeric in every entry is a double, else a string. */
export function metadataColumns(entries: Iterable<EntryMetadata>): { name: string; type: 'string' | 'double' }[] {
  const types = new Map<string, 'string' | 'double'>();
  for (const metadata of entries) {
    for (const [key, value] of Object.entries(metadata)) {
      const type = typeof value === 'number' ? 'double' : 'string';
      types.set(key, types.get(key) === 'string' ? 'string' : type);
    }
  }
  return [...types].map(([name, type]) => ({ name, type }));
}

const percentileName = (p: number) => `spectralEdge${String(p).replace('.', '_')}`;

function featureGetters(record: FeatureRecord): { column: Column; get: Getter }[] {
  const recipe = record.recipe;
  if (!('features' in recipe)) return [];
  const named = recipe.features;
  const cols = FEATURE_COLUMNS;
  const out: { column: Column; get: Getter }[] = [];
  const add = (column: Column, get: Getter, name = column.name) => out.push({ column: { ...column, name }, get });
  if (named.peakFrequency) {
    const [f, p, h] = cols.peakFrequency!;
    add(f!, (ch) => ch.features?.peakFrequency?.frequency ?? null);
    add(p!, (ch) => ch.features?.peakFrequency?.power ?? null);
    add(h!, (ch) => ch.features?.peakFrequency?.heightDb ?? null);
  }
  if (named.centroid) add(cols.centroid![0]!, (ch) => ch.features?.centroid?.frequency ?? null);
  if (named.spectralEdge) {
    for (const percentile of named.spectralEdge.percentiles) {
      add(
        { ...cols.spectralEdge![0]!, meaning: `frequency below which ${percentile} % of the power in the range lies` },
        (ch) => ch.features?.spectralEdge?.edges.find((e) => e.percentile === percentile)?.frequency ?? null,
        percentileName(percentile),
      );
    }
  }
  if (named.entropy) add(cols.entropy![0]!, (ch) => ch.features?.entropy?.value ?? null);
  if (named.powerLaw) {
    const [intercept, slope, r2, rms, inliers] = cols.powerLaw!;
    add(intercept!, (ch) => ch.features?.powerLaw?.intercept ?? null);
    add(slope!, (ch) => ch.features?.powerLaw?.slope ?? null);
    add(r2!, (ch) => ch.features?.powerLaw?.rSquared ?? null);
    add(rms!, (ch) => ch.features?.powerLaw?.residualRms ?? null);
    add(inliers!, (ch) => ch.features?.powerLaw?.inlierFraction ?? null);
  }
  if (named.lineNoise) {
    const [ratio, max, harmonic] = cols.lineNoise!;
    add(ratio!, (ch) => ch.features?.lineNoise?.ratio ?? null);
    add(max!, (ch) => ch.features?.lineNoise?.maxRatio ?? null);
    for (let h = 1; h <= named.lineNoise.harmonics; h++) {
      const frequency = named.lineNoise.frequency * h;
      add({ ...harmonic!, meaning: `the ratio at ${frequency} Hz` }, (ch) => ch.features?.lineNoise?.harmonics.find((x) => x.frequency === frequency)?.ratio ?? null, `lineNoise${frequency}Hz`);
    }
  }
  if (named.quality) {
    const [flat, clipped, excessive] = cols.quality!;
    add(flat!, (_, q) => q?.flat ?? null);
    add(clipped!, (_, q) => q?.clipped ?? null);
    add(excessive!, (_, q) => q?.excessiveAmplitude ?? null);
  }
  return out;
}

/**
 * The columns of a table at `level` for records like this one (same recipe). A run-level table
 * builds one layout from its first record and the metadata keys of every entry.
 *
 * @throws DomainError `table-level-unavailable` when the record cannot give the level, with the
 *   levels it can give; `invalid-request` when a metadata key clashes with a table column.
 */
export function createTableLayout(record: FeatureRecord, level: TableLevel, options: TableLayoutOptions = {}): TableLayout {
  const available = tableLevels(record);
  if (!available.includes(level)) {
    throw new DomainError('table-level-unavailable', `a ${record.recipe.method} record cannot give the "${level}" level; it gives ${available.map((l) => `"${l}"`).join(', ') || 'no table'}`, {
      pointer: '/query/level',
      extensions: { levels: available },
    });
  }
  const metadata = options.metadata ?? [];
  const features = level === 'features' ? featureGetters(record) : [];
  const confidence = level === 'spectra' && 'confidence' in record.recipe && record.recipe.confidence !== null;
  const values = level === 'features' ? features.map((f) => f.column) : [...LEVEL_COLUMNS[level], ...(confidence ? CONFIDENCE_COLUMNS : [])];
  const columns: Column[] = [
    ...(options.entry ? [ENTRY_COLUMN] : []),
    ...metadata.map((m): Column => ({ name: m.name, type: m.type, unit: null, meaning: 'entry metadata' })),
    SIGNAL_COLUMN,
    ...LOCATION_COLUMNS,
    ...(level === 'pair-bands' || level === 'pair-spectra' ? PAIR_COLUMNS : [CHANNEL_COLUMN]),
    ...values,
    ...PROVENANCE_COLUMNS,
  ];
  const seen = new Set<string>();
  columns.forEach((col, i) => {
    if (seen.has(col.name)) {
      const m = metadata.findIndex((x) => x.name === col.name);
      throw new DomainError('invalid-request', `metadata key "${col.name}" clashes with a column of the ${level} table`, { pointer: m >= 0 ? `/metadata/${m}` : `/columns/${i}` });
    }
    seen.add(col.name);
  });
  return { level, columns, metadataKeys: metadata.map((m) => m.name), entry: options.entry ?? false, features: features.map((f) => f.get), confidence };
}

/** Where each analysed epoch starts, in seconds from the start of the stored signal, and its label. */
function epochPlaces(record: FeatureRecord): (index: number) => { start: number | null; label: string | null } {
  const offset = record.input.view?.start ?? 0;
  const kept = record.result.epoching?.kept;
  if (kept) {
    const byIndex = new Map(kept.map((k) => [k.index, k]));
    return (index) => {
      const k = byIndex.get(index);
      return { start: k ? offset + k.startSeconds : null, label: k && k.label !== '' ? k.label : null };
    };
  }
  // A continuous signal analysed whole is one epoch at the view's start; uploaded epochs have no time line.
  return record.input.epochCount === 1 ? () => ({ start: offset, label: null }) : () => ({ start: null, label: null });
}

interface Spectrum {
  scope: 'mean' | 'label-mean' | 'epoch';
  epoch: number | null;
  label: string | null;
  channels: ChannelFeatures[];
}

/** The mean, then each label mean, then each epoch (when the recipe asked for perEpoch). */
function* spectraOf(record: FeatureRecord): Generator<Spectrum> {
  const result = record.result as FeatureResult;
  yield { scope: 'mean', epoch: null, label: null, channels: result.channels };
  for (const g of result.groups ?? []) yield { scope: 'label-mean', epoch: null, label: g.label, channels: g.channels };
  for (const e of result.epochs ?? []) yield { scope: 'epoch', epoch: e.index, label: null, channels: e.channels };
}

interface PairResult {
  channels: [string, string];
  coherence: (number | null)[];
  imaginaryCoherency: (number | null)[];
  phaseLocking?: (number | null)[];
  bands: { name: string; low: number; high: number; bins: number; coherence: number | null; imaginaryCoherency: number | null; phaseLocking: number | null }[];
}

/**
 * The rows of one record at the layout's level, in a fixed order: for spectrum records the mean
 * over epochs, the label means, then each epoch; channels in record order; then bands, ratios or
 * frequencies in record order. Values are the record's numbers, untouched.
 *
 * @param layout - From {@link createTableLayout}, for this record or one with the same recipe.
 * @param record - A succeeded job's record.
 * @param context - The study entry the record belongs to (run-level tables).
 */
export function* tableRows(layout: TableLayout, record: FeatureRecord, context: TableContext = {}): Generator<Row> {
  const head: Cell[] = [];
  if (layout.entry) head.push(context.entryId ?? null);
  for (const key of layout.metadataKeys) head.push(context.metadata?.[key] ?? null);
  head.push(record.input.signal);
  const tail: Cell[] = [record.recipe.id, record.resultHash];
  const place = epochPlaces(record);
  const where = (s: { scope: string; epoch: number | null; label: string | null }): Cell[] => {
    if (s.epoch === null) return [s.scope, null, null, s.label];
    const p = place(s.epoch);
    return [s.scope, s.epoch, p.start, p.label];
  };
  const level = layout.level;

  if (level === 'summary') {
    for (const ch of (record.result as TimeFrequencyResult).channels) {
      for (const w of ch.summary ?? []) yield [...head, 'mean', null, null, null, ch.name, w.name, w.low, w.high, w.start, w.end, w.value, w.cells, ...tail];
    }
    return;
  }
  if (level === 'pair-bands' || level === 'pair-spectra') {
    const pairs = ((record.result as TimeFrequencyResult).connectivity?.pairs ?? []) as PairResult[];
    const frequencies = record.result.frequencies;
    for (const pair of pairs) {
      const lead = [...head, 'mean', null, null, null, pair.channels[0], pair.channels[1]];
      if (level === 'pair-bands') {
        for (const b of pair.bands) yield [...lead, b.name, b.low, b.high, b.bins, b.coherence, b.imaginaryCoherency, b.phaseLocking, ...tail];
      } else {
        for (let k = 0; k < frequencies.length; k++) {
          yield [...lead, frequencies[k]!, pair.coherence[k] ?? null, pair.imaginaryCoherency[k] ?? null, pair.phaseLocking?.[k] ?? null, ...tail];
        }
      }
    }
    return;
  }
  const result = record.result as FeatureResult;
  if (level === 'quality') {
    const skipped = new Set(result.estimate.epochsSkipped.map((s) => s.index));
    for (const q of result.quality ?? []) {
      const lead = [...head, ...where({ scope: 'epoch', epoch: q.index, label: null })];
      for (const ch of q.channels) yield [...lead, ch.name, !skipped.has(q.index), ch.flat, ch.clipped, ch.excessiveAmplitude, ch.peakToPeak, ch.standardDeviation, ch.longestClipRun, ...tail];
    }
    return;
  }
  const quality = new Map((result.quality ?? []).map((q) => [q.index, new Map(q.channels.map((ch) => [ch.name, ch]))]));
  const frequencies = result.frequencies;
  for (const s of spectraOf(record)) {
    const lead = [...head, ...where(s)];
    const epochQuality = s.epoch === null ? undefined : quality.get(s.epoch);
    for (const ch of s.channels) {
      if (level === 'bands') {
        for (const b of ch.bands) yield [...lead, ch.name, b.name, b.low, b.high, b.absolute, b.relative, b.decibels, b.bins, ...tail];
      } else if (level === 'ratios') {
        for (const r of ch.ratios) yield [...lead, ch.name, r.name, r.numerator, r.denominator, r.value, ...tail];
      } else if (level === 'features') {
        const q = epochQuality?.get(ch.name);
        yield [...lead, ch.name, ...layout.features.map((get) => get(ch, q)), ...tail];
      } else {
        const { psd, psdLower, psdUpper, degreesOfFreedom } = ch;
        for (let k = 0; k < frequencies.length; k++) {
          yield layout.confidence
            ? [...lead, ch.name, frequencies[k]!, psd[k]!, psdLower?.[k] ?? null, psdUpper?.[k] ?? null, degreesOfFreedom?.[k] ?? null, ...tail]
            : [...lead, ch.name, frequencies[k]!, psd[k]!, ...tail];
        }
      }
    }
  }
}
