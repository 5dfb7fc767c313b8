import type { Signal } from '../signals/signal.js';
import type { JobListFilter } from './list.js';
import type { JobSpec, JobState, JobView } from './spec.js';

export interface SubmitOptions {
  /**
   * The job's signal exactly as the store would give it back (`signalFromParts` of its stored meta
   * and samples), when the request has just uploaded it. A queue may hand it to the computation
   * instead of reading it back; the signal id derives from the content hash, so these are the
   * stored samples. Queues that cannot use it ignore it.
   */
  signal?: Signal;
}

/**
 * The port every queue adapter implements; one conformance suite runs against each
 * (test/jobs/queue-conformance.test.ts).
 */
export interface JobQueue {
  readonly mode: 'embedded' | 'distributed';
  /** Queues the job, or returns the existing one with the same id when it is not failed or canceled. */
  submit(spec: JobSpec, jobId: string, options?: SubmitOptions): Promise<{ job: JobView; created: boolean }>;
  get(jobId: string): Promise<JobView | null>;
  /** Cancels a job that has not finished; answers the job's state afterwards, null when unknown. */
  cancel(jobId: string): Promise<JobView | null>;
  /** Resolves when the job reaches a finished state (for tests and the CLI). */
  waitFor(jobId: string, timeoutMs: number): Promise<JobView>;
  /** Jobs newest first (creation time, then id), at most `filter.limit`; `tenant: null` lists every tenant's (admin). */
  list(filter: JobListFilter): Promise<JobView[]>;
  /** Cancels the job if it runs, then forgets it; false when unknown. */
  remove(jobId: string): Promise<boolean>;
  /** Jobs per state, for metrics. */
  counts(): Promise<Record<JobState, number>>;
  /** Calls `listener` whenever a job reaches a finished state (metrics); returns the unsubscribe. */
  onFinished(listener: (job: JobView, spec: JobSpec) => void): () => void;
  ready(): Promise<boolean>;
  close(): Promise<void>;
}
