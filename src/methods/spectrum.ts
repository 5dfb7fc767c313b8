/**
 * What the spectrum methods (Welch, multitaper, periodogram) share: the contradictions between
 * bands, ratios and feature ranges, the fit of bands and features to the frequency grid, and the
 * parts of the cost every spectrum job pays.
 */
import {
  analysedChannels,
  checkBandNames,
  checkFftLimit,
  checkLabels,
  checkRangeOrder,
  checkReference,
  countBins,
  epochCountOf,
  epochLength,
  float64Bytes,
  frequencyRangeOf,
  invalid,
  unfit,
  type CostEstimate,
  type DerivedSettings,
  type Fit,
  type RecipeLimits,
  type SignalShape,
  streamedRows,
} from './fit.js';
import type { commonSettings } from './settings.js';
import type { z } from 'zod';

type Common = { [K in keyof typeof commonSettings]: z.output<(typeof commonSettings)[K]> };
/** The settings of any spectrum method. */
export type SpectrumSettings = Common & { method: string };

/** Ranges ordered, the power-law range above 0 Hz, band names unique, ratios naming bands; ratio names filled in. */
export function checkSpectrumSettings(recipe: SpectrumSettings): void {
  const f = recipe.features;
  checkRangeOrder([
    ['/frequencyRange', recipe.frequencyRange],
    ['/features/peakFrequency/range', f.peakFrequency?.range],
    ['/features/centroid/range', f.centroid?.range],
    ['/features/spectralEdge/range', f.spectralEdge?.range],
    ['/features/entropy/range', f.entropy?.range],
    ['/features/powerLaw/range', f.powerLaw?.range],
  ]);
  if (f.powerLaw && f.powerLaw.range[0] <= 0) {
    throw invalid('the power-law fit works on log10 f: its range must start above 0 Hz', '/features/powerLaw/range/0');
  }
}

/** Band names unique and ratios naming bands of the recipe; fills each ratio's default name. */
export function checkBandsAndRatios(recipe: SpectrumSettings): void {
  const names = checkBandNames(recipe.bands);
  recipe.ratios.forEach((ratio, i) => {
    for (const side of ['numerator', 'denominator'] as const) {
      if (!names.has(ratio[side])) throw invalid(`ratio ${side} "${ratio[side]}" is not a band of this recipe`, `/ratios/${i}/${side}`);
    }
  });
  recipe.ratios = recipe.ratios.map((r) => ({ ...r, name: r.name ?? `${r.numerator}/${r.denominator}` }));
}

/** How a spectrum method cuts an epoch: its segment and overlap, plus warnings about rounding. */
export interface Segmenting {
  segmentSamples: number;
  overlapSamples: number;
  warnings: string[];
}

/**
 * The fit every spectrum method shares, around the method's own segmenting: the reference, the
 * epoching, labels, the FFT length, the frequency range, bands and feature ranges.
 * `segmenting` receives the shape with the analysed epoch length.
 */
export function fitSpectrum(recipe: SpectrumSettings, shape: SignalShape, limits: RecipeLimits, segmenting: (shape: SignalShape) => Segmenting): Fit {
  const fs = shape.samplingRate;
  const nyquist = fs / 2;
  const warnings: string[] = [];
  shape = { ...shape, samplesPerEpoch: epochLength(recipe, shape) };
  checkReference(recipe.reference, shape);
  checkLabels(recipe, shape);
  const { segmentSamples, overlapSamples, warnings: segmentWarnings } = segmenting(shape);
  warnings.push(...segmentWarnings);
  const fftLength = recipe.fftLength ?? segmentSamples;
  if (fftLength < segmentSamples) {
    const what = recipe.method === 'welch' ? 'segment' : 'epoch';
    throw unfit(`fftLength ${fftLength} is shorter than the ${what} (${segmentSamples} samples); it must be at least the ${what} length`, '/fftLength');
  }
  checkFftLimit(fftLength, limits);
  const frequencyResolution = fs / fftLength;
  const frequencyRange = frequencyRangeOf(recipe.frequencyRange, fs, ` of this ${fs} Hz signal`);
  // A band may reach one resolution step past Nyquist so that it can include the Nyquist bin itself.
  const ceiling = nyquist + frequencyResolution;
  recipe.bands.forEach((band, i) => {
    if (band.high > ceiling) {
      throw unfit(`band "${band.name}" [${band.low}, ${band.high}) Hz reaches above the Nyquist frequency ${nyquist} Hz of this ${fs} Hz signal; give bands that fit`, `/bands/${i}/high`);
    }
    if (countBins(band.low, band.high, fs, fftLength) === 0) {
      throw unfit(`band "${band.name}" [${band.low}, ${band.high}) Hz holds no frequency bin at a resolution of ${frequencyResolution} Hz; widen it or raise fftLength`, `/bands/${i}`);
    }
    if (band.high - band.low < frequencyResolution) {
      warnings.push(`band "${band.name}" is narrower (${band.high - band.low} Hz) than the frequency resolution (${frequencyResolution} Hz); its power is one bin`);
    }
    if (band.low < frequencyRange[0] || band.high > frequencyRange[1] + frequencyResolution) {
      warnings.push(`band "${band.name}" [${band.low}, ${band.high}) Hz extends outside frequencyRange [${frequencyRange[0]}, ${frequencyRange[1]}] Hz, so its relative power can exceed its share`);
    }
  });
  checkFeatureRanges(recipe, nyquist);
  const step = segmentSamples - overlapSamples;
  const segmentsPerEpoch = Math.floor((shape.samplesPerEpoch - overlapSamples) / step);
  const used = (segmentsPerEpoch - 1) * step + segmentSamples;
  if (used < shape.samplesPerEpoch) warnings.push(`the last ${shape.samplesPerEpoch - used} sample(s) of each epoch do not fill a segment and are not used`);
  return { derived: { segmentSamples, overlapSamples, fftLength, frequencyResolution, segmentsPerEpoch, frequencyRange, nyquist }, warnings };
}

function checkFeatureRanges(recipe: SpectrumSettings, nyquist: number): void {
  const f = recipe.features;
  const ranges: [string, readonly [number, number] | null | undefined][] = [
    ['peakFrequency', f.peakFrequency?.range],
    ['centroid', f.centroid?.range],
    ['spectralEdge', f.spectralEdge?.range],
    ['entropy', f.entropy?.range],
    ['powerLaw', f.powerLaw?.range],
  ];
  for (const [name, range] of ranges) {
    if (range && range[1] > nyquist) throw unfit(`features.${name}.range ends at ${range[1]} Hz, above the Nyquist frequency ${nyquist} Hz`, `/features/${name}/range/1`);
  }
  if (f.lineNoise && f.lineNoise.frequency + f.lineNoise.halfWidth + f.lineNoise.neighborhoodWidth > nyquist) {
    throw unfit(`line noise at ${f.lineNoise.frequency} Hz and its neighbourhood do not fit below the Nyquist frequency ${nyquist} Hz`, '/features/lineNoise/frequency');
  }
}

/**
 * The memory and work every spectrum job has, given what one estimate of one channel costs:
 * the rows the engine holds while it reads a channel at a time from the store
 * ({@link streamedRows}), the per-channel sums, per-epoch spectra when kept, and the estimator's
 * own scratch (`estimatorBytes`) and work per channel and epoch.
 */
export function spectrumCost(recipe: SpectrumSettings, derived: DerivedSettings, shape: SignalShape, estimatorBytes: number, estimateWork: number, driver: string): CostEstimate {
  const epochSamples = recipe.epoching ? epochLength(recipe, shape) : shape.samplesPerEpoch;
  const epochs = epochCountOf(recipe, shape, epochSamples);
  const analysed = analysedChannels(recipe.reference, shape);
  const prepared = streamedRows(recipe, shape, recipe.epoching ? epochs * epochSamples : (shape.epochCount ?? 1) * shape.samplesPerEpoch);
  const bins = Math.floor(derived.fftLength / 2) + 1;
  const sums = 2 * analysed * bins;
  const kept = recipe.perEpoch ? epochs * analysed * bins : 0;
  const bytes = float64Bytes(prepared + sums + kept) + estimatorBytes;
  const work = epochs * analysed * estimateWork;
  return { bytes, work, driver: kept > prepared ? '/perEpoch' : driver };
}
