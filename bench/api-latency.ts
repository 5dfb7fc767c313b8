/**
 * End-to-end API latency in embedded mode: the real server (startApi) on 127.0.0.1, port 0, driven
 * over loopback HTTP with node's fetch, one job in flight at a time.
 *
 * - 200 fresh jobs: POST /v1/jobs with an inline 32 ch × 2 s × 256 Hz seeded signal that differs per
 *   request and recipe {method: welch, segmentSeconds: 1}, then GET /v1/jobs/:id every 1 ms until the
 *   job finishes; the figure is submit → succeeded.
 * - 200 fresh jobs with POST /v1/jobs?wait=10: one request, answered once the job has finished.
 * - 200 repeats of one finished submission, answered 200 from the stored record: POST round trip.
 *
 * Bounded: at most 200 + 200 jobs and 200 repeats (plus 5 warm-up jobs) and 120 s, whichever comes first.
 * Prints figures, never asserts. Run: npx tsx bench/api-latency.ts
 */
import { mkdtemp, rm } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { startApi } from '../src/cli/runtime.js';
import { createRandom } from '../src/common/random.js';
import { loadConfig } from '../src/config.js';

const CHANNELS = 32;
const SAMPLING_RATE = 256;
const SECONDS = 2;
const JOBS = 200;
const REPEATS = 200;
const WARM_UP = 5;
const POLL_MS = 1;
const WAIT_SECONDS = 10;
const BOUND_MS = 120_000;
const RECIPE = { method: 'welch', segmentSeconds: 1 };
const FINISHED = new Set(['succeeded', 'failed', 'canceled']);

/** Seeded synthetic job body: white noise plus a 10 Hz rhythm, 3 decimals (µV); `seed` makes it unique. */
function jobBody(seed: number): string {
  const random = createRandom(seed);
  const samples = SECONDS * SAMPLING_RATE;
  const data: number[][] = [];
  for (let c = 0; c < CHANNELS; c++) {
    const row = new Array<number>(samples);
    for (let i = 0; i < samples; i++) {
      const value = 10 * random.normal() + 5 * Math.sin((2 * Math.PI * 10 * i) / SAMPLING_RATE + c);
      row[i] = Math.round(value * 1000) / 1000;
    }
    data.push(row);
  }
  const channels = Array.from({ length: CHANNELS }, (_, c) => `E${c + 1}`);
  return JSON.stringify({ signal: { samplingRate: SAMPLING_RATE, channels, unit: 'uV', data }, recipe: RECIPE });
}

/** Nearest-rank percentile (common practice) of an ascending array. */
function percentile(sorted: readonly number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}

const LABELS: Record<number, string> = { 50: 'median', 100: 'max' };

function summary(samples: readonly number[], which: readonly number[]): string {
  const sorted = [...samples].sort((a, b) => a - b);
  return `${which.map((p) => `${LABELS[p] ?? `p${p}`} ${percentile(sorted, p).toFixed(2)}`).join(', ')} ms`;
}

class Bound extends Error {}

/** True for the 120 s bound, whether our own check or a fetch's AbortSignal.timeout fired. */
function isStop(error: unknown): boolean {
  return error instanceof Bound || (error instanceof DOMException && error.name === 'TimeoutError');
}

const total = (values: readonly number[]): number => values.reduce((sum, v) => sum + v, 0);

export async function benchApiLatency(): Promise<string[]> {
  const lines: string[] = [];
  const began = performance.now();
  const deadline = began + BOUND_MS;
  const remaining = (): number => {
    const left = deadline - performance.now();
    if (left <= 0) throw new Bound();
    return Math.ceil(left);
  };
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-bench-'));
  let api: Awaited<ReturnType<typeof startApi>> | null = null;
  try {
    const config = loadConfig({ DATA_DIR: dataDir, LOG_LEVEL: 'silent', PORT: '0', HOST: '127.0.0.1' });
    api = await startApi(config);
    await api.app.listen({ host: '127.0.0.1', port: 0 });
    const { port } = api.app.server.address() as AddressInfo;
    const base = `http://127.0.0.1:${port}`;

    const submit = async (body: string, query = '') => {
      const res = await fetch(`${base}/v1/jobs${query}`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body,
        signal: AbortSignal.timeout(remaining()),
      });
      return { status: res.status, job: (await res.json()) as { id?: string; state?: string; detail?: string } };
    };
    const runJob = async (body: string): Promise<{ ms: number; state: string }> => {
      const t0 = performance.now();
      const { status, job } = await submit(body);
      if ((status !== 202 && status !== 200) || job.id === undefined) return { ms: performance.now() - t0, state: `HTTP ${status}: ${job.detail ?? ''}` };
      let state = job.state ?? 'unknown';
      while (!FINISHED.has(state)) {
        await sleep(POLL_MS);
        const res = await fetch(`${base}/v1/jobs/${job.id}`, { signal: AbortSignal.timeout(remaining()) });
        state = ((await res.json()) as { state: string }).state;
      }
      return { ms: performance.now() - t0, state };
    };
    const waitJob = async (body: string): Promise<{ ms: number; state: string }> => {
      const t0 = performance.now();
      const { status, job } = await submit(body, `?wait=${WAIT_SECONDS}`);
      const state = status === 200 || status === 202 ? (job.state ?? 'unknown') : `HTTP ${status}: ${job.detail ?? ''}`;
      return { ms: performance.now() - t0, state: status === 202 ? `202 after the wait (${state})` : state };
    };

    lines.push(
      `api latency: embedded mode, ${config.workerThreads} worker thread(s), loopback HTTP (fetch), one job in flight; ` +
        `${CHANNELS} ch × ${SECONDS} s × ${SAMPLING_RATE} Hz inline JSON, recipe ${JSON.stringify(RECIPE)}, poll every ${POLL_MS} ms`,
    );
    const first = jobBody(1);
    lines.push(`  body ${(first.length / 1024).toFixed(0)} KiB per job; ${WARM_UP} warm-up jobs not counted`);
    /** Fresh jobs one at a time through `run`; figures on the succeeded ones. */
    const freshJobs = async (label: string, run: (body: string) => Promise<{ ms: number; state: string }>, seedBase: number): Promise<number[]> => {
      const latencies: number[] = [];
      const failures = new Map<string, number>();
      let done = 0;
      try {
        for (let w = 0; w < WARM_UP; w++) await run(jobBody(seedBase + 1_000_000 + w));
        for (let i = 0; i < JOBS; i++) {
          const { ms, state } = await run(seedBase === 0 && i === 0 ? first : jobBody(seedBase + 1 + i));
          done++;
          if (state === 'succeeded') latencies.push(ms);
          else failures.set(state, (failures.get(state) ?? 0) + 1);
        }
      } catch (error) {
        if (!isStop(error)) throw error;
        lines.push(`  ${label}: stopped at the ${BOUND_MS / 1000} s bound after ${done} of ${JOBS} fresh jobs`);
      }
      if (latencies.length > 0) {
        const seconds = total(latencies) / 1000;
        lines.push(`  ${label}, submit → succeeded (${latencies.length} succeeded): ${summary(latencies, [50, 90, 95, 99, 100])}`);
        lines.push(`  ${label}: ${(latencies.length / seconds).toFixed(1)} jobs/s one at a time (${seconds.toFixed(2)} s of submit → succeeded)`);
      }
      for (const [state, count] of failures) lines.push(`  ${label}, not succeeded: ${count} × ${state}`);
      return latencies;
    };
    const latencies = await freshJobs('fresh jobs, polling', runJob, 0);
    await freshJobs(`fresh jobs, ?wait=${WAIT_SECONDS}`, waitJob, 10_000_000);

    const repeated: number[] = [];
    const statuses = new Map<number, number>();
    try {
      for (let i = 0; i < REPEATS && latencies.length > 0; i++) {
        const t0 = performance.now();
        const { status } = await submit(first);
        repeated.push(performance.now() - t0);
        statuses.set(status, (statuses.get(status) ?? 0) + 1);
      }
    } catch (error) {
      if (!isStop(error)) throw error;
      lines.push(`  stopped at the ${BOUND_MS / 1000} s bound after ${repeated.length} of ${REPEATS} repeated submissions`);
    }
    if (repeated.length > 0) {
      const answered = [...statuses].map(([status, count]) => `${count} × HTTP ${status}`).join(', ');
      const perSecond = repeated.length / (total(repeated) / 1000);
      lines.push(`  repeated identical submission (${answered}): ${summary(repeated, [50, 95, 99])}, ${perSecond.toFixed(0)} requests/s one at a time`);
    }
    lines.push(`  total ${((performance.now() - began) / 1000).toFixed(1)} s`);
  } finally {
    await api?.close();
    await rm(dataDir, { recursive: true, force: true });
  }
  return lines;
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const line of await benchApiLatency()) console.log(line);
}
