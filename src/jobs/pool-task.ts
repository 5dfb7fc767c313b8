import type { MessagePort } from 'node:worker_threads';
import type { Signal } from '../signals/signal.js';
import { takeJobSlot, type ThreadBudget } from '../threads/budget.js';
import { createChannelRunner } from '../threads/channel-runner.js';
import { createStore } from '../stores/create-store.js';
import type { Store, StoreConfig } from '../stores/store.js';
import { refusalOf } from './failure.js';
import { runJob, type JobOutcome } from './run-job.js';
import type { JobProblem, JobSpec, RunMode } from './spec.js';

/** Input of one worker-thread task. Progress goes back over `port`. */
export interface PoolTaskInput {
  spec: JobSpec;
  store: StoreConfig;
  mode: RunMode;
  /** threads the job may spread its channels over, its own included */
  jobThreads: number;
  /** the process's thread budget (shared memory): helpers take only free slots */
  budget: ThreadBudget;
  /** absent for a job too small to report progress (QUIET_JOB_WORK) */
  port?: MessagePort;
  /** the job's signal, copied in with the task, when the queue still held the upload in memory */
  signal?: Signal;
}

export type PoolTaskOutput = { ok: true; outcome: JobOutcome } | { ok: false; problem: JobProblem };

const stores = new Map<string, Store>();

function storeFor(config: StoreConfig): Store {
  const key = JSON.stringify(config);
  let store = stores.get(key);
  if (!store) {
    store = createStore(config);
    stores.set(key, store);
  }
  return store;
}

/** Progress is sent at most every 1 % so that many-channel jobs do not flood the port. */
export default async function poolTask({ spec, store, mode, jobThreads, budget, port, signal }: PoolTaskInput): Promise<PoolTaskOutput> {
  let sent = -1;
  const release = takeJobSlot(budget);
  try {
    const outcome = await runJob(
      spec,
      storeFor(store),
      mode,
      (fraction) => {
        const step = Math.floor(fraction * 100);
        if (step > sent) {
          sent = step;
          port?.postMessage(fraction);
        }
      },
      { channels: createChannelRunner({ threads: jobThreads, budget }), ...(signal ? { signal } : {}) },
    );
    return { ok: true, outcome };
  } catch (error) {
    const problem = refusalOf(error);
    if (problem) return { ok: false, problem };
    throw error;
  } finally {
    release();
    port?.close();
  }
}
