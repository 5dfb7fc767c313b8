import { availableParallelism } from 'node:os';
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { StoreConfig } from '../stores/store.js';
import type { PoolTaskInput, PoolTaskOutput } from './pool-task.js';
import type { JobSpec, RunMode } from './spec.js';

export interface ComputePool {
  readonly threads: number;
  run(spec: JobSpec, store: StoreConfig, mode: RunMode, onProgress: (fraction: number) => void, signal?: AbortSignal): Promise<PoolTaskOutput>;
  close(): Promise<void>;
}

/**
 * Worker threads that run the spectral work off the event loop. From the TypeScript sources (tsx,
 * vitest) the threads load the `.ts` task through tsx; from `dist/` they load the compiled `.js`.
 *
 * @param threads - jobs computed at once
 * @param jobThreads - threads one time–frequency job may spread its channels over, its own
 *   included (helper threads it starts on demand); 1 keeps every job on its pool thread
 */
export function createComputePool(threads = Math.max(1, availableParallelism()), jobThreads = 1): ComputePool {
  const fromSource = import.meta.url.endsWith('.ts');
  const pool = new Piscina({
    filename: new URL(fromSource ? './pool-task.ts' : './pool-task.js', import.meta.url).href,
    minThreads: 1,
    maxThreads: threads,
    idleTimeout: 60_000,
    // tsx by its resolved URL: a bare 'tsx' would be looked up from the working directory, which
    // for the command line is wherever the user's files are.
    execArgv: fromSource ? ['--import', import.meta.resolve('tsx')] : [],
  });
  return {
    threads,
    async run(spec, store, mode, onProgress, signal) {
      const { port1, port2 } = new MessageChannel();
      port1.on('message', (fraction: number) => onProgress(fraction));
      try {
        const input: PoolTaskInput = { spec, store, mode, jobThreads, port: port2 };
        return (await pool.run(input, { transferList: [port2], ...(signal ? { signal } : {}) })) as PoolTaskOutput;
      } finally {
        port1.close();
      }
    },
    close: () => pool.destroy(),
  };
}
