/**
 * Scale-out in Redis mode: a study-sized batch computed by 1 and by 2 `rhythmetric worker` processes.
 *
 * The invented scenario: 20 subjects × 2 conditions (eyes closed at rest; mental arithmetic with eyes
 * open), one recording each, 32 ch × 60 s × 256 Hz of seeded noise plus an alpha rhythm whose
 * frequency is the subject's own (8.5–11.5 Hz) and whose amplitude drops in the task. Each
 * configuration gets a fresh REDIS_PREFIX (its own queue, store and records, deleted afterwards), so
 * nothing computed in one configuration can be found by the next; the batch is uploaded again to it.
 * Every run must finish with 40 succeeded and 0 reused entries and 40 "job completed" lines in the
 * workers' logs, or the figure is reported as not valid.
 *
 * Configurations, each an API child (`rhythmetric serve`, no compute in Redis mode) plus workers:
 * - 1 worker × THREADS=1: one job at a time, one core used;
 * - 1 worker × THREADS=2 and 2 workers × THREADS=1: two jobs at a time on this 2-core machine.
 *   These two are the honest comparison: the same thread budget, spent in one process or in two.
 *   More threads in total than cores would only make the jobs take turns.
 * A worker runs as many jobs at once as its THREADS; a run keeps STUDY_RUN_WINDOW = 8 jobs queued,
 * so a worker never waits for the run driver to top up the queue.
 *
 * In each configuration two study runs of all 40 entries: Welch (2 s segments in 4 s epochs, light:
 * the store work of a job weighs as much as its spectra) and multitaper (2 s epochs, NW 4, adaptive:
 * heavier). Before them, a warm-up of 2 jobs per thread with other recipes starts every worker's
 * threads and JIT. Printed: seconds from POST …/runs to the run's end, jobs per second, jobs per
 * worker, and the ratios of the jobs per second.
 *
 * Skipped with a note when no Redis answers at TEST_REDIS_URL (default redis://127.0.0.1:6379).
 * Bounded: 5 minutes per run. Prints figures, never fails on them. Run: npx tsx bench/scale-out.ts
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { Redis } from 'ioredis';
import { createRandom } from '../src/common/random.js';
import { FINISHED, freePort, ServiceProcess } from '../test/faults/helpers.js';
import { redisAnswers } from '../test/helpers/redis.js';

const SUBJECTS = 20;
const CONDITIONS = ['rest-eyes-closed', 'arithmetic-eyes-open'] as const;
const CHANNELS = 32;
const SECONDS = 60;
const SAMPLING_RATE = 256;
const RUN_WINDOW = 8;
const RUN_BOUND_MS = 300_000;
const REDIS_URL = process.env.TEST_REDIS_URL ?? 'redis://127.0.0.1:6379';

const RECIPES = [
  { name: 'welch', recipe: { method: 'welch', segmentSeconds: 2, epoching: { mode: 'fixed', epochSeconds: 4 } } },
  { name: 'multitaper', recipe: { method: 'multitaper', timeBandwidth: 4, epoching: { mode: 'fixed', epochSeconds: 2 } } },
] as const;

interface Configuration {
  workers: number;
  threads: number;
}

const CONFIGURATIONS: readonly Configuration[] = [
  { workers: 1, threads: 1 },
  { workers: 1, threads: 2 },
  { workers: 2, threads: 1 },
];

/** The 1-minute load average: this machine is shared, and other work there changes every figure. */
const load = (): string => loadavg()[0]!.toFixed(1);

const label = (c: Configuration): string => `${c.workers} worker${c.workers > 1 ? 's' : ''} × THREADS=${c.threads}`;

interface Recording {
  subject: string;
  condition: string;
  body: Buffer;
}

/** The 40 recordings as little-endian float32 [channel][sample], µV. */
function recordings(): Recording[] {
  const out: Recording[] = [];
  const samples = SECONDS * SAMPLING_RATE;
  for (let s = 0; s < SUBJECTS; s++) {
    const alphaHz = 8.5 + (3 * s) / (SUBJECTS - 1);
    for (const [k, condition] of CONDITIONS.entries()) {
      const random = createRandom(31_000 + 2 * s + k);
      const amplitude = k === 0 ? 12 : 4;
      const data = new Float32Array(CHANNELS * samples);
      for (let c = 0; c < CHANNELS; c++) {
        // Posterior channels (the last third) carry more of the rhythm, as at rest (common practice).
        const gain = c >= (2 * CHANNELS) / 3 ? 1 : 0.4;
        const phase = random.uniform() * 2 * Math.PI;
        for (let i = 0; i < samples; i++) data[c * samples + i] = 8 * random.normal() + gain * amplitude * Math.sin((2 * Math.PI * alphaHz * i) / SAMPLING_RATE + phase);
      }
      out.push({ subject: `s${String(s + 1).padStart(2, '0')}`, condition, body: Buffer.from(data.buffer) });
    }
  }
  return out;
}

async function json(res: Response): Promise<Record<string, unknown>> {
  if (!res.ok) throw new Error(`${res.url} answered ${res.status}: ${(await res.text()).slice(0, 500)}`);
  return (await res.json()) as Record<string, unknown>;
}

async function deletePrefix(prefix: string): Promise<void> {
  const redis = new Redis(REDIS_URL, { maxRetriesPerRequest: 1 });
  redis.on('error', () => {});
  try {
    let cursor = '0';
    do {
      const [next, keys] = await redis.scan(cursor, 'MATCH', `${prefix}:*`, 'COUNT', 1000);
      cursor = next;
      if (keys.length > 0) await redis.del(...keys);
    } while (cursor !== '0');
  } finally {
    redis.disconnect();
  }
}

interface RunFigure {
  recipe: string;
  seconds: number;
  jobsPerSecond: number;
  valid: boolean;
  line: string;
}

async function runConfiguration(config: Configuration, batch: readonly Recording[]): Promise<{ lines: string[]; figures: RunFigure[] }> {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-scale-'));
  const prefix = `rm-scale-${process.pid}-${Date.now().toString(36)}`;
  const common: Record<string, string> = { LOG_LEVEL: 'info', DATA_DIR: dataDir, REDIS_URL, REDIS_PREFIX: prefix, WORKER_THREADS: '', JOB_THREADS: '' };
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const children: ServiceProcess[] = [];
  const lines: string[] = [`${label(config)} (prefix ${prefix}; load average ${load()} at the start)`];
  const figures: RunFigure[] = [];
  try {
    const api = new ServiceProcess('serve', { ...common, THREADS: '1', PORT: String(port), HOST: '127.0.0.1', RATE_LIMIT_PER_MINUTE: '0', STUDY_RUN_WINDOW: String(RUN_WINDOW) });
    children.push(api);
    await api.waitForLog('rhythmetric serving', 30_000);
    const workers = Array.from({ length: config.workers }, () => new ServiceProcess('worker', { ...common, THREADS: String(config.threads) }));
    children.push(...workers);
    await Promise.all(workers.map((w) => w.waitForLog('rhythmetric worker started', 30_000)));
    const post = (path: string, body: unknown) => fetch(`${base}${path}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) }).then(json);

    let t0 = performance.now();
    const channels = Array.from({ length: CHANNELS }, (_, c) => `E${c + 1}`).join(',');
    const signals: string[] = [];
    for (const r of batch) {
      const res = await fetch(`${base}/v1/signals?samplingRate=${SAMPLING_RATE}&channels=${channels}`, { method: 'POST', headers: { 'content-type': 'application/octet-stream' }, body: r.body });
      signals.push((await json(res)).id as string);
    }
    lines.push(`  upload: ${batch.length} recordings in ${((performance.now() - t0) / 1000).toFixed(1)} s`);

    // Warm-up with recipes no run uses: every worker thread starts, loads the engine and JITs it.
    const slots = config.workers * config.threads;
    const warm = await Promise.all(
      Array.from({ length: 2 * slots }, (_, i) => post('/v1/jobs', { signal: signals[i]!, recipe: { method: RECIPES[i % 2]!.recipe.method, epoching: { mode: 'fixed', epochSeconds: 3 } } })),
    );
    for (const job of warm) while (!FINISHED.has((await fetch(`${base}/v1/jobs/${String(job.id)}`).then(json)).state as string)) await sleep(50);
    // Their log lines too (see below), so that none is counted in the first run.
    const warmDeadline = performance.now() + 5000;
    while (workers.reduce((sum, w) => sum + w.logs('job completed').length, 0) < warm.length && performance.now() < warmDeadline) await sleep(20);
    const warmed = workers.map((w) => w.logs('job completed').length);
    if (warmed.some((n) => n === 0)) lines.push(`  note: a worker took no warm-up job (${warmed.join(' + ')}); its first jobs below start cold`);

    const study = (await post('/v1/studies', { name: 'scale-out' })).id as string;
    await post(`/v1/studies/${study}/entries`, { entries: signals.map((signal, i) => ({ signal, metadata: { subject: batch[i]!.subject, condition: batch[i]!.condition } })) });

    for (const { name, recipe } of RECIPES) {
      const before = workers.map((w) => w.logs('job completed').length);
      t0 = performance.now();
      const run = (await post(`/v1/studies/${study}/runs`, { recipe })).id as string;
      let view: Record<string, unknown>;
      for (;;) {
        view = await fetch(`${base}/v1/studies/${study}/runs/${run}`).then(json);
        if (view.state !== 'running') break;
        if (performance.now() - t0 > RUN_BOUND_MS) throw new Error(`the ${name} run was still running after ${RUN_BOUND_MS / 1000} s: ${JSON.stringify(view.counts)}`);
        await sleep(25);
      }
      const seconds = (performance.now() - t0) / 1000;
      // A worker's "job completed" line can reach this process after the run has ended (the run
      // follows the queue's notification, not the log pipe): wait for it, bounded, so that it is
      // not counted in the next run. A job found instead of computed never logs, and stays missing.
      const completed = () => workers.reduce((sum, w, i) => sum + w.logs('job completed').length - before[i]!, 0);
      const logDeadline = performance.now() + 5000;
      while (completed() < batch.length && performance.now() < logDeadline) await sleep(20);
      const perWorker = workers.map((w, i) => w.logs('job completed').length - before[i]!);
      const counts = view.counts as Record<string, number>;
      const computed = perWorker.reduce((s, n) => s + n, 0);
      const valid = view.state === 'succeeded' && counts.succeeded === batch.length && counts.reused === 0 && computed === batch.length;
      const jobsPerSecond = batch.length / seconds;
      const line =
        `  ${name.padEnd(10)} ${seconds.toFixed(1).padStart(5)} s, ${jobsPerSecond.toFixed(2)} jobs/s; jobs per worker ${perWorker.join(' + ')}; load average ${load()} at the end` +
        (valid ? '' : ` — NOT VALID: state ${String(view.state)}, counts ${JSON.stringify(counts)}, ${computed} computed`);
      lines.push(line);
      figures.push({ recipe: name, seconds, jobsPerSecond, valid, line });
    }
  } catch (error) {
    lines.push(`  failed: ${error instanceof Error ? error.message : String(error)}`);
    for (const [i, c] of children.entries()) if (!c.alive || c.stderr.length > 0) lines.push(`  child ${i}: alive ${c.alive}; stderr ${c.stderr.join('').slice(-300)}`);
  } finally {
    await Promise.all(children.map((c) => c.stop()));
    await deletePrefix(prefix).catch((error: unknown) => lines.push(`  note: could not delete ${prefix}:* (${String(error)})`));
    await rm(dataDir, { recursive: true, force: true });
  }
  return { lines, figures };
}

export async function benchScaleOut(): Promise<string[]> {
  const lines = [
    `scale-out: Redis mode, ${SUBJECTS} subjects × ${CONDITIONS.length} conditions = ${SUBJECTS * CONDITIONS.length} recordings of ${CHANNELS} ch × ${SECONDS} s × ${SAMPLING_RATE} Hz (float32 upload), one study run per recipe`,
    '  1 worker × 2 threads against 2 workers × 1 thread: the same 2-thread budget on a 2-core machine; 1 worker × 1 thread shows what one core does alone',
  ];
  if (!(await redisAnswers(REDIS_URL))) {
    lines.push(`  skipped: no Redis answers at ${REDIS_URL} (set TEST_REDIS_URL)`);
    return lines;
  }
  const batch = recordings();
  const results: { config: Configuration; figures: RunFigure[] }[] = [];
  for (const config of CONFIGURATIONS) {
    const { lines: own, figures } = await runConfiguration(config, batch);
    lines.push(...own);
    results.push({ config, figures });
  }
  const rate = (workers: number, threads: number, recipe: string): number | null => {
    const figure = results.find((r) => r.config.workers === workers && r.config.threads === threads)?.figures.find((f) => f.recipe === recipe);
    return figure?.valid ? figure.jobsPerSecond : null;
  };
  for (const { name } of RECIPES) {
    const one = rate(1, 1, name);
    const oneTwo = rate(1, 2, name);
    const two = rate(2, 1, name);
    const ratio = (a: number | null, b: number | null) => (a === null || b === null ? 'n/a' : (a / b).toFixed(2));
    lines.push(`  ${name}: 2 workers × 1 / 1 worker × 2 = ${ratio(two, oneTwo)}; 2 workers × 1 / 1 worker × 1 = ${ratio(two, one)}; 1 worker × 2 / 1 worker × 1 = ${ratio(oneTwo, one)}`);
  }
  return lines;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const line of await benchScaleOut()) console.log(line);
}
