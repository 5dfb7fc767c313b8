/**
 * How the engine computes per-channel work without owning a thread: it describes the work as a
 * {@link ChannelTask} (plain data) and hands it to a {@link ChannelRunner}. The runner given by the
 * caller (src/threads) may spread channels over other threads; {@link createLocalRunner}, the
 * default, computes them all here. Either way each channel is computed by the same kernel on the
 * same samples, so the outcome does not depend on the runner or its thread count.
 */
import type { SignalDescription } from '../signals/signal.js';
import { spectrumKernel, type SpectrumSetup } from './spectrum-channels.js';
import { timeFrequencyKernel } from './tf-channels.js';
import type { ChannelSetup } from './tf-channels.js';

/**
 * The prepared signal (after view, re-reference and epoching) read one channel at a time, so that
 * the engine holds a few channels' rows, never the whole recording.
 */
export interface ChannelSource extends SignalDescription {
  /**
   * Every epoch of channel `c`, [epoch][sample] (length epochCount·samplesPerEpoch): a fresh array
   * read from the stored samples on each call, which the caller may keep or drop.
   */
  channel(c: number): Float64Array;
}

/** Per-channel work, as plain data a helper thread can receive. */
export type ChannelTask = { kind: 'time-frequency'; setup: ChannelSetup } | { kind: 'spectrum'; setup: SpectrumSetup };

/** The shape every setup shares: which channels there are and which epochs enter. */
export interface ChannelLayout {
  channels: string[];
  samplesPerEpoch: number;
  /** indices of the epochs that enter, in order */
  used: number[];
}

/**
 * The computation of one channel of a task: `prepare` builds a thread's plan once per job,
 * `compute` runs one channel from its used trials (`trial(i)` gives the i-th used epoch's samples),
 * calling `beforeTrial` before each one (progress and cancellation).
 */
export interface ChannelKernel<S extends ChannelLayout = ChannelLayout, W = unknown, O = unknown> {
  prepare(setup: S): W;
  compute(setup: S, work: W, c: number, trial: (i: number) => Float64Array, beforeTrial: () => void): O;
}

export interface ChannelRunContext {
  /** fraction of all trials of all channels done */
  onProgress?: (fraction: number) => void;
  /** called before each trial on the calling thread; throw from it to abandon the job */
  checkpoint?: () => void;
}

export interface ChannelRunner {
  /** threads it may use at most, the calling one included */
  readonly threads: number;
  /**
   * Every channel's outcome, in channel order, and how many threads computed at least one channel.
   * Synchronous: the calling thread computes channels itself and waits for the rest.
   *
   * @param here - this thread's plan when the caller has already built it (else prepared here)
   */
  run(task: ChannelTask, source: ChannelSource, context: ChannelRunContext, here?: unknown): { outcomes: unknown[]; threads: number };
}

/** The kernel of a task's kind. */
export function kernelOf(task: ChannelTask): ChannelKernel {
  return (task.kind === 'spectrum' ? spectrumKernel : timeFrequencyKernel) as unknown as ChannelKernel;
}

/** Samples of used epoch `i` in one channel's [epoch][sample] rows. */
export function trialsOf(layout: ChannelLayout, rows: Float64Array): (i: number) => Float64Array {
  const n = layout.samplesPerEpoch;
  return (i) => {
    const start = layout.used[i]! * n;
    return rows.subarray(start, start + n);
  };
}

/** A runner that computes every channel on the calling thread. */
export function createLocalRunner(): ChannelRunner {
  return {
    threads: 1,
    run(task, source, context, here) {
      const kernel = kernelOf(task);
      const { setup } = task;
      const work = here ?? kernel.prepare(setup);
      const total = setup.channels.length * setup.used.length;
      let done = 0;
      const outcomes = setup.channels.map((_, c) =>
        // Read here, dropped when the channel is done: one channel's rows at a time.
        kernel.compute(setup, work, c, trialsOf(setup, source.channel(c)), () => {
          context.checkpoint?.();
          context.onProgress?.(done / total);
          done++;
        }),
      );
      context.onProgress?.(1);
      return { outcomes, threads: 1 };
    },
  };
}
