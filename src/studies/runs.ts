import type { Logger } from 'pino';
import { DomainError, PROBLEMS, problemType } from '../common/errors.js';
import type { JobQueue } from '../jobs/queue.js';
import { isFinished, type JobProblem, type JobSpec, type JobView } from '../jobs/spec.js';
import type { PinnedRecipe } from '../recipes/normalize.js';
import type { SignalView } from '../signals/view.js';
import type { Store } from '../stores/store.js';
import type { Metadata, MetadataValue } from './entries.js';
import { isId, studyKey, type StudyEntry } from './study-store.js';

export type ItemStatus = 'waiting' | 'submitted' | 'succeeded' | 'failed' | 'canceled';

/** One entry of a run: the entry as it was when the run started, and its job. */
export interface RunItem {
  entryId: string;
  signal: string;
  sha256: string;
  view: SignalView | null;
  metadata: Metadata;
  jobId: string;
  recordKey: string;
  status: ItemStatus;
  /** the record existed (or was being computed) before this run asked for it */
  reused: boolean;
  resultHash: string | null;
  problem: JobProblem | null;
}

export interface Run {
  id: string;
  studyId: string;
  tenant: string;
  recipe: { id: string; hash: string; method: string };
  filter: RunFilter | null;
  retryOf: string | null;
  createdAt: string;
  canceledAt: string | null;
  finishedAt: string | null;
  items: RunItem[];
}

/** Entries whose metadata key equals the value, or one of the values of a list. */
export type RunFilter = Record<string, MetadataValue | MetadataValue[]>;

export type RunState = 'running' | 'succeeded' | 'failed' | 'canceled';

/**
 * What a run's job shows in the job list: its study, run and entry, and the entry's metadata as
 * text, so that a dashboard filters by study and shows the condition without a lookup per job. A
 * job an earlier submission created keeps its first labels.
 */
export function runLabels(run: Run, item: RunItem): Record<string, string> {
  const labels: Record<string, string> = { study: run.studyId, run: run.id, entry: item.entryId };
  for (const [key, value] of Object.entries(item.metadata).slice(0, 29)) if (!(key in labels)) labels[key] = String(value).slice(0, 256);
  return labels;
}

export function runKey(tenant: string, studyId: string, runId: string): string {
  return `${studyKey(tenant, studyId)}.${runId}`;
}

export function selectEntries(entries: StudyEntry[], filter: RunFilter | null): StudyEntry[] {
  if (!filter) return entries;
  return entries.filter((entry) =>
    Object.entries(filter).every(([key, wanted]) => {
      const value = entry.metadata[key];
      return value !== undefined && (Array.isArray(wanted) ? wanted.includes(value) : wanted === value);
    }),
  );
}

export function runState(run: Run): RunState {
  if (run.canceledAt) return 'canceled';
  if (run.items.some((i) => i.status === 'waiting' || i.status === 'submitted')) return 'running';
  return run.items.some((i) => i.status === 'failed' || i.status === 'canceled') ? 'failed' : 'succeeded';
}

const SETTLED: ReadonlySet<ItemStatus> = new Set(['succeeded', 'failed', 'canceled']);

function settle(item: RunItem, job: JobView): void {
  item.status = job.state as ItemStatus;
  item.resultHash = job.resultHash;
  item.problem = job.problem;
}

export interface RunDriverOptions {
  store: Store;
  queue: JobQueue;
  /** at most this many of one run's jobs queued or running at once */
  window: number;
  logger?: Logger;
  /** how often every active run is checked besides the queue's finished events */
  tickMs?: number;
}

/**
 * Feeds each active run's jobs to the ordinary job queue in a bounded window: at most `window` of
 * a run's jobs wait or run at once, and the next are submitted as those finish. A single job
 * submitted meanwhile waits behind at most `window` of the run's jobs, never behind the whole run;
 * two runs share the queue in turns. Runs are documents in the store; after a restart the driver
 * picks up the runs that had not finished.
 */
export function createRunDriver(options: RunDriverOptions) {
  const { store, queue, window } = options;
  const active = new Map<string, { run: Run; busy: Promise<void> | null; again: boolean }>();
  const runsOfJob = new Map<string, Set<string>>();
  const recipes = new Map<string, PinnedRecipe>();
  let closed = false;

  const unsubscribe = queue.onFinished((job) => {
    for (const key of runsOfJob.get(job.id) ?? []) kick(key);
  });
  const timer = setInterval(() => {
    for (const key of active.keys()) kick(key);
  }, options.tickMs ?? 1000);
  timer.unref();

  const persist = (run: Run) => store.putDocument('runs', runKey(run.tenant, run.studyId, run.id), JSON.stringify(run), { durable: false });

  function track(run: Run): void {
    const key = runKey(run.tenant, run.studyId, run.id);
    active.set(key, { run, busy: null, again: false });
    for (const item of run.items) {
      if (SETTLED.has(item.status)) continue;
      let keys = runsOfJob.get(item.jobId);
      if (!keys) runsOfJob.set(item.jobId, (keys = new Set()));
      keys.add(key);
    }
  }

  function untrack(key: string, run: Run): void {
    active.delete(key);
    for (const item of run.items) {
      const keys = runsOfJob.get(item.jobId);
      keys?.delete(key);
      if (keys?.size === 0) runsOfJob.delete(item.jobId);
    }
  }

  /** Steps of one run never overlap: a kick while one runs asks for one more step after it. */
  function kick(key: string): Promise<void> {
    const slot = active.get(key);
    if (!slot || closed) return Promise.resolve();
    if (slot.busy) {
      slot.again = true;
      return slot.busy;
    }
    slot.busy = (async () => {
      do {
        slot.again = false;
        try {
          await step(key, slot.run);
        } catch (error) {
          // The queue or store is unreachable: nothing is lost, the next tick tries again.
          options.logger?.warn({ err: error, runId: slot.run.id }, 'study run step failed');
          break;
        }
      } while (slot.again && !closed);
    })().finally(() => {
      slot.busy = null;
    });
    return slot.busy;
  }

  async function recipeOf(run: Run): Promise<PinnedRecipe> {
    let pinned = recipes.get(run.recipe.id);
    if (!pinned) {
      const text = await store.getDocument('recipes', run.recipe.id);
      if (text === null) throw new Error(`pinned recipe ${run.recipe.id} of run ${run.id} is missing from the store`);
      pinned = JSON.parse(text) as PinnedRecipe;
      recipes.set(run.recipe.id, pinned);
    }
    return pinned;
  }

  async function refresh(item: RunItem): Promise<void> {
    const job = await queue.get(item.jobId);
    if (job && isFinished(job.state)) settle(item, job);
    else if (!job) {
      // The job was forgotten (retention or deletion): its record says whether it had succeeded.
      const record = await store.getDocument('records', item.recordKey);
      if (record !== null) {
        item.status = 'succeeded';
        item.resultHash = (JSON.parse(record) as { resultHash?: string }).resultHash ?? null;
      } else {
        item.status = 'failed';
        item.problem = {
          type: problemType('job-not-found'),
          title: PROBLEMS['job-not-found'].title,
          status: 404,
          detail: `job ${item.jobId} of entry ${item.entryId} is no longer known and left no record`,
        };
      }
    }
  }

  async function step(key: string, run: Run): Promise<void> {
    const before = JSON.stringify(run.items);
    let inFlight = 0;
    for (const item of run.items) {
      if (item.status !== 'submitted') continue;
      await refresh(item);
      if (item.status === 'submitted') inFlight++;
    }
    if (!run.canceledAt) {
      for (const item of run.items) {
        if (inFlight >= window) break;
        if (item.status !== 'waiting') continue;
        const pinned = await recipeOf(run);
        const spec: JobSpec = {
          tenant: run.tenant,
          signalId: item.signal,
          sha256: item.sha256,
          recipeId: pinned.id,
          recipeHash: pinned.hash,
          recipe: pinned.recipe,
          recordKey: item.recordKey,
          view: item.view,
          labels: runLabels(run, item),
        };
        const { job, created } = await queue.submit(spec, item.jobId);
        item.reused = !created;
        if (isFinished(job.state)) settle(item, job);
        else {
          item.status = 'submitted';
          inFlight++;
        }
      }
    }
    const done = run.items.every((i) => SETTLED.has(i.status) || (run.canceledAt !== null && i.status === 'waiting'));
    if (done && !run.finishedAt) run.finishedAt = new Date().toISOString();
    if (done || JSON.stringify(run.items) !== before) await persist(run);
    if (done) {
      untrack(key, run);
      options.logger?.info({ runId: run.id, studyId: run.studyId, state: runState(run) }, 'study run finished');
    }
  }

  return {
    /** Stores a new run and starts feeding its jobs; answers once the first window is queued. */
    async start(run: Run): Promise<Run> {
      await store.putDocument('runs', runKey(run.tenant, run.studyId, run.id), JSON.stringify(run));
      track(run);
      await kick(runKey(run.tenant, run.studyId, run.id));
      return run;
    },

    /** Picks up the runs a previous process left unfinished. */
    async resume(): Promise<number> {
      let count = 0;
      for (const key of await store.listDocuments('runs')) {
        const text = await store.getDocument('runs', key);
        const run = text ? (JSON.parse(text) as Run) : null;
        if (!run || run.finishedAt || active.has(key)) continue;
        track(run);
        void kick(key);
        count++;
      }
      return count;
    },

    async get(tenant: string, studyId: string, runId: string): Promise<Run | null> {
      if (!isId('run', runId)) return null;
      const key = runKey(tenant, studyId, runId);
      const slot = active.get(key);
      if (slot) return slot.run;
      const text = await store.getDocument('runs', key);
      return text === null ? null : (JSON.parse(text) as Run);
    },

    async require(tenant: string, studyId: string, runId: string): Promise<Run> {
      const run = await this.get(tenant, studyId, runId);
      if (!run) throw new DomainError('run-not-found', `study ${studyId} has no run with id "${runId}"`);
      return run;
    },

    /** The study's runs oldest first. */
    async list(tenant: string, studyId: string): Promise<Run[]> {
      const prefix = `${studyKey(tenant, studyId)}.`;
      const keys = (await store.listDocuments('runs')).filter((k) => k.startsWith(prefix));
      const runs = await Promise.all(keys.map((k) => this.get(tenant, studyId, k.slice(prefix.length))));
      return runs.filter((r): r is Run => r !== null);
    },

    /**
     * Stops feeding the run and cancels its queued and running jobs. A job that another run or a
     * single submission shares is canceled too: the queue holds one job per record.
     */
    async cancel(tenant: string, studyId: string, runId: string): Promise<Run> {
      const run = await this.require(tenant, studyId, runId);
      const key = runKey(tenant, studyId, runId);
      if (run.finishedAt) throw new DomainError('run-finished', `run ${runId} already finished (${runState(run)}); start a new run, or one of its failed entries only with "retryOf"`);
      run.canceledAt = new Date().toISOString();
      await active.get(key)?.busy;
      for (const item of run.items) {
        if (item.status === 'waiting') item.status = 'canceled';
        else if (item.status === 'submitted') {
          const job = await queue.cancel(item.jobId);
          if (job && isFinished(job.state)) settle(item, job);
        }
      }
      if (run.items.every((i) => SETTLED.has(i.status))) run.finishedAt = new Date().toISOString();
      await persist(run);
      if (run.finishedAt) untrack(key, run);
      return run;
    },

    /** Forgets the run (its jobs and records stay: other runs or single jobs may share them). */
    async remove(tenant: string, studyId: string, runId: string): Promise<void> {
      const run = await this.require(tenant, studyId, runId);
      if (!run.finishedAt) await this.cancel(tenant, studyId, runId);
      const key = runKey(tenant, studyId, runId);
      untrack(key, run);
      await store.deleteDocument('runs', key);
    },

    /** Live progress of the items still in the queue (their job's state and progress). */
    async progress(run: Run): Promise<{ counts: Record<'total' | 'waiting' | 'queued' | 'running' | 'succeeded' | 'failed' | 'canceled' | 'reused', number>; fraction: number }> {
      const counts = { total: run.items.length, waiting: 0, queued: 0, running: 0, succeeded: 0, failed: 0, canceled: 0, reused: 0 };
      let fraction = 0;
      for (const item of run.items) {
        if (item.reused) counts.reused++;
        if (item.status !== 'submitted') {
          counts[item.status]++;
          if (SETTLED.has(item.status)) fraction += 1;
          continue;
        }
        const job = await queue.get(item.jobId);
        const state = job?.state ?? 'queued';
        counts[state]++;
        fraction += isFinished(state) ? 1 : (job?.progress ?? 0);
      }
      return { counts, fraction: run.items.length === 0 ? 1 : fraction / run.items.length };
    },

    async close(): Promise<void> {
      closed = true;
      clearInterval(timer);
      unsubscribe();
      await Promise.allSettled([...active.values()].map((s) => s.busy));
    },
  };
}

export type RunDriver = ReturnType<typeof createRunDriver>;
