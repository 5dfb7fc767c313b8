/**
 * One thread budget for the whole process: `threads` computing threads at most, shared by the jobs
 * computed at once (one thread each) and the helper threads a job spreads its channels over. The
 * free count lives in shared memory so that every compute thread sees the same one.
 *
 * A job always gets its own thread; helpers are taken only from free slots. So one job alone gets
 * every core and many jobs get one each. A job that starts while another job's helpers are busy
 * can run one thread over the budget until those helpers finish that job.
 */
import { availableParallelism } from 'node:os';

export interface ThreadBudget {
  /** computing threads at most */
  readonly threads: number;
  /** [0]: free slots (Int32, on a SharedArrayBuffer) */
  readonly free: Int32Array;
}

/** The default budget: one thread per CPU. */
export function defaultThreadCount(): number {
  return Math.max(1, availableParallelism());
}

export function createThreadBudget(threads = defaultThreadCount()): ThreadBudget {
  const free = new Int32Array(new SharedArrayBuffer(4));
  free[0] = Math.max(1, Math.floor(threads));
  return { threads: free[0], free };
}

/** Takes a job's own slot, even when none is free (see the module note). */
export function takeJobSlot(budget: ThreadBudget): () => void {
  Atomics.sub(budget.free, 0, 1);
  return once(() => Atomics.add(budget.free, 0, 1));
}

/** Takes up to `wanted` free slots for helpers; returns how many it got and how to give them back. */
export function takeHelperSlots(budget: ThreadBudget, wanted: number): { count: number; release: () => void } {
  for (;;) {
    const free = Atomics.load(budget.free, 0);
    const count = Math.max(0, Math.min(wanted, free));
    if (count === 0) return { count: 0, release: () => {} };
    if (Atomics.compareExchange(budget.free, 0, free, free - count) === free) return { count, release: once(() => Atomics.add(budget.free, 0, count)) };
  }
}

function once(f: () => void): () => void {
  let done = false;
  return () => {
    if (!done) {
      done = true;
      f();
    }
  };
}
