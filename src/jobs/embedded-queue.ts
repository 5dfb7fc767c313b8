import { DomainError, toProblem } from '../common/errors.js';
import type { Signal } from '../signals/signal.js';
import type { Store, StoreConfig } from '../stores/store.js';
import type { ComputePool } from './compute-pool.js';
import { crashProblem } from './failure.js';
import { newestFirst, positionMatches, specMatches, stateMatches, type JobListFilter } from './list.js';
import type { JobQueue, SubmitOptions } from './queue.js';
import { isFinished, newJobView, type JobSpec, type JobState, type JobView } from './spec.js';
import { waitForJob } from './wait.js';

interface Entry {
  view: JobView;
  spec: JobSpec;
  abort: AbortController | null;
  /** starts that a graceful shutdown interrupted: they do not count against the attempts */
  shutdowns: number;
  /** times the process died while the job ran */
  crashes: number;
  /** true while the last persisted 'running' state was written by close() */
  stopped: boolean;
  /** the uploaded signal, held until the job's first start hands it to the thread */
  signal: Signal | null;
}

/**
 * Upper bound of the uploaded samples held in memory for jobs not yet started. Beyond it a job's
 * thread reads its signal back from the store, as after a restart or a retry.
 */
export const HANDOFF_BYTES = 64 * 1024 * 1024;

/** A job's document in the store. */
interface StoredJob {
  view: JobView;
  spec: JobSpec;
  shutdowns?: number;
  crashes?: number;
  stopped?: boolean;
}

export interface EmbeddedQueueOptions {
  store: Store;
  storeConfig: StoreConfig;
  pool: ComputePool;
  /** jobs computed at once; default: the pool's thread count */
  concurrency?: number;
  /** attempts for faults outside the input (a crashed thread); bad input is never retried */
  maxAttempts?: number;
  onError?: (error: unknown, jobId: string) => void;
}

/**
 * The in-process queue of embedded mode: FIFO, computed on the worker-thread pool. Job state is
 * written to the store on every transition, so queued and interrupted jobs resume after a restart.
 */
export class EmbeddedQueue implements JobQueue {
  readonly mode = 'embedded' as const;
  private readonly entries = new Map<string, Entry>();
  private readonly pending: string[] = [];
  private running = 0;
  private closed = false;
  private readonly concurrency: number;
  private readonly finishedListeners = new Set<(job: JobView, spec: JobSpec) => void>();
  private readonly maxAttempts: number;
  /** job-state writes not yet finished; close() waits for them */
  private readonly writes = new Set<Promise<void>>();
  /** bytes of the signals held by entries (`Entry.signal`) */
  private heldBytes = 0;

  private constructor(private readonly options: EmbeddedQueueOptions) {
    this.concurrency = options.concurrency ?? options.pool.threads;
    this.maxAttempts = options.maxAttempts ?? 3;
  }

  static async open(options: EmbeddedQueueOptions): Promise<EmbeddedQueue> {
    const queue = new EmbeddedQueue(options);
    await queue.restore();
    return queue;
  }

  /**
   * Reloads every job. A job found `running` that close() did not stop was running when the process
   * died: that start is spent, and a job that has spent its attempts this way fails instead of
   * taking the process down again.
   */
  private async restore(): Promise<void> {
    const failed: Entry[] = [];
    for (const id of await this.options.store.listDocuments('jobs')) {
      const text = await this.options.store.getDocument('jobs', id);
      if (!text) continue;
      const { view, spec, shutdowns = 0, crashes = 0, stopped = false } = JSON.parse(text) as StoredJob;
      // Jobs stored before views carried method and labels.
      view.method ??= spec.recipe.method;
      view.labels ??= { ...spec.labels };
      const entry: Entry = { view, spec, abort: null, shutdowns, crashes, stopped, signal: null };
      this.entries.set(view.id, entry);
      if (isFinished(view.state)) continue;
      if (view.state === 'running' && !stopped) {
        entry.crashes++;
        if (this.attemptsUsed(entry) >= this.maxAttempts) {
          view.problem = toProblem(
            new DomainError('worker-crashed', `the job took the process down ${entry.crashes} time(s) and has used its ${this.maxAttempts} attempt(s) (JOB_ATTEMPTS); it is not started again`),
          ).problem;
          failed.push(entry);
          continue;
        }
      }
      view.state = 'queued';
      view.progress = 0;
      this.pending.push(view.id);
    }
    for (const entry of failed) await this.finish(entry, 'failed');
    this.pump();
  }

  private attemptsUsed(entry: Entry): number {
    return entry.view.attempts - entry.shutdowns;
  }

  /**
   * A job that finds a free thread starts computing at once, while one flushed write accepts it and
   * counts its start; it cannot finish before that write has landed, and it is abandoned (never
   * finished or persisted again) when the write fails. `options.signal` is held, within
   * `HANDOFF_BYTES`, until the job's first start copies it to the thread.
   */
  async submit(spec: JobSpec, jobId: string, options: SubmitOptions = {}): Promise<{ job: JobView; created: boolean }> {
    const existing = this.entries.get(jobId);
    if (existing && existing.view.state !== 'failed' && existing.view.state !== 'canceled') {
      return { job: { ...existing.view }, created: false };
    }
    const view = newJobView(jobId, spec, new Date().toISOString());
    const entry: Entry = { view, spec, abort: null, shutdowns: 0, crashes: 0, stopped: false, signal: null };
    this.hold(entry, options.signal);
    this.entries.set(jobId, entry);
    const abandon = () => {
      this.release(entry);
      if (this.entries.get(jobId) !== entry) return;
      if (existing) this.entries.set(jobId, existing);
      else this.entries.delete(jobId);
    };
    if (!this.closed && this.running < this.concurrency && this.pending.length === 0) {
      this.begin(entry);
      const accepted = this.persist(entry, true);
      this.launch(entry, accepted);
      try {
        await accepted;
      } catch (error) {
        entry.abort?.abort();
        abandon();
        throw error;
      }
      return { job: { ...view }, created: true };
    }
    try {
      await this.persist(entry);
    } catch (error) {
      abandon();
      throw error;
    }
    this.pending.push(jobId);
    this.pump();
    return { job: { ...view }, created: true };
  }

  private hold(entry: Entry, signal: Signal | undefined): void {
    if (!signal || this.heldBytes + signal.data.byteLength > HANDOFF_BYTES) return;
    entry.signal = signal;
    this.heldBytes += signal.data.byteLength;
  }

  private release(entry: Entry): Signal | null {
    const { signal } = entry;
    if (signal) this.heldBytes -= signal.data.byteLength;
    entry.signal = null;
    return signal;
  }

  async get(jobId: string): Promise<JobView | null> {
    const entry = this.entries.get(jobId);
    return entry ? { ...entry.view } : null;
  }

  async cancel(jobId: string): Promise<JobView | null> {
    const entry = this.entries.get(jobId);
    if (!entry) return null;
    if (entry.view.state === 'queued') {
      this.pending.splice(this.pending.indexOf(jobId), 1);
      await this.finish(entry, 'canceled');
    } else if (entry.view.state === 'running') {
      entry.abort?.abort();
      await waitForJob(this, jobId, 10_000).catch(() => undefined);
    }
    return { ...entry.view };
  }

  async list(filter: JobListFilter): Promise<JobView[]> {
    return [...this.entries.values()]
      .filter(({ view, spec }) => specMatches(spec, filter) && positionMatches(view, filter) && stateMatches(view, filter))
      .map((e) => e.view)
      .sort(newestFirst)
      .slice(0, filter.limit)
      .map((v) => ({ ...v }));
  }

  async remove(jobId: string): Promise<boolean> {
    const entry = this.entries.get(jobId);
    if (!entry) return false;
    if (!isFinished(entry.view.state)) await this.cancel(jobId);
    this.entries.delete(jobId);
    await this.options.store.deleteDocument('jobs', jobId);
    return true;
  }

  onFinished(listener: (job: JobView, spec: JobSpec) => void): () => void {
    this.finishedListeners.add(listener);
    return () => this.finishedListeners.delete(listener);
  }

  async counts(): Promise<Record<JobState, number>> {
    const counts: Record<JobState, number> = { queued: 0, running: 0, succeeded: 0, failed: 0, canceled: 0 };
    for (const { view } of this.entries.values()) counts[view.state]++;
    return counts;
  }

  waitFor(jobId: string, timeoutMs: number): Promise<JobView> {
    return waitForJob(this, jobId, timeoutMs);
  }

  async ready(): Promise<boolean> {
    return !this.closed && (await this.options.store.ping());
  }

  /**
   * Stops taking work, abandons running computations (they resume on restart) and waits for the
   * job-state writes already under way, so that a restart reads the last state the process gave a
   * job (a fault test once found an interrupted job resumed with its attempt not counted). Then it
   * marks each interrupted job as stopped on purpose, after those writes so that none overwrites
   * the mark: a restart does not count a shutdown as a crash.
   */
  async close(): Promise<void> {
    this.closed = true;
    const interrupted = [...this.entries.values()].filter((e) => e.abort !== null);
    for (const entry of interrupted) entry.abort?.abort();
    await Promise.allSettled([...this.writes]);
    const marks = interrupted
      .filter((e) => e.view.state === 'running')
      .map((entry) => {
        entry.shutdowns++;
        entry.stopped = true;
        return this.persist(entry);
      });
    await Promise.allSettled(marks);
  }

  private pump(): void {
    while (!this.closed && this.running < this.concurrency && this.pending.length > 0) {
      const id = this.pending.shift()!;
      const entry = this.entries.get(id);
      if (entry?.view.state !== 'queued') continue;
      this.begin(entry);
      this.launch(entry, null);
    }
  }

  /** Takes a thread slot and marks the attempt started, in memory. */
  private begin(entry: Entry): void {
    this.running++;
    const { view } = entry;
    view.state = 'running';
    view.startedAt = new Date().toISOString();
    view.attempts++;
    entry.stopped = false;
    entry.abort = new AbortController();
  }

  /** `accepted`: the flushed write of the job's acceptance and start, still under way, or null. */
  private launch(entry: Entry, accepted: Promise<void> | null): void {
    void this.execute(entry, accepted).finally(() => {
      this.running--;
      this.pump();
    });
  }

  private async execute(entry: Entry, accepted: Promise<void> | null): Promise<void> {
    const { view } = entry;
    const abort = entry.abort!;
    // A queued job's start is written before the computation begins, so that a restart counts it if
    // the computation takes the process down. Not flushed: a process that dies leaves its written
    // files to the kernel, and only a power loss could drop the mark (the job then runs once more).
    // A job accepted and started at once computes while that write is under way: until it lands the
    // job is not accepted, and a process that dies leaves nothing a client was told of.
    if (!accepted) await this.persist(entry, false);
    try {
      // Closed or canceled while the start was being written.
      abort.signal.throwIfAborted();
      const samples = this.release(entry) ?? undefined;
      const computing = this.options.pool.run(entry.spec, this.options.storeConfig, 'embedded', (f) => (view.progress = f), abort.signal, samples);
      if (accepted) {
        // It may reject (aborted) while the acceptance is still being written: handled below, not unhandled.
        computing.catch(() => undefined);
        try {
          await accepted;
        } catch {
          // Never accepted: submit answers the write's error, and nothing more is written for it.
          abort.abort();
          await computing.catch(() => undefined);
          return;
        }
      }
      const output = await computing;
      if (output.ok) {
        view.resultHash = output.outcome.resultHash;
        view.progress = 1;
        await this.finish(entry, 'succeeded');
      } else {
        view.problem = output.problem;
        await this.finish(entry, 'failed');
      }
    } catch (error) {
      if (abort.signal.aborted) {
        if (this.closed) return; // shutting down: the job stays running on disk and resumes on restart
        await this.finish(entry, 'canceled');
        return;
      }
      this.options.onError?.(error, view.id);
      if (this.attemptsUsed(entry) < this.maxAttempts) {
        view.state = 'queued';
        view.progress = 0;
        await this.persist(entry);
        this.pending.push(view.id);
      } else {
        view.problem = crashProblem(view.attempts, error);
        await this.finish(entry, 'failed');
      }
    } finally {
      entry.abort = null;
    }
  }

  private async finish(entry: Entry, state: 'succeeded' | 'failed' | 'canceled'): Promise<void> {
    this.release(entry);
    entry.view.state = state;
    entry.view.finishedAt = new Date().toISOString();
    // Listeners first: a poller can see the finished state as soon as it is set in memory.
    for (const listener of this.finishedListeners) listener({ ...entry.view }, entry.spec);
    await this.persist(entry);
  }

  /**
   * Acceptance (queued) and shutdown marks are flushed to disk; the start of an attempt and the
   * finished state need not be: if a power loss drops the finished state, the job runs again on
   * restart and finds its durable record at once. A flush costs a small job several milliseconds.
   */
  private persist(entry: Entry, durable = entry.view.state === 'queued' || entry.view.state === 'running'): Promise<void> {
    const { view } = entry;
    const stored: StoredJob = { view, spec: entry.spec, shutdowns: entry.shutdowns, crashes: entry.crashes, stopped: entry.stopped };
    const write = this.options.store.putDocument('jobs', view.id, JSON.stringify(stored), { durable });
    const tracked = write
      .then(
        () => undefined,
        () => undefined,
      )
      .finally(() => this.writes.delete(tracked));
    this.writes.add(tracked);
    return write;
  }
}
