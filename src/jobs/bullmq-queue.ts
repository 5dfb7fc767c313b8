import { Queue, QueueEvents, type Job } from 'bullmq';
import { Redis } from 'ioredis';
import { crashProblem } from './failure.js';
import type { JobOutcome } from './run-job.js';
import { newestFirst, positionMatches, specMatches, stateMatches, type JobListFilter, type JobPosition } from './list.js';
import type { JobQueue } from './queue.js';
import { newJobView, type JobProblem, type JobSpec, type JobState, type JobView } from './spec.js';
import { waitForJob } from './wait.js';

export interface BullQueueOptions {
  url: string;
  /** BullMQ key prefix (never an ioredis keyPrefix) */
  prefix: string;
  queueName: string;
  /** attempts for transient faults; bad input fails at once (UnrecoverableError in the worker) */
  attempts?: number;
  /** first retry delay, doubled on every further attempt */
  backoffMs?: number;
}

/**
 * How a job that will not be retried ended, written by the worker into the job's data before it
 * fails the job: structured data, so that no one parses a failure message.
 */
export type JobEnding = { kind: 'refused'; problem: JobProblem } | { kind: 'canceled' };

/** A job's data in Redis: the spec, and once a worker ended it without success, how. */
export type QueuedJobData = JobSpec & { ending?: JobEnding };

/** Redis key a worker watches to abandon a running job. */
export function cancelKey(prefix: string, queueName: string, jobId: string): string {
  return `${prefix}:${queueName}:rhythmetric-cancel:${jobId}`;
}

/**
 * The distributed adapter: jobs go to a BullMQ queue, `rhythmetric worker` processes consume them.
 * Submissions and cancels fail fast while the connection is down, so that a Redis outage answers
 * 503 instead of hanging requests (BullMQ itself needs ioredis's offline queue while it connects).
 */
export class BullQueue implements JobQueue {
  readonly mode = 'distributed' as const;
  readonly queue: Queue;
  private readonly connection: Redis;
  private events: QueueEvents | null = null;
  private eventsConnection: Redis | null = null;
  private readonly finishedListeners = new Set<(job: JobView, spec: JobSpec) => void>();

  constructor(private readonly options: BullQueueOptions) {
    this.connection = new Redis(options.url, { maxRetriesPerRequest: 1 });
    this.connection.on('error', () => {
      // Surfaces through failing commands and /readyz.
    });
    this.queue = new Queue(options.queueName, { connection: this.connection, prefix: options.prefix, skipWaitingForReady: true });
    this.queue.on('error', () => {});
  }

  /**
   * Waits (bounded) for the first connection. The API starts even when Redis is down: submissions
   * answer 503 and /readyz reports it until Redis is back.
   */
  async connected(timeoutMs = 5000): Promise<boolean> {
    if (this.connection.status === 'ready') return true;
    return new Promise((resolve) => {
      const timer = setTimeout(() => {
        this.connection.off('ready', onReady);
        resolve(false);
      }, timeoutMs);
      const onReady = () => {
        clearTimeout(timer);
        resolve(true);
      };
      this.connection.once('ready', onReady);
    });
  }

  private ensureUp(): void {
    if (this.connection.status !== 'ready') throw new Error(`Redis connection is ${this.connection.status}`);
  }

  async submit(spec: JobSpec, jobId: string): Promise<{ job: JobView; created: boolean }> {
    this.ensureUp();
    const existing = await this.queue.getJob(jobId);
    if (existing) {
      const view = await this.view(existing);
      if (view.state !== 'failed' && view.state !== 'canceled') return { job: view, created: false };
      await existing.remove();
    }
    await this.connection.del(cancelKey(this.options.prefix, this.options.queueName, jobId), this.tombstoneKey(jobId));
    const job = await this.queue.add('analyze', spec, {
      jobId,
      attempts: this.options.attempts ?? 3,
      backoff: { type: 'exponential', delay: this.options.backoffMs ?? 1000 },
      removeOnComplete: { age: 30 * 24 * 3600 },
      removeOnFail: { age: 30 * 24 * 3600 },
    });
    return { job: await this.view(job), created: true };
  }

  async get(jobId: string): Promise<JobView | null> {
    const job = await this.queue.getJob(jobId);
    if (job) return this.view(job);
    const tombstone = await this.connection.get(this.tombstoneKey(jobId));
    // Tombstones written before views carried method and labels lack them.
    if (!tombstone) return null;
    const view = JSON.parse(tombstone) as Partial<JobView> & Omit<JobView, 'method' | 'labels'>;
    return { ...view, method: view.method ?? 'unknown', labels: view.labels ?? {} };
  }

  async cancel(jobId: string): Promise<JobView | null> {
    this.ensureUp();
    const job = await this.queue.getJob(jobId);
    if (!job) return null;
    const state = await job.getState();
    if (state === 'waiting' || state === 'delayed' || state === 'prioritized') {
      // A job that never started leaves the queue; a tombstone keeps its canceled state visible.
      const view = this.canceledView(job);
      await job.remove();
      await this.connection.set(this.tombstoneKey(jobId), JSON.stringify(view), 'EX', 30 * 24 * 3600);
      return view;
    }
    if (state === 'active') {
      await this.connection.set(cancelKey(this.options.prefix, this.options.queueName, jobId), '1', 'EX', 3600);
      return waitForJob(this, jobId, 15_000).catch(async () => (await this.get(jobId))!);
    }
    return this.view(job);
  }

  async list(filter: JobListFilter): Promise<JobView[]> {
    this.ensureUp();
    // Scans at most 10 000 recent jobs of the asked states; enough for a lab's dashboard, bounded for Redis.
    const jobs = await this.queue.getJobs(bullTypesOf(filter.states), 0, 9999);
    const seen = new Set<string>();
    // A job moving between BullMQ states while they are read can be returned twice.
    const candidates = jobs
      .filter((j) => j.id !== undefined && !seen.has(j.id) && seen.add(j.id) && specMatches(j.data as JobSpec, filter) && positionMatches(positionOf(j), filter))
      .sort((a, b) => newestFirst(positionOf(a), positionOf(b)));
    // A job's state costs a round trip: read them in small batches until the page is full.
    const views: JobView[] = [];
    for (let at = 0; at < candidates.length && views.length < filter.limit; at += LIST_BATCH) {
      const batch = await Promise.all(candidates.slice(at, at + LIST_BATCH).map((j) => this.view(j)));
      views.push(...batch.filter((v) => stateMatches(v, filter)));
    }
    return views.slice(0, filter.limit);
  }

  async remove(jobId: string): Promise<boolean> {
    this.ensureUp();
    const job = await this.queue.getJob(jobId);
    if (!job) return (await this.connection.del(this.tombstoneKey(jobId))) > 0;
    if ((await job.getState()) === 'active') await this.cancel(jobId);
    await job.remove().catch(() => undefined);
    await this.connection.del(this.tombstoneKey(jobId));
    return true;
  }

  onFinished(listener: (job: JobView, spec: JobSpec) => void): () => void {
    if (!this.events) {
      this.eventsConnection = new Redis(this.options.url, { maxRetriesPerRequest: null });
      this.eventsConnection.on('error', () => {});
      this.events = new QueueEvents(this.options.queueName, { connection: this.eventsConnection, prefix: this.options.prefix });
      this.events.on('error', () => {});
      const notify = async (jobId: string) => {
        const job = await this.queue.getJob(jobId).catch(() => undefined);
        if (!job) return;
        const view = await this.view(job);
        for (const l of this.finishedListeners) l(view, job.data as JobSpec);
      };
      this.events.on('completed', ({ jobId }) => void notify(jobId));
      this.events.on('failed', ({ jobId }) => void notify(jobId));
    }
    this.finishedListeners.add(listener);
    return () => this.finishedListeners.delete(listener);
  }

  async counts(): Promise<Record<JobState, number>> {
    const c = await this.queue.getJobCounts('waiting', 'delayed', 'prioritized', 'active', 'completed', 'failed');
    return { queued: (c.waiting ?? 0) + (c.delayed ?? 0) + (c.prioritized ?? 0), running: c.active ?? 0, succeeded: c.completed ?? 0, failed: c.failed ?? 0, canceled: 0 };
  }

  waitFor(jobId: string, timeoutMs: number): Promise<JobView> {
    return waitForJob(this, jobId, timeoutMs);
  }

  async ready(): Promise<boolean> {
    try {
      return (await this.connection.ping()) === 'PONG';
    } catch {
      return false;
    }
  }

  /** Bounded: with Redis down, QUIT and BullMQ's close would wait for a reconnection that may never come. */
  async close(): Promise<void> {
    const bounded = (p: Promise<unknown>) => Promise.race([p.catch(() => undefined), new Promise((r) => setTimeout(r, 2000).unref())]);
    const up = this.connection.status === 'ready';
    await bounded(this.events?.close() ?? Promise.resolve());
    this.eventsConnection?.disconnect();
    await bounded(this.queue.close());
    if (up) await bounded(this.connection.quit());
    this.connection.disconnect();
  }

  private tombstoneKey(jobId: string): string {
    return `${this.options.prefix}:${this.options.queueName}:rhythmetric-canceled:${jobId}`;
  }

  private canceledView(job: Job): JobView {
    const spec = job.data as JobSpec;
    return {
      ...baseView(job, spec),
      state: 'canceled',
      finishedAt: new Date().toISOString(),
    };
  }

  private async view(stale: Job): Promise<JobView> {
    const raw = await stale.getState();
    // getJob and getState are two round trips: a job that finished in between must be read again.
    const job = (raw === 'completed' || raw === 'failed') && !stale.finishedOn ? ((await this.queue.getJob(stale.id!)) ?? stale) : stale;
    const spec = job.data as JobSpec;
    let state: JobState;
    let problem: JobProblem | null = null;
    switch (raw) {
      case 'active':
        state = 'running';
        break;
      case 'completed':
        state = 'succeeded';
        break;
      case 'failed': {
        const ending = (job.data as QueuedJobData).ending;
        state = ending?.kind === 'canceled' ? 'canceled' : 'failed';
        if (ending?.kind === 'refused') problem = ending.problem;
        else if (state === 'failed') problem = crashProblem(job.attemptsMade, job.failedReason ?? 'unknown failure');
        break;
      }
      default:
        state = 'queued';
    }
    const outcome = job.returnvalue as JobOutcome | null | undefined;
    return {
      ...baseView(job, spec),
      state,
      progress: state === 'succeeded' ? 1 : typeof job.progress === 'number' ? job.progress : 0,
      resultHash: outcome?.resultHash ?? null,
      finishedAt: job.finishedOn ? new Date(job.finishedOn).toISOString() : null,
      problem,
    };
  }
}

const LIST_BATCH = 50;

type BullType = 'active' | 'waiting' | 'delayed' | 'prioritized' | 'completed' | 'failed';

/** The BullMQ states that can hold jobs in the given states (canceled jobs are failed ones, marked). */
function bullTypesOf(states: readonly JobState[] | undefined): BullType[] {
  const all: BullType[] = ['active', 'waiting', 'delayed', 'prioritized', 'completed', 'failed'];
  if (!states || states.length === 0) return all;
  const map: Record<JobState, BullType[]> = { queued: ['waiting', 'delayed', 'prioritized'], running: ['active'], succeeded: ['completed'], failed: ['failed'], canceled: ['failed'] };
  return all.filter((t) => states.some((s) => map[s].includes(t)));
}

function positionOf(job: Job): JobPosition {
  return { createdAt: new Date(job.timestamp).toISOString(), id: job.id! };
}

function baseView(job: Job, spec: JobSpec): JobView {
  return {
    ...newJobView(job.id!, spec, new Date(job.timestamp).toISOString()),
    attempts: job.attemptsMade,
    startedAt: job.processedOn ? new Date(job.processedOn).toISOString() : null,
  };
}
