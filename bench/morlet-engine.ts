/**
 * The Morlet workload of bench/morlet.ts as the service computes it: a whole `morlet` recipe through
 * analyze() (every trial's power, trial averages per channel, hashed matrices), on a given number of
 * threads (JOB_THREADS). Used by bench/morlet.ts; never fails on time.
 */
import { analyze } from '../src/engine/analyze.js';
import type { FeatureRecord } from '../src/engine/record.js';
import { normalizeRecipe } from '../src/recipes/normalize.js';
import { resolveRecipe } from '../src/recipes/resolve.js';
import type { Signal } from '../src/signals/signal.js';
import { createChannelRunner } from '../src/threads/channel-runner.js';

export interface MorletWorkload {
  epochs: number;
  channels: number;
  samples: number;
  samplingRate: number;
  low: number;
  high: number;
  count: number;
  cycles: number;
}

/** The signals of sineHashSignals(epochs·channels, samples), signal e·channels + c as epoch e, channel c. */
export function packSignal(data: Float64Array[], w: MorletWorkload): Signal {
  const packed = new Float64Array(w.epochs * w.channels * w.samples);
  data.forEach((x, i) => packed.set(x, i * w.samples));
  return {
    samplingRate: w.samplingRate,
    channels: Array.from({ length: w.channels }, (_, c) => `E${c + 1}`),
    unit: 'uV',
    epochCount: w.epochs,
    samplesPerEpoch: w.samples,
    data: packed,
  };
}

/**
 * Runs the recipe once and returns the wall time, the threads that computed channels, and per
 * frequency Σ over channels, trials and times of the power (trial average × trials), to set beside
 * the reference's sums.
 */
export function timeEngineMorlet(signal: Signal, w: MorletWorkload, threads: number): { seconds: number; threads: number; totals: Float64Array } {
  const pinned = normalizeRecipe({ method: 'morlet', frequencies: { low: w.low, high: w.high, count: w.count }, cycles: w.cycles, output: 'matrix' });
  const start = performance.now();
  const record = analyze(signal, resolveRecipe(pinned.recipe, pinned.hash, signal), {
    signalId: 'sig_bench',
    sha256: 'bench',
    recipeId: pinned.id,
    mode: 'local',
    channels: createChannelRunner({ threads }),
  }) as FeatureRecord;
  const seconds = (performance.now() - start) / 1000;
  const totals = new Float64Array(w.count);
  for (const a of record.attachments ?? []) {
    if (a.kind !== 'power') continue;
    const m = a.data as Float64Array;
    for (let i = 0; i < m.length; i++) totals[i % w.count] = totals[i % w.count]! + m[i]! * w.epochs;
  }
  return { seconds, threads: record.provenance.threads ?? 1, totals };
}
