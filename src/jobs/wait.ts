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
