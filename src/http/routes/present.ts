import type { JobView } from '../../jobs/spec.js';

/** A job as the API shows it: without its internal record key, with the links a client follows. */
export function presentJob(job: JobView) {
  const { recordKey: _key, ...rest } = job;
  return { ...rest, links: { self: `/v1/jobs/${job.id}`, record: `/v1/jobs/${job.id}/record` } };
}
