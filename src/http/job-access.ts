import type { JobView } from '../jobs/spec.js';
import type { JobQueue } from '../jobs/queue.js';
import type { FeatureRecord } from '../engine/record.js';
import type { Store } from '../stores/store.js';
import { ProblemError } from './problem.js';

/** A queue fault becomes 503 with Retry-After, never a 500 that hides a transient outage. */
export function unavailable(error: unknown, what = 'try again shortly'): ProblemError {
  const reason = error instanceof Error ? error.message : String(error);
  return new ProblemError('queue-unavailable', `the job queue cannot be reached (${reason}); ${what}`, null, { 'retry-after': '5' });
}

/** The tenant's job; another tenant's job answers exactly like a missing one. */
export async function requireJob(queue: JobQueue, id: string, tenant: string): Promise<JobView> {
  let job: JobView | null = null;
  if (/^job_[0-9a-f]{32}$/.test(id)) {
    try {
      job = await queue.get(id);
    } catch (error) {
      throw unavailable(error);
    }
  }
  if (!job || job.tenant !== tenant) throw new ProblemError('job-not-found', `no job with id "${id}"`);
  return job;
}

/** The record of the tenant's succeeded job and its store key (attachments sit beside it); 409 while the job has not succeeded. */
export async function requireStoredRecord(queue: JobQueue, store: Store, id: string, tenant: string, what: string): Promise<{ record: FeatureRecord; recordKey: string }> {
  const job = await requireJob(queue, id, tenant);
  if (job.state !== 'succeeded') {
    throw new ProblemError('record-not-ready', `job ${job.id} is ${job.state}${job.problem ? `: ${job.problem.detail}` : ''}; ${what} once it has succeeded`);
  }
  const text = await store.getDocument('records', job.recordKey);
  if (text === null) throw new ProblemError('internal', `the record of job ${id} is missing from the store`);
  return { record: JSON.parse(text) as FeatureRecord, recordKey: job.recordKey };
}

/** The record of the tenant's succeeded job; 409 while the job has not succeeded. */
export async function requireRecord(queue: JobQueue, store: Store, id: string, tenant: string, what: string): Promise<FeatureRecord> {
  return (await requireStoredRecord(queue, store, id, tenant, what)).record;
}
