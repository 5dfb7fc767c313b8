import type { BandPower, BandRatio } from '../features/bands.js';
import type { DerivedSettings } from '../recipes/resolve.js';
import type { Recipe } from '../recipes/schema.js';
import type { FeatureValues } from './spectral-features.js';
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
  reason: 'non-finite' | 'quality';
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
  };
  /** time-domain flags per used-or-dropped epoch and channel (with features.quality) */
  quality?: { index: number; channels: ChannelQuality[] }[];
  warnings: string[];
}

export interface RecordInput extends SignalDescription {
  signal: string;
  sha256: string;
}

export interface Provenance {
  engine: string;
  engineVersion: string;
  computedAt: string;
  durationMs: number;
  host: string;
  mode: 'embedded' | 'distributed' | 'local';
}

export interface FeatureRecord {
  schema: string;
  engineVersion: string;
  recipe: Recipe & { id: string; hash: string; derived: DerivedSettings };
  input: RecordInput;
  result: FeatureResult;
  resultHash: string;
  provenance: Provenance;
}
