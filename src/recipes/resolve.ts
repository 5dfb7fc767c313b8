import { RecipeInputError } from './errors.js';
import { isSpectrumRecipe, type Recipe, type SpectrumRecipe } from './schema.js';
import { defaultTaperCount } from '../dsp/dpss.js';

export interface SignalShape {
  samplingRate: number;
  samplesPerEpoch: number;
  /** default 1 */
  epochCount?: number;
  channels?: readonly string[];
}

export interface RecipeLimits {
  maxFftLength: number;
  /** float64 values a time–frequency result may hold in its matrices (channels × times × frequencies, × trials when kept) */
  maxOutputValues: number;
}

export const DEFAULT_RECIPE_LIMITS: Readonly<RecipeLimits> = Object.freeze({ maxFftLength: 1 << 20, maxOutputValues: 64 * 1024 * 1024 });

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

export interface ResolvedRecipe<R extends Recipe = Recipe> {
  recipe: R;
  hash: string;
  derived: DerivedSettings;
  warnings: string[];
}

/**
 * Checks a normalized recipe against the signal it will run on and derives the sample counts.
 * Everything that would make the computation meaningless is refused here, before any work starts.
 */
export function resolveRecipe<R extends Recipe>(recipe: R, hash: string, shape: SignalShape, limits: RecipeLimits = DEFAULT_RECIPE_LIMITS): ResolvedRecipe<R> {
  if (!isSpectrumRecipe(recipe)) return resolveTimeFrequency(recipe as Exclude<Recipe, SpectrumRecipe>, hash, shape, limits) as ResolvedRecipe<R>;
  return resolveSpectrum(recipe, hash, shape, limits) as ResolvedRecipe<R>;
}

function checkReference(recipe: Recipe, shape: SignalShape): void {
  if (typeof recipe.reference === 'object' && shape.channels && !shape.channels.includes(recipe.reference.channel)) {
    throw new RecipeInputError('unfit-for-signal', `reference channel "${recipe.reference.channel}" is not in the signal (it has ${shape.channels.join(', ')})`, '/reference/channel');
  }
  if (typeof recipe.reference === 'object' && shape.channels?.length === 1) {
    throw new RecipeInputError('unfit-for-signal', 're-referencing to a channel needs at least one other channel', '/reference/channel');
  }
}

/** Time–frequency and connectivity recipes: the windows and frequencies must fit the epochs. */
function resolveTimeFrequency(recipe: Exclude<Recipe, SpectrumRecipe>, hash: string, shape: SignalShape, limits: RecipeLimits): ResolvedRecipe {
  const fs = shape.samplingRate;
  const nyquist = fs / 2;
  const warnings: string[] = [];
  const epochSamples = epochLength(recipe, shape);
  checkReference(recipe, shape);
  const frequencyRange: [number, number] = recipe.frequencyRange ? [recipe.frequencyRange[0], recipe.frequencyRange[1]] : [0, nyquist];
  if (frequencyRange[1] > nyquist) {
    throw new RecipeInputError('unfit-for-signal', `frequencyRange ends at ${frequencyRange[1]} Hz, above the Nyquist frequency ${nyquist} Hz`, '/frequencyRange/1');
  }
  let segmentSamples = epochSamples;
  let overlapSamples = 0;
  if (recipe.method === 'spectrogram' || recipe.method === 'connectivity') {
    const seconds = recipe.method === 'spectrogram' ? recipe.windowSeconds : recipe.segmentSeconds;
    const field = recipe.method === 'spectrogram' ? '/windowSeconds' : '/segmentSeconds';
    segmentSamples = Math.round(seconds * fs);
    if (segmentSamples < 2) throw new RecipeInputError('unfit-for-signal', `a window of ${seconds} s at ${fs} Hz holds fewer than 2 samples`, field);
    if (segmentSamples > epochSamples) throw new RecipeInputError('unfit-for-signal', `a window of ${seconds} s (${segmentSamples} samples) is longer than the epoch (${epochSamples} samples)`, field);
    if (recipe.method === 'spectrogram') {
      const step = Math.round(recipe.stepSeconds * fs);
      if (step < 1 || step > segmentSamples) throw new RecipeInputError('unfit-for-signal', `stepSeconds must be between one sample and the window length (${segmentSamples / fs} s)`, '/stepSeconds');
      overlapSamples = segmentSamples - step;
    } else {
      overlapSamples = Math.floor(recipe.overlap * segmentSamples);
    }
  }
  const fftLength = 'fftLength' in recipe && recipe.fftLength !== null ? recipe.fftLength : segmentSamples;
  if (fftLength < segmentSamples) throw new RecipeInputError('unfit-for-signal', `fftLength ${fftLength} is shorter than the window (${segmentSamples} samples)`, '/fftLength');
  if (fftLength > limits.maxFftLength) throw new RecipeInputError('limit', `fftLength ${fftLength} is above this server's limit of ${limits.maxFftLength}`, '/fftLength');
  if (recipe.method === 'morlet') {
    const list = Array.isArray(recipe.frequencies) ? recipe.frequencies : [recipe.frequencies.low, recipe.frequencies.high];
    list.forEach((f, i) => {
      if (f >= nyquist) {
        const pointer = Array.isArray(recipe.frequencies) ? `/frequencies/${i}` : i === 0 ? '/frequencies/low' : '/frequencies/high';
        throw new RecipeInputError('unfit-for-signal', `wavelet frequency ${f} Hz is not below the Nyquist frequency ${nyquist} Hz`, pointer);
      }
    });
  }
  if (recipe.method === 'connectivity') {
    recipe.pairs?.forEach(([a, b], i) => {
      [a, b].forEach((name, j) => {
        if (shape.channels && !shape.channels.includes(name)) throw new RecipeInputError('unfit-for-signal', `pair channel "${name}" is not in the signal`, `/pairs/${i}/${j}`);
      });
    });
  }
  const step = segmentSamples - overlapSamples;
  const segmentsPerEpoch = Math.floor((epochSamples - overlapSamples) / Math.max(1, step));
  if (recipe.method !== 'connectivity' && recipe.output === 'matrix') {
    const times = recipe.method === 'morlet' ? Math.ceil(epochSamples / recipe.decimation) : segmentsPerEpoch;
    const frequencies = recipe.method === 'morlet' ? (Array.isArray(recipe.frequencies) ? recipe.frequencies.length : recipe.frequencies.count) : Math.floor(fftLength / 2) + 1;
    const channels = shape.channels?.length ?? 1;
    const trials = recipe.perTrial && !recipe.epoching ? (shape.epochCount ?? 1) : 1;
    const values = channels * times * frequencies * (1 + (recipe.perTrial ? trials : 0) + (recipe.method === 'morlet' && recipe.phaseConsistency ? 1 : 0));
    if (values > limits.maxOutputValues) {
      throw new RecipeInputError(
        'limit',
        `the matrices would hold ${values} values (${channels} channels × ${times} times × ${frequencies} frequencies${recipe.perTrial ? ' with every trial' : ''}), above this server's limit of ${limits.maxOutputValues}; use decimation, fewer frequencies, output "summary", or fewer channels`,
        '/output',
      );
    }
  }
  return {
    recipe,
    hash,
    derived: { segmentSamples, overlapSamples, fftLength, frequencyResolution: fs / fftLength, segmentsPerEpoch, frequencyRange, nyquist, epochSamples },
    warnings,
  } as ResolvedRecipe;
}

function resolveSpectrum(recipe: SpectrumRecipe, hash: string, shape: SignalShape, limits: RecipeLimits): ResolvedRecipe<SpectrumRecipe> {
  const fs = shape.samplingRate;
  const nyquist = fs / 2;
  const warnings: string[] = [];
  shape = { ...shape, samplesPerEpoch: epochLength(recipe, shape) };
  checkReference(recipe, shape);
  if (recipe.method !== 'welch' && recipe.epoching === null && (shape.epochCount ?? 1) === 1 && (recipe.badSpans.labels.length > 0 || recipe.badSpans.peakToPeak !== null)) {
    warnings.push(`bad spans leave out Welch segments or epochs; ${recipe.method} on an unepoched signal can only use or skip whole epochs`);
  }
  let segmentSamples: number;
  let overlapSamples = 0;
  if (recipe.method === 'welch') {
    const exactSegment = recipe.segmentSeconds * fs;
    segmentSamples = Math.round(exactSegment);
    if (segmentSamples < 2) {
      throw new RecipeInputError('unfit-for-signal', `a segment of ${recipe.segmentSeconds} s at ${fs} Hz holds ${segmentSamples} sample(s); at least 2 are needed`, '/segmentSeconds');
    }
    if (Math.abs(exactSegment - segmentSamples) > 1e-9 * Math.max(1, exactSegment)) {
      warnings.push(`segmentSeconds ${recipe.segmentSeconds} s is ${exactSegment} samples at ${fs} Hz; rounded to ${segmentSamples} samples (${segmentSamples / fs} s)`);
    }
    if (segmentSamples > shape.samplesPerEpoch) {
      throw new RecipeInputError(
        'unfit-for-signal',
        `a segment of ${recipe.segmentSeconds} s (${segmentSamples} samples) is longer than the epoch (${shape.samplesPerEpoch} samples = ${shape.samplesPerEpoch / fs} s)`,
        '/segmentSeconds',
      );
    }
    overlapSamples = Math.floor(recipe.overlap * segmentSamples);
  } else {
    // Multitaper and periodogram estimates use each whole epoch as one segment.
    segmentSamples = shape.samplesPerEpoch;
  }
  const fftLength = recipe.fftLength ?? segmentSamples;
  if (fftLength < segmentSamples) {
    const what = recipe.method === 'welch' ? 'segment' : 'epoch';
    throw new RecipeInputError('unfit-for-signal', `fftLength ${fftLength} is shorter than the ${what} (${segmentSamples} samples); it must be at least the ${what} length`, '/fftLength');
  }
  if (fftLength > limits.maxFftLength) {
    throw new RecipeInputError('limit', `fftLength ${fftLength} is above this server's limit of ${limits.maxFftLength}`, '/fftLength');
  }
  const frequencyResolution = fs / fftLength;
  const frequencyRange: [number, number] = recipe.frequencyRange ? [recipe.frequencyRange[0], recipe.frequencyRange[1]] : [0, nyquist];
  if (frequencyRange[1] > nyquist) {
    throw new RecipeInputError('unfit-for-signal', `frequencyRange ends at ${frequencyRange[1]} Hz, above the Nyquist frequency ${nyquist} Hz of this ${fs} Hz signal`, '/frequencyRange/1');
  }
  // A band may reach one resolution step past Nyquist so that it can include the Nyquist bin itself.
  const ceiling = nyquist + frequencyResolution;
  recipe.bands.forEach((band, i) => {
    if (band.high > ceiling) {
      throw new RecipeInputError(
        'unfit-for-signal',
        `band "${band.name}" [${band.low}, ${band.high}) Hz reaches above the Nyquist frequency ${nyquist} Hz of this ${fs} Hz signal; give bands that fit`,
        `/bands/${i}/high`,
      );
    }
    const bins = countBins(band.low, band.high, fs, fftLength);
    if (bins === 0) {
      throw new RecipeInputError(
        'unfit-for-signal',
        `band "${band.name}" [${band.low}, ${band.high}) Hz holds no frequency bin at a resolution of ${frequencyResolution} Hz; widen it or raise fftLength`,
        `/bands/${i}`,
      );
    }
    if (band.high - band.low < frequencyResolution) {
      warnings.push(`band "${band.name}" is narrower (${band.high - band.low} Hz) than the frequency resolution (${frequencyResolution} Hz); its power is one bin`);
    }
    if (band.low < frequencyRange[0] || band.high > frequencyRange[1] + frequencyResolution) {
      warnings.push(`band "${band.name}" [${band.low}, ${band.high}) Hz extends outside frequencyRange [${frequencyRange[0]}, ${frequencyRange[1]}] Hz, so its relative power can exceed its share`);
    }
  });
  checkFeatureRanges(recipe, nyquist);
  let taper: { taperCount: number; halfBandwidth: number } | null = null;
  if (recipe.method === 'multitaper') {
    const taperCount = recipe.taperCount ?? defaultTaperCount(recipe.timeBandwidth);
    if (taperCount > segmentSamples) {
      throw new RecipeInputError('unfit-for-signal', `taperCount ${taperCount} exceeds the epoch length (${segmentSamples} samples)`, '/taperCount');
    }
    taper = { taperCount, halfBandwidth: (recipe.timeBandwidth * fs) / segmentSamples };
  }
  const step = segmentSamples - overlapSamples;
  const segmentsPerEpoch = Math.floor((shape.samplesPerEpoch - overlapSamples) / step);
  const used = (segmentsPerEpoch - 1) * step + segmentSamples;
  if (used < shape.samplesPerEpoch) {
    warnings.push(`the last ${shape.samplesPerEpoch - used} sample(s) of each epoch do not fill a segment and are not used`);
  }
  return {
    recipe,
    hash,
    derived: { segmentSamples, overlapSamples, fftLength, frequencyResolution, segmentsPerEpoch, frequencyRange, nyquist, ...(taper ?? {}) },
    warnings,
  };
}

function checkFeatureRanges(recipe: SpectrumRecipe, nyquist: number): void {
  const f = recipe.features;
  const ranges: [string, readonly [number, number] | null | undefined][] = [
    ['peakFrequency', f.peakFrequency?.range],
    ['centroid', f.centroid?.range],
    ['spectralEdge', f.spectralEdge?.range],
    ['entropy', f.entropy?.range],
    ['powerLaw', f.powerLaw?.range],
  ];
  for (const [name, range] of ranges) {
    if (range && range[1] > nyquist) {
      throw new RecipeInputError('unfit-for-signal', `features.${name}.range ends at ${range[1]} Hz, above the Nyquist frequency ${nyquist} Hz`, `/features/${name}/range/1`);
    }
  }
  if (f.lineNoise && f.lineNoise.frequency + f.lineNoise.halfWidth + f.lineNoise.neighbourhoodWidth > nyquist) {
    throw new RecipeInputError('unfit-for-signal', `line noise at ${f.lineNoise.frequency} Hz and its neighbourhood do not fit below the Nyquist frequency ${nyquist} Hz`, '/features/lineNoise/frequency');
  }
}

/** Samples per analysed epoch: the uploaded epochs, or those the recipe's epoching cuts. */
function epochLength(recipe: Recipe, shape: SignalShape): number {
  const e = recipe.epoching;
  if (!e) return shape.samplesPerEpoch;
  if ((shape.epochCount ?? 1) !== 1) {
    throw new RecipeInputError('unfit-for-signal', `epoching cuts a continuous signal; this one already has ${shape.epochCount} epochs`, '/epoching');
  }
  const fs = shape.samplingRate;
  const samples = e.mode === 'events' ? Math.round(e.beforeSeconds * fs) + Math.round(e.afterSeconds * fs) : Math.round(e.lengthSeconds * fs);
  if (samples < 2) throw new RecipeInputError('unfit-for-signal', `epochs of ${samples} sample(s) at ${fs} Hz are too short`, e.mode === 'events' ? '/epoching/afterSeconds' : '/epoching/lengthSeconds');
  if (samples > shape.samplesPerEpoch) {
    throw new RecipeInputError('unfit-for-signal', `epochs of ${samples} samples are longer than the signal (${shape.samplesPerEpoch} samples)`, '/epoching');
  }
  if (e.mode === 'events' && e.baseline && !(e.baseline[0] < e.baseline[1] && e.baseline[0] >= -e.beforeSeconds && e.baseline[1] <= e.afterSeconds)) {
    throw new RecipeInputError('unfit-for-signal', `baseline [${e.baseline[0]}, ${e.baseline[1]}) s must lie inside the epoch [${-e.beforeSeconds}, ${e.afterSeconds}) s`, '/epoching/baseline');
  }
  return samples;
}

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
