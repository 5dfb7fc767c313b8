/**
 * What a method module needs to check a recipe against the signal it will run on: the signal's
 * shape, the server's limits, the derived values, and the checks several methods share. Every
 * refusal is a {@link DomainError} with a JSON pointer relative to the recipe.
 */
import { DomainError } from '../common/errors.js';
import type { SignalEvent } from '../signals/signal.js';

export interface SignalShape {
  samplingRate: number;
  samplesPerEpoch: number;
  /** default 1 */
  epochCount?: number;
  channels?: readonly string[];
  /** the signal's events, when the caller knows them; labels are checked only then */
  events?: readonly (Pick<SignalEvent, 'label' | 'onset'> & { duration?: number | null })[];
}

export interface RecipeLimits {
  maxFftLength: number;
  /** float64 values a time–frequency result may hold in its matrices (channels × times × frequencies, × trials when kept) */
  maxOutputValues: number;
  /** estimated peak memory of one job, bytes ({@link CostEstimate}) */
  maxJobBytes: number;
}

/** 2 GiB: a job this size still leaves room on a small (8 GiB) machine running two at once. */
export const DEFAULT_MAX_JOB_BYTES = 2 * 1024 ** 3;

export const DEFAULT_RECIPE_LIMITS: Readonly<RecipeLimits> = Object.freeze({ maxFftLength: 1 << 20, maxOutputValues: 64 * 1024 * 1024, maxJobBytes: DEFAULT_MAX_JOB_BYTES });

/** Values that follow from a recipe and the signal's sampling rate and epoch length. */
export interface DerivedSettings {
  /** round(segmentSeconds · samplingRate) */
  segmentSamples: number;
  /** ⌊overlap · segmentSamples⌋ */
  overlapSamples: number;
  /** recipe.fftLength, or segmentSamples when null */
  fftLength: number;
  /** samplingRate / fftLength, Hz */
  frequencyResolution: number;
  /** ⌊(samplesPerEpoch − overlapSamples) / (segmentSamples − overlapSamples)⌋ */
  segmentsPerEpoch: number;
  /** recipe.frequencyRange, or [0, samplingRate / 2] when null */
  frequencyRange: [number, number];
  nyquist: number;
  /** multitaper: K, recipe.taperCount or ⌊2·NW⌋ − 1 */
  taperCount?: number;
  /** multitaper: W = NW·samplingRate/segmentSamples, Hz */
  halfBandwidth?: number;
  /** time–frequency methods: samples per analysed epoch */
  epochSamples?: number;
}

/** A method's fit to a signal: its derived values and the warnings that go into the record. */
export interface Fit {
  derived: DerivedSettings;
  warnings: string[];
}

/**
 * What a job will cost, estimated from the signal's shape before anything is queued. Orders of
 * magnitude, not promises: `bytes` is the peak memory of the largest arrays the job holds at once
 * (samples, prepared copies, transforms, outputs), `work` the floating-point operations of its
 * transforms and kernels (an FFT of n points counted as 5·n·log2 n).
 */
export interface CostEstimate {
  bytes: number;
  work: number;
  /** JSON pointer of the setting that drives the estimate most, named when the job is refused */
  driver: string;
}

export const unfit = (detail: string, pointer: string) => new DomainError('recipe-unfit', detail, { pointer });
export const invalid = (detail: string, pointer: string) => new DomainError('invalid-recipe', detail, { pointer });
export const overLimit = (detail: string, pointer: string, extensions?: Record<string, unknown>) => new DomainError('limit-exceeded', detail, { pointer, ...(extensions ? { extensions } : {}) });

/** Frequency of bin k in Hz, computed as k·fs/n in this order everywhere (band edges compare against it). */
export function binFrequency(k: number, samplingRate: number, fftLength: number): number {
  return (k * samplingRate) / fftLength;
}

/** Number of bins k·Δf (k = 0..⌊n/2⌋) with low ≤ k·Δf < high. */
export function countBins(low: number, high: number, samplingRate: number, fftLength: number): number {
  const last = Math.floor(fftLength / 2);
  let n = 0;
  for (let k = 0; k <= last; k++) {
    const f = binFrequency(k, samplingRate, fftLength);
    if (f >= low && f < high) n++;
  }
  return n;
}

/** 5·n·log2 n, the customary operation count of one complex FFT of n points (common practice). */
export function fftWork(n: number): number {
  return n > 1 ? 5 * n * Math.log2(n) : 1;
}

/** tukeyRatio only with window "tukey", where it defaults to 0.5 (filled in place, so the hash sees it). */
export function checkTukey(recipe: { window?: string; tukeyRatio?: number | undefined }): void {
  if (recipe.tukeyRatio !== undefined && recipe.window !== 'tukey') {
    throw invalid(`tukeyRatio applies only to window "tukey", not "${recipe.window}"`, '/tukeyRatio');
  }
  if (recipe.window === 'tukey' && recipe.tukeyRatio === undefined) recipe.tukeyRatio = 0.5;
}

/** [low, high] with low < high, for every range the recipe names. */
export function checkRangeOrder(ranges: [string, readonly [number, number] | null | undefined][]): void {
  for (const [pointer, range] of ranges) {
    if (range && range[0] >= range[1]) throw invalid(`${pointer.slice(1)} must be [low, high] with low < high`, `${pointer}/1`);
  }
}

/** Band names are unique within a recipe; returns name → index. */
export function checkBandNames(bands: readonly { name: string }[]): Map<string, number> {
  const names = new Map<string, number>();
  bands.forEach((band, i) => {
    if (names.has(band.name)) throw invalid(`band name "${band.name}" is used twice`, `/bands/${i}/name`);
    names.set(band.name, i);
  });
  return names;
}

type Reference = 'none' | 'average' | { channel: string };

export function checkReference(reference: Reference, shape: SignalShape): void {
  if (typeof reference === 'object' && shape.channels && !shape.channels.includes(reference.channel)) {
    throw unfit(`reference channel "${reference.channel}" is not in the signal (it has ${shape.channels.join(', ')})`, '/reference/channel');
  }
  if (typeof reference === 'object' && shape.channels?.length === 1) {
    throw unfit('re-referencing to a channel needs at least one other channel', '/reference/channel');
  }
}

/** Channels the analysis sees: a channel reference is left out of the output. */
export function analysedChannels(reference: Reference, shape: SignalShape): number {
  const channels = shape.channels?.length ?? 1;
  return typeof reference === 'object' ? Math.max(1, channels - 1) : channels;
}
/**
 * Samples the engine holds while it reads one channel row at a time from the store
 * (src/engine/prepare.ts; the signal itself is never loaded whole): the reference's row (mean or reference channel) when there is a
 * reference, one continuous row being screened or cut, and the prepared rows (`channelSamples`,
 * every epoch of one channel) of the channel being computed and of two more waiting for a helper
 * thread.
 */
export function streamedRows(recipe: { reference: Reference }, shape: SignalShape, channelSamples: number): number {
  const row = (shape.epochCount ?? 1) * shape.samplesPerEpoch;
  return (recipe.reference === 'none' ? 0 : row) + row + 3 * channelSamples;
}

interface EpochingSettings {
  epoching:
    | { mode: 'fixed'; epochSeconds: number; stepSeconds: number | null }
    | { mode: 'events'; labels: string[] | null; beforeSeconds: number; afterSeconds: number; baseline: [number, number] | null }
    | { mode: 'blocks'; labels: string[]; epochSeconds: number; stepSeconds: number | null }
    | null;
  badSpans: { labels: string[]; peakToPeak: number | null };
}

/** Samples per analysed epoch: the uploaded epochs, or those the recipe's epoching cuts. */
export function epochLength(recipe: EpochingSettings, shape: SignalShape): number {
  const e = recipe.epoching;
  if (!e) return shape.samplesPerEpoch;
  if ((shape.epochCount ?? 1) !== 1) {
    throw unfit(`epoching cuts a continuous signal; this one already has ${shape.epochCount} epochs`, '/epoching');
  }
  const fs = shape.samplingRate;
  const samples = e.mode === 'events' ? Math.round(e.beforeSeconds * fs) + Math.round(e.afterSeconds * fs) : Math.round(e.epochSeconds * fs);
  if (samples < 2) throw unfit(`epochs of ${samples} sample(s) at ${fs} Hz are too short`, e.mode === 'events' ? '/epoching/afterSeconds' : '/epoching/epochSeconds');
  if (samples > shape.samplesPerEpoch) {
    throw unfit(`epochs of ${samples} samples are longer than the signal (${shape.samplesPerEpoch} samples)`, '/epoching');
  }
  if (e.mode === 'events' && e.baseline && !(e.baseline[0] < e.baseline[1] && e.baseline[0] >= -e.beforeSeconds && e.baseline[1] <= e.afterSeconds)) {
    throw unfit(`baseline [${e.baseline[0]}, ${e.baseline[1]}) s must lie inside the epoch [${-e.beforeSeconds}, ${e.afterSeconds}) s`, '/epoching/baseline');
  }
  return samples;
}

/**
 * Epochs the analysis will see at most: the uploaded ones, or those the epoching cuts (fixed: every
 * step that fits; events: the matching events, when the signal's events are known).
 */
export function epochCountOf(recipe: EpochingSettings, shape: SignalShape, epochSamples: number): number {
  const e = recipe.epoching;
  if (!e) return shape.epochCount ?? 1;
  if (e.mode === 'fixed') {
    const step = Math.max(1, Math.round((e.stepSeconds ?? e.epochSeconds) * shape.samplingRate));
    return Math.floor((shape.samplesPerEpoch - epochSamples) / step) + 1;
  }
  if (!shape.events) return Math.max(1, Math.floor(shape.samplesPerEpoch / epochSamples));
  if (e.mode === 'blocks') {
    const fs = shape.samplingRate;
    const step = Math.max(1, Math.round((e.stepSeconds ?? e.epochSeconds) * fs));
    const wanted = new Set(e.labels);
    return shape.events
      .filter((ev) => wanted.has(ev.label) && (ev.duration ?? 0) > 0)
      .reduce((n, ev) => n + Math.max(0, Math.floor((Math.round((ev.onset + ev.duration!) * fs) - Math.round(ev.onset * fs) - epochSamples) / step) + 1), 0);
  }
  const wanted = e.labels ? new Set(e.labels) : null;
  const bad = new Set(recipe.badSpans.labels);
  return shape.events.filter((ev) => !bad.has(ev.label) && (wanted === null || wanted.has(ev.label))).length;
}

/**
 * Event labels the recipe names (events epoching, bad spans) must be labels the signal has: a
 * misspelt label would otherwise cut nothing or leave an artifact in. Checked only when the
 * caller knows the signal's events.
 */
export function checkLabels(recipe: EpochingSettings, shape: SignalShape): void {
  if (!shape.events) return;
  const known = new Set(shape.events.map((ev) => ev.label));
  const has =
    known.size === 0
      ? 'the signal has no events'
      : `the signal has ${[...known]
          .sort()
          .map((l) => `"${l}"`)
          .join(', ')}`;
  const e = recipe.epoching;
  if (e?.mode === 'events') {
    if (known.size === 0) throw unfit(`events epoching needs events; ${has}`, '/epoching');
    e.labels?.forEach((label, i) => {
      if (!known.has(label)) throw unfit(`epoching label "${label}" is not an event label of the signal; ${has}`, `/epoching/labels/${i}`);
    });
  }
  if (e?.mode === 'blocks') {
    const blocks = new Set(shape.events.filter((ev) => (ev.duration ?? 0) > 0).map((ev) => ev.label));
    e.labels.forEach((label, i) => {
      if (!known.has(label)) throw unfit(`block label "${label}" is not an event label of the signal; ${has}`, `/epoching/labels/${i}`);
      if (!blocks.has(label)) throw unfit(`events labelled "${label}" have no duration, so they hold no block to cut epochs in`, `/epoching/labels/${i}`);
    });
  }
  recipe.badSpans.labels.forEach((label, i) => {
    if (!known.has(label)) throw unfit(`bad-span label "${label}" is not an event label of the signal; ${has}`, `/badSpans/labels/${i}`);
  });
}

/** recipe.frequencyRange or [0, Nyquist], refused when it ends above Nyquist. */
export function frequencyRangeOf(range: readonly [number, number] | null, samplingRate: number, what = ''): [number, number] {
  const nyquist = samplingRate / 2;
  const resolved: [number, number] = range ? [range[0], range[1]] : [0, nyquist];
  if (resolved[1] > nyquist) throw unfit(`frequencyRange ends at ${resolved[1]} Hz, above the Nyquist frequency ${nyquist} Hz${what}`, '/frequencyRange/1');
  return resolved;
}

export function checkFftLimit(fftLength: number, limits: RecipeLimits): void {
  if (fftLength > limits.maxFftLength) throw overLimit(`fftLength ${fftLength} is above this server's limit of ${limits.maxFftLength}`, '/fftLength');
}

/** Bytes of `values` float64 numbers. */
export const float64Bytes = (values: number) => 8 * values;
