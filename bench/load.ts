/**
 * Load on POST /v1/jobs with autocannon over loopback, against a `rhythmetric serve` child (so the
 * load generator does not share the server's event loop):
 *
 * - embedded mode (in-process queue, 1 compute thread);
 * - Redis mode with 1 and with 2 `rhythmetric worker` processes (1 compute thread each), skipped
 *   with a note when no Redis answers at TEST_REDIS_URL (default redis://127.0.0.1:6379).
 *
 * Each request is a fresh job: 32 ch × 2 s × 256 Hz of seeded noise as inline JSON, made distinct by
 * writing the request's number into its first sample (so no two requests share a content hash).
 * Printed per scenario: POST throughput (req/s), p50/p99 latency, status counts, jobs completed and
 * the time from the end of the load to an empty queue. Bounded: 10 s of load and at most 90 s of
 * drain per scenario. Prints figures, never fails on them. Run: npx tsx bench/load.ts
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import autocannon from 'autocannon';
import { Redis } from 'ioredis';
import { createRandom } from '../src/common/random.js';
import { freePort, ServiceProcess } from '../test/faults/helpers.js';
import { redisAnswers } from '../test/helpers/redis.js';

const CHANNELS = 32;
const SECONDS = 2;
const SAMPLING_RATE = 256;
const RECIPE = { method: 'welch', segmentSeconds: 1 };
const LOAD_SECONDS = 10;
const CONNECTIONS = 10;
const DRAIN_BOUND_MS = 90_000;
const REDIS_URL = process.env.TEST_REDIS_URL ?? 'redis://127.0.0.1:6379';

/** The body split around its first sample, which each request replaces by its own number. */
function bodyTemplate(): { head: string; tail: string } {
  const random = createRandom(20240601);
  const data: number[][] = [];
  for (let c = 0; c < CHANNELS; c++) data.push(Array.from({ length: SECONDS * SAMPLING_RATE }, () => Math.round(10_000 * random.normal()) / 1000));
  data[0]![0] = 123456789;
  const text = JSON.stringify({ signal: { samplingRate: SAMPLING_RATE, channels: Array.from({ length: CHANNELS }, (_, c) => `E${c + 1}`), unit: 'uV', data }, recipe: RECIPE });
  const [head, tail] = text.split('123456789');
  return { head: head!, tail: tail! };
}

/** Job counts by state from the service's own Prometheus gauge. */
async function jobCounts(base: string): Promise<Record<string, number>> {
  const text = await (await fetch(`${base}/metrics`, { signal: AbortSignal.timeout(10_000) })).text();
  const counts: Record<string, number> = {};
  for (const m of text.matchAll(/^rhythmetric_jobs\{state="(\w+)"\} (\d+)/gm)) counts[m[1]!] = Number(m[2]);
  return counts;
}

interface Scenario {
  name: string;
  workers: number;
  redis: boolean;
}

async function runScenario(scenario: Scenario, template: { head: string; tail: string }, seedBase: number): Promise<string[]> {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-load-'));
  const prefix = `rm-load-${process.pid}-${Date.now().toString(36)}`;
  const common: Record<string, string> = { LOG_LEVEL: 'warn', WORKER_THREADS: '1', DATA_DIR: dataDir, ...(scenario.redis ? { REDIS_URL, REDIS_PREFIX: prefix } : {}) };
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const children: ServiceProcess[] = [];
  try {
    const server = new ServiceProcess('serve', { ...common, LOG_LEVEL: 'info', PORT: String(port), HOST: '127.0.0.1', RATE_LIMIT_PER_MINUTE: '0' });
    children.push(server);
    await server.waitForLog('rhythmetric serving', 30_000);
    for (let w = 0; w < scenario.workers; w++) children.push(new ServiceProcess('worker', { ...common, LOG_LEVEL: 'info' }));
    await Promise.all(children.slice(1).map((w) => w.waitForLog('rhythmetric worker started', 30_000)));

    let n = seedBase;
    const result = await autocannon({
      url: base,
      connections: CONNECTIONS,
      duration: LOAD_SECONDS,
      requests: [
        {
          method: 'POST',
          path: '/v1/jobs',
          headers: { 'content-type': 'application/json' },
          setupRequest: (request) => ({ ...request, body: `${template.head}${n++}${template.tail}` }),
        },
      ],
    });
    const loadEnded = performance.now();
    let counts = await jobCounts(base);
    while ((counts.queued ?? 0) + (counts.running ?? 0) > 0 && performance.now() - loadEnded < DRAIN_BOUND_MS) {
      await sleep(200);
      counts = await jobCounts(base);
    }
    const drainMs = performance.now() - loadEnded;
    const drained = (counts.queued ?? 0) + (counts.running ?? 0) === 0;
    const statuses = Object.entries(result.statusCodeStats ?? {})
      .map(([code, s]) => `${code}×${s.count}`)
      .join(' ');
    const notes = drained
      ? []
      : children
          .slice(1)
          .map(
            (w, i) => `  worker ${i + 1}: alive ${w.alive}, ${w.logs('job completed').length} completed; last log ${JSON.stringify(w.lines.at(-1) ?? null)}; stderr ${w.stderr.join('').slice(-300)}`,
          );
    return [
      `${scenario.name}: ${CONNECTIONS} connections, ${LOAD_SECONDS} s, ${((template.head.length + template.tail.length) / 1024).toFixed(0)} KiB bodies`,
      `  POST /v1/jobs: ${result.requests.average.toFixed(1)} req/s, latency p50 ${result.latency.p50} ms, p99 ${result.latency.p99} ms (${result.requests.total} requests; ${statuses}; ${result.errors} errors, ${result.timeouts} timeouts)`,
      `  jobs: ${counts.succeeded ?? 0} succeeded, ${counts.failed ?? 0} failed; ${drained ? `queue drained ${(drainMs / 1000).toFixed(1)} s after the load ended` : `still ${(counts.queued ?? 0) + (counts.running ?? 0)} queued or running after the ${DRAIN_BOUND_MS / 1000} s bound`}`,
      `  (autocannon counts requests answered before it stopped; jobs include the ${CONNECTIONS} or fewer still in flight then)`,
      ...notes,
    ];
  } finally {
    await Promise.all(children.map((c) => c.stop()));
    if (scenario.redis) {
      const redis = new Redis(REDIS_URL, { maxRetriesPerRequest: 1 });
      redis.on('error', () => {});
      const keys = await redis.keys(`${prefix}:*`).catch(() => [] as string[]);
      for (let i = 0; i < keys.length; i += 500) await redis.del(...keys.slice(i, i + 500));
      redis.disconnect();
    }
    await rm(dataDir, { recursive: true, force: true });
  }
}

export async function benchLoad(): Promise<string[]> {
  const template = bodyTemplate();
  const lines: string[] = [`load: autocannon → rhythmetric serve child on 127.0.0.1; 1 compute thread per process; recipe ${JSON.stringify(RECIPE)}`];
  const all: Scenario[] = [
    { name: 'embedded', workers: 0, redis: false },
    { name: 'redis, 1 worker', workers: 1, redis: true },
    { name: 'redis, 2 workers', workers: 2, redis: true },
  ];
  // LOAD_ONLY=embedded|1|2 runs one scenario (for investigating it).
  const only = process.env.LOAD_ONLY;
  const scenarios = only ? all.filter((s) => (only === 'embedded' ? !s.redis : s.redis && String(s.workers) === only)) : all;
  const haveRedis = await redisAnswers(REDIS_URL);
  for (const [i, scenario] of scenarios.entries()) {
    if (scenario.redis && !haveRedis) {
      lines.push(`${scenario.name}: skipped, no Redis answers at ${REDIS_URL} (set TEST_REDIS_URL)`);
      continue;
    }
    lines.push(...(await runScenario(scenario, template, 1_000_000 * (i + 1))));
  }
  return lines;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const line of await benchLoad()) console.log(line);
}
