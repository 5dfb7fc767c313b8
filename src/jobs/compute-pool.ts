import { MessageChannel, receiveMessageOnPort } from 'node:worker_threads';
import type { Signal } from '../signals/signal.js';
import type { StoreConfig } from '../stores/store.js';
import { createThreadBudget, defaultThreadCount, type ThreadBudget } from '../threads/budget.js';
import { threadEntry } from '../threads/entry.js';
import { createThreadPool } from '../threads/pool.js';
import type { PoolTaskInput, PoolTaskOutput } from './pool-task.js';
import type { JobSpec, RunMode } from './spec.js';

/**
 * Estimated work (the methods' `cost().work`) up to which a job reports no progress: such a job takes
 * a few milliseconds (the API latency benchmark's job, 32 ch × 2 s × 256 Hz Welch, is about 5·10^5),
 * and a progress channel would add a port to set up and a message per channel to its round trip.
 */
export const QUIET_JOB_WORK = 2e6;

export interface ComputePool {
  /** jobs computed at once */
  readonly threads: number;
  /**
   * Computes one job on a job thread. `samples`, the job's signal as the store holds it, is copied
   * to the thread with the task (for a small upload a copy costs less than reading the file back).
   */
  run(spec: JobSpec, store: StoreConfig, mode: RunMode, onProgress: (fraction: number) => void, signal?: AbortSignal, samples?: Signal): Promise<PoolTaskOutput>;
  close(): Promise<void>;
}

/**
 * Job threads (src/threads) that run the spectral work off the event loop, each job spreading its
 * channels over the budget's free threads.
 *
 * @param jobs - jobs computed at once. @defaultValue the budget
 * @param threadsPerJob - threads one job may spread its channels over, its own included; 1 keeps
 *   every job on its own thread. @defaultValue the budget
 * @param budget - the process's thread budget, shared by jobs and their helpers. @defaultValue
 *   `max(jobs, threadsPerJob)` threads when `jobs` is given, else one per CPU
 */
export function createComputePool(
  jobs?: number,
  threadsPerJob?: number,
  budget: ThreadBudget = createThreadBudget(jobs === undefined ? defaultThreadCount() : Math.max(jobs, threadsPerJob ?? 1)),
): ComputePool {
  const size = jobs ?? budget.threads;
  const jobThreads = threadsPerJob ?? budget.threads;
  const pool = createThreadPool(threadEntry(import.meta.url, 'pool-task'), size);
  return {
    threads: size,
    async run(spec, store, mode, onProgress, signal, samples) {
      const base: PoolTaskInput = { spec, store, mode, jobThreads, budget, ...(samples ? { signal: samples } : {}) };
      const abort = signal ? { signal } : {};
      // The queue sets a succeeded job's progress to 1 itself.
      if ((spec.resolved?.cost.work ?? Number.POSITIVE_INFINITY) <= QUIET_JOB_WORK) return (await pool.run(base, abort)) as PoolTaskOutput;
      const { port1, port2 } = new MessageChannel();
      port1.on('message', (fraction: number) => onProgress(fraction));
      try {
        return (await pool.run({ ...base, port: port2 }, { transferList: [port2], ...abort })) as PoolTaskOutput;
      } finally {
        // The answer comes over another port and may overtake the last progress messages: they are
        // queued on port1 by then, so take them before closing it.
        for (let queued = receiveMessageOnPort(port1); queued; queued = receiveMessageOnPort(port1)) onProgress(queued.message as number);
        port1.close();
      }
    },
    close: () => pool.close(),
  };
}
