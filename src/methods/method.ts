/**
 * The shape of a method module. Each method (src/methods/<name>.ts) declares, in one place, its
 * settings schema, the contradictions it refuses, its fit to a signal's shape with the derived
 * values, its cost estimate, and its computation entry; the registry builds the recipe union, the
 * normalization, the resolution and the engine's dispatch from these modules.
 */
import type { z } from 'zod';
import type { CostEstimate, DerivedSettings, Fit, RecipeLimits, SignalShape } from './fit.js';

/** One spectrum of one channel of one epoch, with its equivalent degrees of freedom per bin. */
export interface Estimate {
  psd: Float64Array;
  degreesOfFreedom: Float64Array;
  warnings: readonly string[];
  /** Welch: segments averaged and segments left out (bad spans, amplitude) */
  segments: { used: number; leftOut: number };
}

/** Decides per channel whether a segment [start, end) of `x` may be averaged. */
export type SegmentFilter = (x: Float64Array, start: number, end: number) => boolean;

/** A spectral estimator set up once per job (windows, tapers, FFT plans) and reused per channel and epoch. */
export interface Estimator {
  readonly frequencies: Float64Array;
  /** warnings that hold for every estimate (e.g. poorly concentrated tapers) */
  readonly warnings: readonly string[];
  estimate(x: Float64Array): Estimate;
}

/**
 * The per-trial transform of a time–frequency method, built once per thread and job: its axes,
 * the cells a wavelet overhangs, the record's method-specific fields, and the transform itself.
 */
export interface TrialTransform {
  /** s from the start of the epoch */
  times: Float64Array;
  /** Hz, the columns of every matrix */
  frequencies: Float64Array;
  /** 1 where a cell is edge-contaminated, [time][frequency]; null when no cell is */
  edgeMask: Uint8Array | null;
  /** fields of the record's `timeFrequency` block that only this method has */
  extra: { edgeSigmas?: number; powerFactor?: number; cycles?: number[] };
  /**
   * One trial's power. Given `sum`, the transform may add the power into it and return `sum` as
   * `power`; otherwise `power` is the trial's own matrix. `re`/`im` are the complex coefficients
   * when the method keeps them (phase consistency).
   */
  transform: (x: Float64Array, sum?: Float64Array) => { power: Float64Array; re?: Float64Array; im?: Float64Array };
}

/**
 * How the engine turns a method's result into a record:
 * - `spectrum`: one PSD per channel and epoch from the method's {@link Estimator}, summed over epochs, with
 *   band powers and features (engine/spectra.ts);
 * - `time-frequency`: matrices per channel, as attachments (engine/time-frequency.ts, tf-channels.ts);
 * - `connectivity`: cross-spectra between channel pairs (engine/time-frequency.ts).
 */
export type EnginePath = 'spectrum' | 'time-frequency' | 'connectivity';

export interface MethodModule<R extends { method: string }, S = z.ZodType<R>> {
  readonly name: R['method'];
  /** strict zod object: the method's settings with their defaults */
  readonly schema: S;
  readonly path: EnginePath;
  /**
   * Refuses contradictions between settings by name (`invalid-recipe`). May fill a documented
   * derived default in place (tukeyRatio, ratio names) before the recipe is hashed.
   */
  check(recipe: R): void;
  /** Checks the recipe against the signal's shape and derives the sample counts (`recipe-unfit`, `limit-exceeded`). */
  fit(recipe: R, shape: SignalShape, limits: RecipeLimits): Fit;
  /** Peak memory and work of the job on a signal of this shape, from the fitted values. */
  cost(recipe: R, derived: DerivedSettings, shape: SignalShape): CostEstimate;
  /** `spectrum` path: the per-channel estimator, set up once per job. */
  createEstimator?(samplingRate: number, recipe: R, derived: DerivedSettings, segmentFilter: SegmentFilter | null): Estimator;
  /** `time-frequency` path: the transform of one trial of `samplesPerEpoch` samples, run on any thread. */
  createTrialTransform?(recipe: R, derived: DerivedSettings, samplingRate: number, samplesPerEpoch: number): TrialTransform;
  /**
   * `spectrum` path: whether the method leaves out single segments of an unepoched signal (bad
   * spans, amplitude) rather than whole epochs.
   */
  readonly leavesOutSegments?: boolean;
  /**
   * `spectrum` path: whether the method's channels may go to helper threads at all (Welch,
   * multitaper, periodogram). Whether a given job's do is decided from its resolved cost
   * (`spreadsChannels` and `SPREAD_MIN_WORK_PER_CHANNEL` in engine/spectra.ts): a channel with
   * little work costs more to post to a helper than the helper saves. Welch and periodogram once
   * stayed on one thread because the whole signal was copied to helpers (a 64-channel, 600-s Welch
   * job took 0.65 s on two threads against 0.31 s on one); since channels are posted one at a time,
   * that job took 0.19–0.37 s on two threads against 0.33–0.47 s on one at fftLength 1024, and
   * 0.19–0.32 s against 0.34–0.42 s at 1000 (bench/welch.ts, four runs at a load average of 1.2–5).
   */
  readonly spreadsChannels?: boolean;
}

/** Declares a method module, keeping the concrete schema type for the recipe union. */
export function defineMethod<S extends z.ZodType<{ method: string }>>(module: MethodModule<z.output<S>, S>): MethodModule<z.output<S>, S> {
  return Object.freeze(module);
}
