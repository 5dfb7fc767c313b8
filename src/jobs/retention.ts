import type { Store } from '../stores/store.js';
import type { JobQueue } from './queue.js';
import { isFinished } from './spec.js';

/** Removes a record and the attachments it names; false when there was no record. */
export async function deleteRecord(store: Store, recordKey: string): Promise<boolean> {
  const text = await store.getDocument('records', recordKey);
  if (text === null) return false;
  const { attachments = [] } = JSON.parse(text) as { attachments?: { name: string }[] };
  for (const a of attachments) await store.deleteAttachment(`${recordKey}.${a.name}`);
  return store.deleteDocument('records', recordKey);
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
      if (await queue.remove(job.id)) result.jobs++;
      if (await deleteRecord(store, job.recordKey)) result.records++;
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
