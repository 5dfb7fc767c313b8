import type { FastifyInstance } from 'fastify';
import { Counter, Gauge, Histogram, Registry, collectDefaultMetrics } from 'prom-client';
import type { JobQueue } from '../jobs/queue.js';
import { JOB_STATES } from '../jobs/spec.js';
import type { Store } from '../stores/store.js';

export interface Metrics {
  registry: Registry;
  jobSubmitted(method: string, created: boolean): void;
  close(): void;
}

/**
 * Prometheus metrics on a registry of this app's own (tests build several apps in one process).
 * Job counts, queue depth and stored bytes are read from the queue and the store at scrape time,
 * so they are right in every mode and after restarts.
 */
export function createMetrics(app: FastifyInstance, queue: JobQueue, store: Store): Metrics {
  const registry = new Registry();
  collectDefaultMetrics({ register: registry, prefix: 'rhythmetric_process_' });
  const http = new Histogram({
    name: 'rhythmetric_http_request_duration_seconds',
    help: 'HTTP request latency by route and status',
    labelNames: ['method', 'route', 'status'],
    buckets: [0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 10],
    registers: [registry],
  });
  const submitted = new Counter({
    name: 'rhythmetric_jobs_submitted_total',
    help: 'Job submissions by method, and whether a new job was created',
    labelNames: ['method', 'created'],
    registers: [registry],
  });
  const duration = new Histogram({
    name: 'rhythmetric_job_duration_seconds',
    help: 'Time from start to finish of jobs, by method and final state',
    labelNames: ['method', 'state'],
    buckets: [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 300],
    registers: [registry],
  });
  new Gauge({
    name: 'rhythmetric_jobs',
    help: 'Jobs known to the queue, by state',
    labelNames: ['state'],
    registers: [registry],
    async collect() {
      const counts = await queue.counts().catch(() => null);
      if (counts) for (const state of JOB_STATES) this.set({ state }, counts[state]);
    },
  });
  new Gauge({
    name: 'rhythmetric_queue_depth',
    help: 'Jobs waiting to start',
    registers: [registry],
    async collect() {
      const counts = await queue.counts().catch(() => null);
      if (counts) this.set(counts.queued);
    },
  });
  new Gauge({
    name: 'rhythmetric_stored_bytes',
    help: 'Bytes of signal samples in the store',
    registers: [registry],
    async collect() {
      const usage = await store.usage().catch(() => null);
      if (usage) this.set(usage.bytes);
    },
  });
  app.addHook('onResponse', async (request, reply) => {
    http.observe({ method: request.method, route: request.routeOptions.url ?? 'unmatched', status: String(reply.statusCode) }, reply.elapsedTime / 1000);
  });
  const unsubscribe = queue.onFinished((job, spec) => {
    if (job.startedAt && job.finishedAt) duration.observe({ method: spec.recipe.method, state: job.state }, (Date.parse(job.finishedAt) - Date.parse(job.startedAt)) / 1000);
  });
  return {
    registry,
    jobSubmitted: (method, created) => submitted.inc({ method, created: String(created) }),
    close: unsubscribe,
  };
}
