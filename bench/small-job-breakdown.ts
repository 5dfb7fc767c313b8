/**
 * Where the time of a small job goes, in embedded mode (the "API latency" block's job:
 * 32 ch × 2 s × 256 Hz inline JSON, Welch with 1 s segments). Each step is timed on its own:
 *
 * - the parts of the server's work, called in this process: decoding and hashing the upload,
 *   storing the signal, a job-state write durable and not, the worker's part (read the signal,
 *   analyze, write the record), the same given the upload's samples, and the analysis alone;
 * - the thread hand-off: a pool task whose record already exists (read, no computation);
 * - end to end over loopback HTTP: POST → 202, 202 → finished (the queue's own notification) and
 *   finished → seen by a client polling every 1 ms.
 *
 * Prints medians and p99s, never asserts. Bounded to 40 jobs. Run: npx tsx bench/small-job-breakdown.ts
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
import { analyze } from '../src/engine/analyze.js';
import { createComputePool } from '../src/jobs/compute-pool.js';
import { planJob } from '../src/jobs/plan.js';
import { runJob } from '../src/jobs/run-job.js';
import { normalizeRecipe } from '../src/recipes/normalize.js';
import { decodeJsonSignal } from '../src/signals/decode-json.js';
import { FilesystemStore } from '../src/stores/filesystem-store.js';
import { storeSignal } from '../src/stores/signals.js';
import type { SignalMeta } from '../src/stores/store.js';

const CHANNELS = 32;
const SAMPLING_RATE = 256;
const SECONDS = 2;
const ROUNDS = 40;
const RECIPE = { method: 'welch', segmentSeconds: 1 };

function upload(seed: number) {
  const random = createRandom(seed);
  const data = Array.from({ length: CHANNELS }, (_, c) =>
    Array.from({ length: SECONDS * SAMPLING_RATE }, (_, i) => Math.round((10 * random.normal() + 5 * Math.sin((2 * Math.PI * 10 * i) / SAMPLING_RATE + c)) * 1000) / 1000),
  );
  return { samplingRate: SAMPLING_RATE, channels: Array.from({ length: CHANNELS }, (_, c) => `E${c + 1}`), unit: 'uV', data };
}

function stats(label: string, values: number[]): string {
  const sorted = [...values].sort((a, b) => a - b);
  const at = (p: number) => sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]!;
  return `  ${label.padEnd(58)} median ${at(0.5).toFixed(2).padStart(6)} ms, p99 ${at(0.99).toFixed(2).padStart(6)} ms`;
}

async function timed(rounds: number, step: (i: number) => Promise<unknown> | unknown): Promise<number[]> {
  const out: number[] = [];
  for (let i = 0; i < rounds; i++) {
    const t0 = performance.now();
    await step(i);
    out.push(performance.now() - t0);
  }
  return out;
}

export async function benchSmallJobBreakdown(): Promise<string[]> {
  const lines = [`small-job breakdown: ${CHANNELS} ch × ${SECONDS} s × ${SAMPLING_RATE} Hz, recipe ${JSON.stringify(RECIPE)}, ${ROUNDS} rounds each`];
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-breakdown-'));
  try {
    const config = loadConfig({ DATA_DIR: dataDir, LOG_LEVEL: 'silent', PORT: '0', HOST: '127.0.0.1' });
    const store = new FilesystemStore(join(dataDir, 'parts'));
    const bodies = Array.from({ length: ROUNDS }, (_, i) => upload(10_000 + i));
    const texts = bodies.map((b) => JSON.stringify({ signal: b, recipe: RECIPE }));
    const pinned = normalizeRecipe(RECIPE);

    lines.push(stats('JSON.parse of the request body', await timed(ROUNDS, (i) => JSON.parse(texts[i]!))));
    lines.push(stats('decode the upload (checks, Float64Array)', await timed(ROUNDS, (i) => decodeJsonSignal(bodies[i]!, config.signalLimits))));
    const signals = bodies.map((b) => decodeJsonSignal(b, config.signalLimits));
    const metas: SignalMeta[] = [];
    const storeTimes = await timed(ROUNDS, async (i) => metas.push(await storeSignal(store, signals[i]!, 'default')));
    lines.push(stats('hash and store the signal (2 files flushed)', storeTimes));
    const doc = JSON.stringify({ view: { id: 'job', state: 'running', progress: 0 }, spec: { recipe: pinned.recipe } });
    lines.push(stats('job-state write, durable (flushed)', await timed(ROUNDS, (i) => store.putDocument('jobs', `d${i}`, doc))));
    lines.push(stats('job-state write, not durable', await timed(ROUNDS, (i) => store.putDocument('jobs', `n${i}`, doc, { durable: false }))));
    const plans = metas.map((meta) => planJob(config.recipeLimits, meta, pinned));
    lines.push(
      stats('analyze() alone', await timed(ROUNDS, (i) => analyze(signals[i]!, plans[i]!.spec.resolved!, { signalId: metas[i]!.id, sha256: metas[i]!.sha256, recipeId: pinned.id, mode: 'embedded' }))),
    );
    lines.push(stats('runJob in this thread (read signal, analyze, write record)', await timed(ROUNDS, (i) => runJob(plans[i]!.spec, store, 'embedded'))));
    // The same jobs again in a fresh directory, given the upload's samples as the route now does.
    const handed = new FilesystemStore(join(dataDir, 'handed'));
    for (let i = 0; i < ROUNDS; i++) await storeSignal(handed, signals[i]!, 'default');
    lines.push(stats('runJob given the upload (analyze, write record)', await timed(ROUNDS, (i) => runJob(plans[i]!.spec, handed, 'embedded', undefined, { signal: signals[i]! }))));
    const pool = createComputePool(1, 1);
    try {
      const storeConfig = { kind: 'filesystem' as const, dataDir: join(dataDir, 'parts') };
      await pool.run(plans[0]!.spec, storeConfig, 'embedded', () => {});
      lines.push(stats('pool task whose record exists (thread hand-off + 1 read)', await timed(ROUNDS, (i) => pool.run(plans[i]!.spec, storeConfig, 'embedded', () => {}))));
    } finally {
      await pool.close();
    }

    const api = await startApi(config);
    try {
      await api.app.listen({ host: '127.0.0.1', port: 0 });
      const base = `http://127.0.0.1:${(api.app.server.address() as AddressInfo).port}`;
      const finished = new Map<string, number>();
      api.queue.onFinished((job) => finished.set(job.id, performance.now()));
      const post: number[] = [];
      const run: number[] = [];
      const seen: number[] = [];
      for (let i = -3; i < ROUNDS; i++) {
        const body = JSON.stringify({ signal: upload(20_000 + i), recipe: RECIPE });
        const t0 = performance.now();
        const res = await fetch(`${base}/v1/jobs`, { method: 'POST', headers: { 'content-type': 'application/json' }, body });
        const { id } = (await res.json()) as { id: string };
        const t1 = performance.now();
        let state = '';
        while (state !== 'succeeded' && state !== 'failed') {
          await sleep(1);
          state = ((await (await fetch(`${base}/v1/jobs/${id}`)).json()) as { state: string }).state;
        }
        const t2 = performance.now();
        if (i < 0) continue;
        const end = finished.get(id) ?? t2;
        post.push(t1 - t0);
        run.push(end - t1);
        seen.push(t2 - end);
      }
      lines.push(stats('HTTP: POST → 202 (upload stored, job accepted)', post));
      lines.push(stats('HTTP: 202 → finished (start write, thread, record)', run));
      lines.push(stats('HTTP: finished → seen by a 1 ms poller', seen));
    } finally {
      await api.close();
    }
  } finally {
    await rm(dataDir, { recursive: true, force: true });
  }
  return lines;
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const line of await benchSmallJobBreakdown()) console.log(line);
}
