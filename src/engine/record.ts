import type { BandPower, BandRatio } from '../features/bands.js';
import type { DerivedSettings } from '../recipes/resolve.js';
import type { Recipe } from '../recipes/schema.js';
import type { FeatureValues } from './spectral-features.js';
import type { EpochingSummary } from './prepare.js';
import type { SignalView } from '../signals/view.js';
import type { SignalDescription } from '../signals/signal.js';

export interface ChannelFeatures {
  name: string;
  /** one-sided PSD in unit²/Hz at `result.frequencies` */
  psd: number[];
  /** χ² confidence bounds of the PSD (with recipe.confidence) */
  psdLower?: number[];
  psdUpper?: number[];
  /** equivalent degrees of freedom per bin (with recipe.confidence) */
  degreesOfFreedom?: number[];
  bands: BandPower[];
  ratios: BandRatio[];
  features?: FeatureValues;
}

export interface ChannelQuality {
  name: string;
  flat: boolean;
  clipped: boolean;
  excessiveAmplitude: boolean;
  peakToPeak: number;
  standardDeviation: number;
  longestClipRun: number;
}

export interface EpochFeatures {
  /** index of the epoch in the input signal */
  index: number;
  channels: ChannelFeatures[];
}

export interface SkippedEpoch {
  index: number;
  reason: 'non-finite' | 'quality' | 'amplitude';
  detail: string;
}

/** The deterministic part of a record; `resultHash` is the SHA-256 of its canonical JSON. */
export interface FeatureResult {
  units: { psd: string; power: string; frequency: 'Hz' };
  frequencies: number[];
  channels: ChannelFeatures[];
  epochs?: EpochFeatures[];
  estimate: {
    method: Recipe['method'];
    segmentsPerEpoch: number;
    epochsUsed: number;
    epochsSkipped: SkippedEpoch[];
    confidence?: number;
    /** Welch segments averaged and left out (bad spans, amplitude), per channel over all epochs */
    segments: { name: string; used: number; leftOut: number }[];
  };
  /** epochs cut by the recipe's epoching: those kept and those dropped with the reason */
  epoching?: EpochingSummary;
  /** events or blocks epoching: mean spectra and features per event or block label */
  groups?: { label: string; epochs: number; channels: ChannelFeatures[] }[];
  /** time-domain flags per used-or-dropped epoch and channel (with features.quality) */
  quality?: { index: number; channels: ChannelQuality[] }[];
  warnings: string[];
}

export interface RecordInput extends SignalDescription {
  signal: string;
  sha256: string;
  /** the part of the stored signal the job named */
  view?: SignalView;
}

export interface Provenance {
  engine: string;
  engineVersion: string;
  computedAt: string;
  durationMs: number;
  host: string;
  mode: 'embedded' | 'distributed' | 'local';
  /** threads that computed at least one time–frequency channel (time–frequency jobs only) */
  threads?: number;
}

/** A binary matrix stored beside the record (GET /v1/jobs/:id/attachments/:name). */
export interface Attachment {
  name: string;
  /** what it holds, e.g. power, trialPower, phaseConsistency, edgeMask */
  kind: string;
  channel: string | null;
  /** row-major; e.g. [times, frequencies] or [trials, times, frequencies] */
  shape: number[];
  dtype: 'float64-le' | 'uint8';
  bytes: number;
  sha256: string;
  /** the data, written to the store by the worker and never serialized into the record */
  data?: Float64Array | Uint8Array;
}

/** The deterministic part of a time–frequency or connectivity record. */
export interface TimeFrequencyResult {
  units: Record<string, string>;
  frequencies: number[];
  channels: { name: string; summary?: { name: string; low: number; high: number; start: number; end: number; value: number | null; cells: number }[] }[];
  timeFrequency?: {
    method: 'morlet' | 'spectrogram';
    times: number[];
    timeOrigin: 'event' | 'epoch-start';
    trials: number;
    baseline: { start: number; end: number; mode: string; rows: [number, number] } | null;
    edgeSigmas?: number;
    powerFactor?: number;
    cycles?: number[];
    phaseConsistencyNull?: { trialCount: number; mean: number; largeSampleMean: number; rootMeanSquare: number; threshold: number; alpha: number };
    attachments: Omit<Attachment, 'data'>[];
  };
  connectivity?: Record<string, unknown>;
  estimate: { method: Recipe['method']; epochsUsed: number; epochsSkipped: SkippedEpoch[] };
  epoching?: EpochingSummary;
  warnings: string[];
}

export interface FeatureRecord<R extends FeatureResult | TimeFrequencyResult = FeatureResult | TimeFrequencyResult> {
  schema: string;
  engineVersion: string;
  recipe: Recipe & { id: string; hash: string; derived: DerivedSettings };
  input: RecordInput;
  result: R;
  resultHash: string;
  /** binary attachments (time–frequency matrices); their hashes are inside `result` */
  attachments?: Attachment[];
  provenance: Provenance;
}
