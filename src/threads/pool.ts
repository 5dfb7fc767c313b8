/**
 * The pool of job threads: each computes one job at a time, off the event loop of the process that
 * queues the jobs. Its size is the number of jobs computed at once.
 */
import { Piscina } from 'piscina';
import type { Transferable } from 'node:worker_threads';
import { poolThreadArgv, type ThreadEntry } from './entry.js';

export interface ThreadPool {
  /** jobs computed at once */
  readonly threads: number;
  run(input: unknown, options?: { transferList?: Transferable[]; signal?: AbortSignal }): Promise<unknown>;
  close(): Promise<void>;
}

/** Up to `threads` threads running the default export of `entry`, started on demand, ended after a minute idle. */
export function createThreadPool(entry: ThreadEntry, threads: number): ThreadPool {
  const pool = new Piscina({ filename: entry.url, minThreads: 1, maxThreads: threads, idleTimeout: 60_000, execArgv: poolThreadArgv(entry) });
  return {
    threads,
    run: (input, options = {}) => pool.run(input, { ...(options.transferList ? { transferList: options.transferList as never } : {}), ...(options.signal ? { signal: options.signal } : {}) }),
    close: () => pool.destroy(),
  };
}
