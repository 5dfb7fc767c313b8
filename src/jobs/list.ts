import type { JobSpec, JobState, JobView } from './spec.js';

/** Where a page of the job list ends: the last job's creation time and id (the list's sort key). */
export interface JobPosition {
  createdAt: string;
  id: string;
}

/** What `JobQueue.list` selects; every field but `tenant` and `limit` is optional. */
export interface JobListFilter {
  /** null = every tenant (admin) */
  tenant: string | null;
  signal?: string;
  states?: readonly JobState[];
  method?: string;
  /** the job's `study` label */
  study?: string;
  /** ISO 8601; only jobs created strictly after it */
  createdAfter?: string;
  /** ISO 8601; only jobs created strictly before it */
  createdBefore?: string;
  /** continue after this job, newest first */
  after?: JobPosition;
  limit: number;
}

/** Newest first; the id breaks ties so that paging never skips or repeats a job. */
export function newestFirst(a: JobPosition, b: JobPosition): number {
  if (a.createdAt !== b.createdAt) return a.createdAt < b.createdAt ? 1 : -1;
  return a.id < b.id ? 1 : a.id > b.id ? -1 : 0;
}

/** The parts of the filter a queue can check on the spec alone, before it reads a job's state. */
export function specMatches(spec: JobSpec, filter: JobListFilter): boolean {
  return (
    (filter.tenant === null || spec.tenant === filter.tenant) &&
    (filter.signal === undefined || spec.signalId === filter.signal) &&
    (filter.method === undefined || spec.recipe.method === filter.method) &&
    (filter.study === undefined || spec.labels?.study === filter.study)
  );
}

/** Creation window and page position; ISO strings of one format compare as the times they name. */
export function positionMatches(position: JobPosition, filter: JobListFilter): boolean {
  return (
    (filter.createdAfter === undefined || position.createdAt > filter.createdAfter) &&
    (filter.createdBefore === undefined || position.createdAt < filter.createdBefore) &&
    (filter.after === undefined || newestFirst(filter.after, position) < 0)
  );
}

export function stateMatches(view: JobView, filter: JobListFilter): boolean {
  return filter.states === undefined || filter.states.length === 0 || filter.states.includes(view.state);
}

const CURSOR_ID = /^job_[0-9a-f]{32}$/;

/** An opaque cursor: clients pass it back unchanged, so its layout may change between versions. */
export function encodeCursor(position: JobPosition): string {
  return Buffer.from(JSON.stringify([position.createdAt, position.id])).toString('base64url');
}

/** The position a cursor names, or null when it is not one {@link encodeCursor} made. */
export function decodeCursor(cursor: string): JobPosition | null {
  try {
    const value: unknown = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8'));
    if (!Array.isArray(value) || value.length !== 2) return null;
    const [createdAt, id] = value as unknown[];
    if (typeof createdAt !== 'string' || typeof id !== 'string' || !CURSOR_ID.test(id)) return null;
    const time = Date.parse(createdAt);
    if (Number.isNaN(time) || new Date(time).toISOString() !== createdAt) return null;
    return { createdAt, id };
  } catch {
    return null;
  }
}
