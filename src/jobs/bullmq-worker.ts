import { UnrecoverableError, Worker, type Job } from 'bullmq';
import { Redis } from 'ioredis';
import type { StoreConfig } from '../stores/store.js';
import { cancelKey, type JobEnding, type QueuedJobData } from './bullmq-queue.js';
import type { ComputePool } from './compute-pool.js';
import type { JobOutcome } from './run-job.js';

export interface BullWorkerOptions {
  url: string;
  prefix: string;
  queueName: string;
  store: StoreConfig;
  pool: ComputePool;
  /** jobs at once; default the pool's thread count */
  concurrency?: number;
  /** ms; a job whose lock is not renewed within it is redelivered */
  lockDurationMs?: number;
  /** redeliveries after stalls before the job fails */
  maxStalledCount?: number;
  onEvent?: (event: 'started' | 'completed' | 'failed' | 'stalled' | 'lock-lost' | 'error', detail: Record<string, unknown>) => void;
}

/**
 * Ends a job without retry, with how it ended kept in its data for the queue's view. The message
 * is for BullMQ's own records only.
 */
async function end(job: Job<QueuedJobData, JobOutcome>, ending: JobEnding, message: string): Promise<never> {
  await job.updateData({ ...job.data, ending });
  throw new UnrecoverableError(message);
}

/**
 * A BullMQ worker whose processor hands the spectral work to worker threads, so this process's
 * event loop stays free to renew job locks. Bad input fails without retry (UnrecoverableError);
 * other faults are retried with exponential back-off by BullMQ.
 */
export function startBullWorker(options: BullWorkerOptions): { worker: Worker; close: () => Promise<void> } {
  const connection = new Redis(options.url, { maxRetriesPerRequest: null });
  connection.on('error', (error) => options.onEvent?.('error', { message: error.message }));
  const processor = async (job: Job<QueuedJobData, JobOutcome>): Promise<JobOutcome> => {
    const abort = new AbortController();
    const key = cancelKey(options.prefix, options.queueName, job.id!);
    const watch = setInterval(() => {
      connection.exists(key).then(
        (n) => n > 0 && abort.abort(),
        () => undefined,
      );
    }, 250);
    let last = -1;
    try {
      const output = await options.pool.run(
        job.data,
        options.store,
        'distributed',
        (fraction) => {
          const step = Math.floor(fraction * 20);
          if (step > last) {
            last = step;
            void job.updateProgress(fraction).catch(() => undefined);
          }
        },
        abort.signal,
      );
      if (!output.ok) return await end(job, { kind: 'refused', problem: output.problem }, output.problem.detail);
      return output.outcome;
    } catch (error) {
      if (abort.signal.aborted) return await end(job, { kind: 'canceled' }, 'canceled by request while running');
      throw error;
    } finally {
      clearInterval(watch);
    }
  };
  const worker = new Worker<QueuedJobData, JobOutcome>(options.queueName, processor, {
    connection,
    prefix: options.prefix,
    concurrency: options.concurrency ?? options.pool.threads,
    lockDuration: options.lockDurationMs ?? 30_000,
    // Stalled jobs are looked for at this interval; without it a shorter lock would not redeliver sooner.
    stalledInterval: options.lockDurationMs ?? 30_000,
    maxStalledCount: options.maxStalledCount ?? 2,
  });
  // Every start (BullMQ's attemptsStarted) and every lost lock is logged, so a redelivery can be traced to its cause.
  worker.on('active', (job) => options.onEvent?.('started', { jobId: job.id, attemptsStarted: job.attemptsStarted }));
  worker.on('lockRenewalFailed', (jobIds) => options.onEvent?.('lock-lost', { jobIds }));
  worker.on('completed', (job) => options.onEvent?.('completed', { jobId: job.id, resultHash: job.returnvalue?.resultHash }));
  worker.on('failed', (job, error) => options.onEvent?.('failed', { jobId: job?.id, reason: error.message }));
  worker.on('stalled', (jobId) => options.onEvent?.('stalled', { jobId }));
  worker.on('error', (error) => options.onEvent?.('error', { message: error.message }));
  return {
    worker,
    close: async () => {
      await worker.close();
      if (connection.status === 'ready') await Promise.race([connection.quit().catch(() => undefined), new Promise((r) => setTimeout(r, 2000).unref())]);
      connection.disconnect();
    },
  };
}
