import type { SignalMeta, Store } from '../stores/store.js';
import type { JobQueue } from './queue.js';
import { isFinished, type JobSpec, type JobView } from './spec.js';

/** Removes a record and the attachments it names; false when there was no record. */
export async function deleteRecord(store: Store, recordKey: string): Promise<boolean> {
  const text = await store.getDocument('records', recordKey);
  if (text === null) return false;
  const { attachments = [] } = JSON.parse(text) as { attachments?: { name: string }[] };
  for (const a of attachments) await store.deleteAttachment(`${recordKey}.${a.name}`);
  return store.deleteDocument('records', recordKey);
}

/**
 * Distributed mode with a filesystem store: remembers where a job's record will be, so that
 * stored records can still be served while Redis is down (the shared disk outlives the queue).
 */
export async function indexJob(store: Store, queue: JobQueue, jobId: string, spec: JobSpec): Promise<void> {
  if (queue.mode !== 'distributed' || store.kind !== 'filesystem') return;
  await store.putDocument('job-index', jobId, JSON.stringify({ tenant: spec.tenant, recordKey: spec.recordKey }), { durable: false });
}

/** The key of a stored record of a tenant's job found through the index, or null. */
export async function indexedRecordKey(store: Store, jobId: string, tenant: string): Promise<string | null> {
  if (!/^job_[0-9a-f]{32}$/.test(jobId)) return null;
  const text = await store.getDocument('job-index', jobId).catch(() => null);
  if (!text) return null;
  const entry = JSON.parse(text) as { tenant: string; recordKey: string };
  if (entry.tenant !== tenant) return null;
  return (await store.getDocument('records', entry.recordKey).catch(() => null)) !== null ? entry.recordKey : null;
}

/** Forgets a job, with its record and index entry; what it returns says what was there. */
export async function forgetJob(store: Store, queue: JobQueue, job: JobView): Promise<{ job: boolean; record: boolean }> {
  const removed = await queue.remove(job.id);
  const record = await deleteRecord(store, job.recordKey);
  await store.deleteDocument('job-index', job.id).catch(() => false);
  return { job: removed, record };
}

/** Deletes a signal with every job that uses it and their records; answers how many jobs went. */
export async function deleteSignalCascade(store: Store, queue: JobQueue, meta: SignalMeta): Promise<number> {
  const jobs = await queue.list({ tenant: meta.tenant, signal: meta.id, limit: Number.MAX_SAFE_INTEGER });
  for (const job of jobs) await forgetJob(store, queue, job);
  await store.deleteSignal(meta.id);
  return jobs.length;
}

export interface SweepResult {
  jobs: number;
  records: number;
  signals: number;
}

/**
 * Removes finished jobs (and their records) and signals older than `maxAgeMs`. A signal that an
 * unfinished job still needs is kept, whatever its age; records are removed with their job so a
 * listed job never points at a missing record.
 */
export async function sweepExpired(store: Store, queue: JobQueue, maxAgeMs: number, now = Date.now()): Promise<SweepResult> {
  const cutoff = now - maxAgeMs;
  const result: SweepResult = { jobs: 0, records: 0, signals: 0 };
  const jobs = await queue.list({ tenant: null, limit: Number.MAX_SAFE_INTEGER });
  const needed = new Set<string>();
  for (const job of jobs) {
    const finishedAt = job.finishedAt ? Date.parse(job.finishedAt) : Number.NaN;
    if (isFinished(job.state) && finishedAt < cutoff) {
      const forgotten = await forgetJob(store, queue, job);
      if (forgotten.job) result.jobs++;
      if (forgotten.record) result.records++;
    } else {
      needed.add(job.signal);
    }
  }
  for (const id of await store.listSignals()) {
    if (needed.has(id)) continue;
    const meta = await store.getSignalMeta(id);
    if (meta && Date.parse(meta.storedAt) < cutoff && (await store.deleteSignal(id))) result.signals++;
  }
  return result;
}
