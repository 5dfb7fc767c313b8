/**
 * A study run against the same jobs submitted one by one, in embedded mode: the real server
 * (startApi) on 127.0.0.1, driven over loopback HTTP with node's fetch.
 *
 * - 40 seeded recordings of 64 channels × 10 min at 500 Hz (1/f-free white noise plus a 10 Hz rhythm;
 *   float32 uploads, about 77 MB each), entries of one study with invented metadata;
 * - a study run of a Welch recipe over all 40 (wall time from POST to the run's finished state);
 * - the same 40 jobs one by one (submit, poll until finished, next) with a recipe of the same cost
 *   but another hash (a renamed band), so that nothing is reused: the sum of their submit → finished
 *   times, and the wall time of the loop;
 * - the run's bands table exported as CSV: rows and rows per second.
 *
 * BENCH_STUDY_RECORDINGS and BENCH_STUDY_MINUTES shrink it (defaults 40 and 10). Prints figures,
 * never asserts. Run: npx tsx bench/study.ts
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

const RECORDINGS = Number(process.env.BENCH_STUDY_RECORDINGS ?? 40);
const MINUTES = Number(process.env.BENCH_STUDY_MINUTES ?? 10);
const CHANNELS = 64;
const SAMPLING_RATE = 500;
const BANDS = [
  { name: 'theta', low: 4, high: 8 },
  { name: 'alpha', low: 8, high: 13 },
];
const RUN_RECIPE = { method: 'welch', segmentSeconds: 2, bands: BANDS };
const SINGLE_RECIPE = { method: 'welch', segmentSeconds: 2, bands: [BANDS[0], { ...BANDS[1], name: 'alpha1' }] };

/** One recording as little-endian float32 [channel][sample]: seeded noise plus a 10 Hz rhythm, µV. */
function recording(seed: number): Buffer {
  const random = createRandom(seed);
  const samples = MINUTES * 60 * SAMPLING_RATE;
  const data = new Float32Array(CHANNELS * samples);
  for (let c = 0; c < CHANNELS; c++) {
    const phase = random.uniform() * 2 * Math.PI;
    for (let i = 0; i < samples; i++) data[c * samples + i] = 10 * random.normal() + 8 * Math.sin((2 * Math.PI * 10 * i) / SAMPLING_RATE + phase);
  }
  return Buffer.from(data.buffer);
}

async function json(res: Response): Promise<Record<string, unknown>> {
  if (!res.ok) throw new Error(`${res.url} answered ${res.status}: ${await res.text()}`);
  return (await res.json()) as Record<string, unknown>;
}

export async function benchStudy(): Promise<string[]> {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-bench-study-'));
  const config = loadConfig({ DATA_DIR: dataDir, PORT: '0', LOG_LEVEL: 'warn', BODY_LIMIT_BYTES: String(512 * 1024 * 1024) });
  const api = await startApi(config);
  const lines: string[] = [];
  try {
    await api.app.listen({ host: '127.0.0.1', port: 0 });
    const base = `http://127.0.0.1:${(api.app.server.address() as AddressInfo).port}`;
    const post = (path: string, body: unknown) => fetch(`${base}${path}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) }).then(json);
    const channels = Array.from({ length: CHANNELS }, (_, c) => `E${c + 1}`).join(',');

    let started = performance.now();
    const signals: string[] = [];
    for (let r = 0; r < RECORDINGS; r++) {
      const res = await fetch(`${base}/v1/signals?samplingRate=${SAMPLING_RATE}&channels=${channels}`, {
        method: 'POST',
        headers: { 'content-type': 'application/octet-stream' },
        body: recording(9000 + r),
      });
      signals.push((await json(res)).id as string);
    }
    lines.push(
      `${RECORDINGS} recordings × ${CHANNELS} ch × ${MINUTES} min × ${SAMPLING_RATE} Hz uploaded in ${((performance.now() - started) / 1000).toFixed(1)} s (${config.workerThreads} compute threads, run window ${config.studyRunWindow})`,
    );

    // Warm-up of every compute thread (its start under the loader, FFT plans, JIT) with other
    // recipes, so that neither timing pays for it.
    const warm = await Promise.all(Array.from({ length: config.workerThreads }, (_, t) => post('/v1/jobs', { signal: signals[0], recipe: { ...RUN_RECIPE, segmentSeconds: 1 + t / 2 } })));
    for (const job of warm) while (['queued', 'running'].includes((await fetch(`${base}/v1/jobs/${String(job.id)}`).then(json)).state as string)) await sleep(20);

    const study = (await post('/v1/studies', { name: 'bench' })).id as string;
    const entries = signals.map((signal, r) => ({ signal, metadata: { subject: `s${String(r % 20).padStart(2, '0')}`, condition: r < RECORDINGS / 2 ? 'a' : 'b' } }));
    await post(`/v1/studies/${study}/entries`, { entries });

    started = performance.now();
    const run = (await post(`/v1/studies/${study}/runs`, { recipe: RUN_RECIPE })).id as string;
    let view: Record<string, unknown>;
    for (;;) {
      view = await fetch(`${base}/v1/studies/${study}/runs/${run}`).then(json);
      if (view.state !== 'running') break;
      await sleep(50);
    }
    const runSeconds = (performance.now() - started) / 1000;
    lines.push(`study run: ${runSeconds.toFixed(1)} s wall for ${RECORDINGS} entries, state ${String(view.state)}`);

    let sum = 0;
    started = performance.now();
    for (const signal of signals) {
      const t0 = performance.now();
      const job = await post('/v1/jobs', { signal, recipe: SINGLE_RECIPE });
      for (;;) {
        const state = (await fetch(`${base}/v1/jobs/${String(job.id)}`).then(json)).state;
        if (state !== 'queued' && state !== 'running') break;
        await sleep(5);
      }
      sum += (performance.now() - t0) / 1000;
    }
    lines.push(`one by one: sum of submit → finished ${sum.toFixed(1)} s (loop ${((performance.now() - started) / 1000).toFixed(1)} s wall); run / sum = ${(runSeconds / sum).toFixed(2)}`);

    started = performance.now();
    const table = await fetch(`${base}/v1/studies/${study}/runs/${run}/table?level=bands&format=csv`);
    const text = await table.text();
    const rows = text.split('\r\n').length - 2;
    const seconds = (performance.now() - started) / 1000;
    lines.push(
      `run table (bands, CSV): ${rows} rows, ${(text.length / 1e6).toFixed(1)} MB in ${seconds.toFixed(2)} s (${Math.round(rows / seconds)} rows/s, small tables are dominated by reading the records)`,
    );
  } finally {
    await api.close();
    await rm(dataDir, { recursive: true, force: true });
  }
  return lines;
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  for (const line of await benchStudy()) console.log(line);
}
