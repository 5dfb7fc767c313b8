import type { JobQueue } from './queue.js';
import { isFinished, type JobView } from './spec.js';

/** Polls until the job finishes; adapters may answer faster, this is the common fallback. */
export async function waitForJob(queue: Pick<JobQueue, 'get'>, jobId: string, timeoutMs: number, intervalMs = 10): Promise<JobView> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const job = await queue.get(jobId);
    if (!job) throw new Error(`job ${jobId} is unknown`);
    if (isFinished(job.state)) return job;
    if (Date.now() > deadline) throw new Error(`job ${jobId} did not finish within ${timeoutMs} ms (state ${job.state})`);
    await new Promise((r) => setTimeout(r, Math.min(intervalMs * 2, 100)));
    intervalMs *= 2;
  }
}

/**
 * The job once it finishes, or its state when `timeoutMs` passes or `signal` aborts first; null
 * when the queue does not know it. Woken by the queue's finished notification rather than by
 * polling, so a small job is answered as soon as its state is set.
 *
 * @param timeoutMs - longest wait, in milliseconds
 */
export async function settledJob(queue: Pick<JobQueue, 'get' | 'onFinished'>, jobId: string, timeoutMs: number, signal?: AbortSignal): Promise<JobView | null> {
  let wake = (_job: JobView | null) => {};
  const woken = new Promise<JobView | null>((resolve) => (wake = resolve));
  // Listen before reading the state, so that a job finishing in between is not missed.
  const unsubscribe = queue.onFinished((job) => {
    if (job.id === jobId) wake(job);
  });
  const timer = setTimeout(() => wake(null), timeoutMs);
  const onAbort = () => wake(null);
  signal?.addEventListener('abort', onAbort, { once: true });
  try {
    const current = await queue.get(jobId);
    if (!current || isFinished(current.state) || timeoutMs <= 0 || signal?.aborted) return current;
    return (await woken) ?? (await queue.get(jobId));
  } finally {
    clearTimeout(timer);
    signal?.removeEventListener('abort', onAbort);
    unsubscribe();
  }
}
