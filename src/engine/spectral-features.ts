import { spectralCentroid } from '../features/centroid.js';
import { spectralEdge } from '../features/edge.js';
import { spectralEntropy } from '../features/entropy.js';
import { fitPowerLaw } from '../features/power-law.js';
import { lineNoiseRatio } from '../features/line-noise.js';
import { peakFrequency } from '../features/peak.js';
import type { Features } from '../recipes/schema.js';

/** The record's per-spectrum feature values; each present only when the recipe names it. */
export interface FeatureValues {
  peakFrequency?: { range: [number, number]; frequency: number | null; power: number | null; heightDb: number | null };
  centroid?: { range: [number, number]; frequency: number | null };
  spectralEdge?: { range: [number, number]; edges: { percentile: number; frequency: number | null }[] };
  entropy?: { range: [number, number]; value: number | null; bins: number };
  powerLaw?: {
    range: [number, number];
    robust: boolean;
    /** log10 of the fitted PSD at 1 Hz (log10 unit²/Hz) */
    intercept: number | null;
    /** d log10 PSD / d log10 f; −1 for a 1/f background */
    slope: number | null;
    rSquared: number | null;
    /** RMS of the log10 residuals (decades) */
    residualRms: number | null;
    /** fraction of bins the robust fit kept with weight > 0 */
    inlierFraction: number | null;
    bins: number;
  };
  lineNoise?: { frequency: number; ratio: number | null; maxRatio: number | null; harmonics: { frequency: number; ratio: number | null; ratioDb: number | null }[] };
}

const orNull = (v: number | null | undefined): number | null => (v === undefined || v === null || !Number.isFinite(v) ? null : v);

/**
 * Computes the features a recipe names on one spectrum. Warnings are returned, not thrown: a
 * feature that is undefined on this spectrum is null with the reason in the warnings.
 */
export function computeFeatures(frequencies: Float64Array, psd: Float64Array, features: Features, totalRange: [number, number]): { values: FeatureValues; warnings: string[] } {
  const values: FeatureValues = {};
  const warnings: string[] = [];
  const note = (name: string, list: readonly string[]) => list.forEach((w) => warnings.push(`${name}: ${w}`));
  if (features.peakFrequency) {
    const range: [number, number] = [...features.peakFrequency.range];
    const r = peakFrequency(frequencies, psd, { range, minHeightDb: features.peakFrequency.minHeightDb });
    values.peakFrequency = { range, frequency: orNull(r.frequency), power: orNull(r.power), heightDb: orNull(r.heightDb) };
    note('peakFrequency', r.warnings);
  }
  if (features.centroid) {
    const range: [number, number] = features.centroid.range ? [...features.centroid.range] : totalRange;
    const r = spectralCentroid(frequencies, psd, range);
    values.centroid = { range, frequency: orNull(r.frequency) };
    note('centroid', r.warnings);
  }
  if (features.spectralEdge) {
    const range: [number, number] = features.spectralEdge.range ? [...features.spectralEdge.range] : totalRange;
    const r = spectralEdge(frequencies, psd, { range, percentiles: [...features.spectralEdge.percentiles] });
    values.spectralEdge = { range, edges: r.edges.map((e) => ({ percentile: e.percentile, frequency: orNull(e.frequency) })) };
    note('spectralEdge', r.warnings);
  }
  if (features.entropy) {
    const range: [number, number] = features.entropy.range ? [...features.entropy.range] : totalRange;
    const r = spectralEntropy(frequencies, psd, range);
    values.entropy = { range, value: orNull(r.value), bins: r.binCount };
    note('entropy', r.warnings);
  }
  if (features.powerLaw) {
    const range: [number, number] = [...features.powerLaw.range];
    const r = fitPowerLaw(frequencies, psd, { range, robust: features.powerLaw.robust });
    values.powerLaw = {
      range,
      robust: features.powerLaw.robust,
      intercept: orNull(r.intercept),
      slope: orNull(r.slope),
      rSquared: orNull(r.rSquared),
      residualRms: orNull(r.residualRms),
      inlierFraction: orNull(r.inlierFraction),
      bins: r.binCount,
    };
    note('powerLaw', r.warnings);
  }
  if (features.lineNoise) {
    const o = features.lineNoise;
    const r = lineNoiseRatio(frequencies, psd, { lineFrequency: o.frequency, harmonics: o.harmonics, halfWidth: o.halfWidth, neighborhoodWidth: o.neighborhoodWidth });
    values.lineNoise = {
      frequency: o.frequency,
      ratio: orNull(r.ratio),
      maxRatio: orNull(r.maxRatio),
      harmonics: r.harmonics.map((h) => ({ frequency: h.frequency, ratio: orNull(h.ratio), ratioDb: orNull(h.ratioDb) })),
    };
    note('lineNoise', r.warnings);
  }
  return { values, warnings };
}
