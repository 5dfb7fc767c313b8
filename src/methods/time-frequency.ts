/**
 * What the time–frequency methods (spectrogram, Morlet) and connectivity share: the frequency
 * range, the reference, epoching and labels, the sliding window, the FFT length, the checks of
 * baselines and summary windows, and the bound on the matrices a job may keep.
 */
import {
  analysedChannels,
  checkFftLimit,
  checkLabels,
  checkReference,
  epochCountOf,
  epochLength,
  float64Bytes,
  frequencyRangeOf,
  invalid,
  overLimit,
  unfit,
  type DerivedSettings,
  type Fit,
  type RecipeLimits,
  type SignalShape,
  streamedRows,
} from './fit.js';
import type { timeFrequencyCommon, timeFrequencyOutput } from './settings.js';
import type { z } from 'zod';

type Shared = { [K in keyof typeof timeFrequencyCommon]: z.output<(typeof timeFrequencyCommon)[K]> };
type Output = { [K in keyof typeof timeFrequencyOutput]: z.output<(typeof timeFrequencyOutput)[K]> };
export type TimeFrequencySettings = Shared & { method: string; fftLength?: number | null };
export type MatrixSettings = TimeFrequencySettings & Output;

export function checkFrequencyRange(recipe: TimeFrequencySettings): void {
  if (recipe.frequencyRange && recipe.frequencyRange[0] >= recipe.frequencyRange[1]) {
    throw invalid('frequencyRange must be [low, high] with low < high', '/frequencyRange/1');
  }
}

/** Baseline and summary windows ordered; output "summary" needs windows. */
export function checkOutput(recipe: MatrixSettings): void {
  if (recipe.baseline && recipe.baseline.start >= recipe.baseline.end) throw invalid('baseline.start must be before baseline.end', '/baseline/end');
  recipe.summary.forEach((w, i) => {
    if (w.low >= w.high) throw invalid(`summary "${w.name}": low must be below high`, `/summary/${i}/high`);
    if (w.start >= w.end) throw invalid(`summary "${w.name}": start must be before end`, `/summary/${i}/end`);
  });
  if (recipe.output === 'summary' && recipe.summary.length === 0) throw invalid('output "summary" needs at least one summary window', '/summary');
}

/** A sliding window of `seconds`, its step (samples) and the FFT length, checked against the epoch. */
export interface Window {
  seconds: number;
  pointer: string;
  /** samples between window starts, from the window length */
  step: (segmentSamples: number) => number;
}

/**
 * The fit the time–frequency methods share. `window` is null for a method that transforms each whole
 * epoch (Morlet).
 */
export function fitTimeFrequency(recipe: TimeFrequencySettings, shape: SignalShape, limits: RecipeLimits, window: Window | null): Fit {
  const fs = shape.samplingRate;
  const nyquist = fs / 2;
  const epochSamples = epochLength(recipe, shape);
  checkReference(recipe.reference, shape);
  checkLabels(recipe, shape);
  const frequencyRange = frequencyRangeOf(recipe.frequencyRange, fs);
  let segmentSamples = epochSamples;
  let overlapSamples = 0;
  if (window) {
    segmentSamples = Math.round(window.seconds * fs);
    if (segmentSamples < 2) throw unfit(`a window of ${window.seconds} s at ${fs} Hz holds fewer than 2 samples`, window.pointer);
    if (segmentSamples > epochSamples) throw unfit(`a window of ${window.seconds} s (${segmentSamples} samples) is longer than the epoch (${epochSamples} samples)`, window.pointer);
    overlapSamples = segmentSamples - window.step(segmentSamples);
  }
  const fftLength = recipe.fftLength ?? segmentSamples;
  if (fftLength < segmentSamples) throw unfit(`fftLength ${fftLength} is shorter than the window (${segmentSamples} samples)`, '/fftLength');
  checkFftLimit(fftLength, limits);
  const step = segmentSamples - overlapSamples;
  const segmentsPerEpoch = Math.floor((epochSamples - overlapSamples) / Math.max(1, step));
  return { derived: { segmentSamples, overlapSamples, fftLength, frequencyResolution: fs / fftLength, segmentsPerEpoch, frequencyRange, nyquist, epochSamples }, warnings: [] };
}

/** The epochs, channels and trials a time–frequency job sees, for its output and cost. */
export function extentOf(recipe: TimeFrequencySettings & { perEpoch?: boolean }, derived: DerivedSettings, shape: SignalShape, holds: 'one channel' | 'every channel' = 'one channel') {
  const channels = analysedChannels(recipe.reference, shape);
  const epochs = epochCountOf(recipe, shape, derived.epochSamples!);
  // The engine reads a channel row at a time from the store; connectivity keeps every selected
  // channel's epochs (and the reference's row while it reads them).
  const row = (shape.epochCount ?? 1) * shape.samplesPerEpoch;
  const channelSamples = recipe.epoching ? epochs * derived.epochSamples! : row;
  const prepared = holds === 'every channel' ? (recipe.reference === 'none' ? 0 : row) + channels * channelSamples : streamedRows(recipe, shape, channelSamples);
  return { channels, epochs, prepared };
}

/**
 * Matrices larger than the server's `maxOutputValues` are refused before work starts.
 * `trials` counts the per-trial matrices kept (0 without perEpoch); `extra` further matrices per channel.
 */
export function checkOutputValues(recipe: MatrixSettings, shape: SignalShape, limits: RecipeLimits, times: number, frequencies: number, extra: number): void {
  if (recipe.output !== 'matrix') return;
  const channels = shape.channels?.length ?? 1;
  const trials = recipe.perEpoch && !recipe.epoching ? (shape.epochCount ?? 1) : 1;
  const values = channels * times * frequencies * (1 + (recipe.perEpoch ? trials : 0) + extra);
  if (values > limits.maxOutputValues) {
    throw overLimit(
      `the matrices would hold ${values} values (${channels} channels × ${times} times × ${frequencies} frequencies${recipe.perEpoch ? ' with every trial' : ''}), above this server's limit of ${limits.maxOutputValues}; use decimation, fewer frequencies, output "summary", or fewer channels`,
      '/output',
    );
  }
}

/** Bytes of the matrices a time–frequency job keeps while it runs (output values plus each channel's trial sum). */
export function matrixBytes(recipe: MatrixSettings, channels: number, epochs: number, times: number, frequencies: number, extra: number): number {
  const perChannel = times * frequencies * (1 + extra + (recipe.perEpoch ? epochs : 0));
  return float64Bytes(channels * perChannel);
}
