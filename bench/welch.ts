/**
 * Welch throughput: 64 channels × 600 s × 500 Hz, Hann, 2 s segments (1000 samples), 50 % overlap,
 * mean detrend; mean average at fftLength 1024 and 1000, and median average at 1024, single thread; then a
 * whole Welch job through the engine on 1 and 2 threads at fftLength 1024 and 1000, each against SciPy. The same seeded recording is
 * written to a temporary float64 file and timed with scipy.signal.welch (one call per channel) through
 * /usr/bin/python3 when scipy is there.
 *
 * Run: npx tsx bench/welch.ts
 */
import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { createRandom } from '../src/common/random.js';
import { createWelchPlan } from '../src/dsp/welch.js';
import { makeWindow } from '../src/dsp/windows.js';
import { analyze } from '../src/engine/analyze.js';
import { normalizeRecipe } from '../src/recipes/normalize.js';
import { resolveRecipe } from '../src/recipes/resolve.js';
import type { Signal } from '../src/signals/signal.js';
import { createChannelRunner } from '../src/threads/channel-runner.js';

const CHANNELS = 64;
const SAMPLING_RATE = 500;
const SAMPLES = 600 * SAMPLING_RATE;
const SEGMENT = 1000;
const OVERLAP = 500;
const RUNS = [
  { fftLength: 1024, average: 'mean' },
  { fftLength: 1000, average: 'mean' },
  { fftLength: 1024, average: 'median' },
] as const;
const REPEATS = 3;
const PYTHON = '/usr/bin/python3';

/** Seeded synthetic recording: white noise, a 10 Hz rhythm of channel-dependent size and 50 Hz hum. */
function syntheticRecording(): Float64Array {
  const data = new Float64Array(CHANNELS * SAMPLES);
  const random = createRandom(0x2545f491);
  for (let c = 0; c < CHANNELS; c++) {
    const alpha = 5 + (c % 8);
    for (let i = 0; i < SAMPLES; i++) {
      const t = i / SAMPLING_RATE;
      data[c * SAMPLES + i] = 10 * random.normal() + alpha * Math.sin(2 * Math.PI * 10 * t + c) + 2 * Math.sin(2 * Math.PI * 50 * t);
    }
  }
  return data;
}

interface ScipyRun {
  fftLength: number;
  average: string;
  seconds: number;
  psd0: number[];
}

async function runScipy(file: string): Promise<{ version: string; runs: ScipyRun[] } | { note: string }> {
  const script = fileURLToPath(new URL('./scipy-welch.py', import.meta.url));
  try {
    const { stdout } = await promisify(execFile)(
      PYTHON,
      [script, file, String(CHANNELS), String(SAMPLES), String(SAMPLING_RATE), String(SEGMENT), String(OVERLAP), String(REPEATS), ...RUNS.map((r) => `${r.fftLength}:${r.average}`)],
      { maxBuffer: 64 * 1024 * 1024 },
    );
    const parsed = JSON.parse(stdout) as { error?: string; scipy?: string; numpy?: string; runs?: ScipyRun[] };
    if (parsed.error !== undefined || parsed.runs === undefined) return { note: `${PYTHON}: ${parsed.error ?? 'no output'}; no scipy ratio` };
    return { version: `scipy ${parsed.scipy}, numpy ${parsed.numpy}`, runs: parsed.runs };
  } catch (error) {
    return { note: `${PYTHON} could not run bench/scipy-welch.py (${(error as Error).message.split('\n')[0]}); no scipy ratio` };
  }
}

export async function benchWelch(): Promise<string[]> {
  const lines: string[] = [];
  const data = syntheticRecording();
  const window = makeWindow('hann', SEGMENT);
  lines.push(`welch: ${CHANNELS} ch × ${SAMPLES / SAMPLING_RATE} s × ${SAMPLING_RATE} Hz, Hann, segment ${SEGMENT}, overlap ${OVERLAP}, mean detrend, single thread, best of ${REPEATS}`);
  const ours = new Map<string, { seconds: number; psd0: Float64Array }>();
  for (const { fftLength, average } of RUNS) {
    const plan = createWelchPlan({ samplingRate: SAMPLING_RATE, segmentSamples: SEGMENT, overlapSamples: OVERLAP, fftLength, window, detrend: 'mean', average });
    const out = new Float64Array(plan.binCount);
    const psd0 = new Float64Array(plan.binCount);
    plan.compute(data.subarray(0, SAMPLES), out); // warm-up: JIT and plan caches
    let best = Infinity;
    for (let r = 0; r < REPEATS; r++) {
      const start = performance.now();
      for (let c = 0; c < CHANNELS; c++) {
        plan.compute(data.subarray(c * SAMPLES, (c + 1) * SAMPLES), out);
        if (c === 0) psd0.set(out);
      }
      best = Math.min(best, (performance.now() - start) / 1000);
    }
    ours.set(`${fftLength}:${average}`, { seconds: best, psd0 });
    const rate = (CHANNELS * SAMPLES) / best;
    lines.push(`  ours  fftLength ${fftLength} ${average}: ${best.toFixed(3)} s, ${(rate / 1e6).toFixed(1)} M samples/s, ${((best / CHANNELS) * 1000).toFixed(2)} ms/channel`);
  }
  const jobs = benchWelchJob(data);
  lines.push(...jobs.lines);
  const dir = await mkdtemp(join(tmpdir(), 'rhythmetric-bench-'));
  try {
    const file = join(dir, 'recording.f64');
    await writeFile(file, new Uint8Array(data.buffer, data.byteOffset, data.byteLength));
    const scipy = await runScipy(file);
    if ('note' in scipy) {
      lines.push(`  note: ${scipy.note}`);
    } else {
      for (const run of scipy.runs) {
        const mine = ours.get(`${run.fftLength}:${run.average}`)!;
        let worst = 0;
        for (let k = 0; k < run.psd0.length; k++) worst = Math.max(worst, Math.abs(mine.psd0[k]! - run.psd0[k]!) / Math.abs(run.psd0[k]!));
        lines.push(
          `  scipy fftLength ${run.fftLength} ${run.average}: ${run.seconds.toFixed(3)} s (${scipy.version}); ours/scipy = ${(mine.seconds / run.seconds).toFixed(2)}; channel 0 max relative difference ${worst.toExponential(1)}`,
        );
        // The W1 figure: a whole job (record included) against SciPy's channel loop.
        for (const job of jobs.times.filter((j) => j.fftLength === run.fftLength && run.average === 'mean')) {
          lines.push(`  job   fftLength ${run.fftLength} mean on ${job.threads} thread(s) / scipy = ${(job.seconds / run.seconds).toFixed(2)}`);
        }
      }
    }
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
  return lines;
}

/**
 * One whole Welch job through the engine at fftLength 1024 and 1000, its channels spread by a
 * channel runner over 1 and 2 threads (src/threads), best of the repeats each, the thread counts
 * interleaved per repeat so that load from other work falls on both; the records must be the same bytes.
 */
function benchWelchJob(data: Float64Array) {
  const lines: string[] = [];
  const times: { fftLength: number; threads: number; seconds: number }[] = [];
  for (const fftLength of [1024, 1000]) {
    const results = welchJobTimes(data, [1, 2], fftLength);
    const [one, two] = results as [(typeof results)[0], (typeof results)[0]];
    lines.push(
      ...results.map((r) => `  job   fftLength ${fftLength} mean on ${r.threads} thread(s) (${r.used} computed): ${r.seconds.toFixed(3)} s`),
      `  job   fftLength ${fftLength}: 2 threads / 1 thread = ${(two.seconds / one.seconds).toFixed(2)}; same resultHash: ${one.hash === two.hash}`,
    );
    times.push(...results.map((r) => ({ fftLength, threads: r.threads, seconds: r.seconds })));
  }
  return { lines, times };
}

/**
 * The Welch job's best time on each thread count, and its seconds per sample (channels × samples):
 * the per-sample rate other benchmarks compare with (bench/recording.ts).
 */
export function welchJobTimes(data: Float64Array = syntheticRecording(), threadCounts: number[] = [1], fftLength = 1024) {
  const signal: Signal = { samplingRate: SAMPLING_RATE, channels: Array.from({ length: CHANNELS }, (_, c) => `C${c}`), unit: 'uV', epochCount: 1, samplesPerEpoch: SAMPLES, data };
  const pinned = normalizeRecipe({ method: 'welch', segmentSeconds: SEGMENT / SAMPLING_RATE, overlap: OVERLAP / SEGMENT, fftLength });
  const resolved = resolveRecipe(pinned.recipe, pinned.hash, signal);
  const runs = threadCounts.map((threads) => {
    const channels = createChannelRunner({ threads });
    const once = () => analyze(signal, resolved, { signalId: 'sig_bench', sha256: 'bench', recipeId: pinned.id, mode: 'local', channels });
    return { threads, once, record: once(), best: Infinity }; // warm-up: JIT, plans and helper threads
  });
  for (let r = 0; r < REPEATS; r++) {
    for (const run of runs) {
      const start = performance.now();
      run.record = run.once();
      run.best = Math.min(run.best, (performance.now() - start) / 1000);
    }
  }
  return runs.map(({ threads, best, record }) => ({
    threads,
    seconds: best,
    secondsPerSample: best / (CHANNELS * SAMPLES),
    used: record.provenance.threads ?? 1,
    hash: record.resultHash,
  }));
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const line of await benchWelch()) console.log(line);
}
