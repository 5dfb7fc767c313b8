import type { BandPower, BandRatio } from '../features/bands.js';
import type { DerivedSettings } from '../recipes/resolve.js';
import type { Recipe } from '../recipes/schema.js';
import type { SignalDescription } from '../signals/signal.js';

export interface ChannelFeatures {
  name: string;
  /** one-sided PSD in unit²/Hz at `result.frequencies` */
  psd: number[];
  bands: BandPower[];
  ratios: BandRatio[];
}

export interface EpochFeatures {
  /** index of the epoch in the input signal */
  index: number;
  channels: ChannelFeatures[];
}

export interface SkippedEpoch {
  index: number;
  reason: 'non-finite';
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
  };
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
