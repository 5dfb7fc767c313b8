/**
 * Morlet wavelet power: 100 epochs × 32 channels × 2 s at 500 Hz, 40 log-spaced frequencies 2–45 Hz,
 * 7 cycles, beside the same FFT convolution in numpy/scipy (bench/scipy-morlet.py):
 * - the kernel (createMorletPlan) on one thread, and, to show where its time goes, its inverse
 *   transforms alone (the same lengths and output prefixes, one per signal and frequency);
 * - whole `morlet` jobs through analyze() on 1 and 2 threads (JOB_THREADS), which also average the
 *   trials and hash the matrices;
 * - scipy with workers = 1 and 2.
 *
 * Standalone: `npx tsx bench/morlet.ts`. Prints figures; never fails on time.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { complexFftPlan } from '../src/dsp/fft.js';
import { createMorletPlan } from '../src/dsp/morlet.js';
import { packSignal, timeEngineMorlet, type MorletWorkload } from './morlet-engine.js';
import { sineHashSignals } from './sine-hash.js';

const EPOCHS = 100;
const CHANNELS = 32;
const SAMPLING_RATE = 500;
const SAMPLES = 2 * SAMPLING_RATE;
const F_LOW = 2;
const F_HIGH = 45;
const COUNT = 40;
const CYCLES = 7;

function makeData(): Float64Array[] {
  return sineHashSignals(EPOCHS * CHANNELS, SAMPLES);
}

/** CPU seconds of this process (user + system) since `from`: less moved than the wall clock by other work on the machine. */
function cpuSeconds(from?: NodeJS.CpuUsage): number {
  const used = process.cpuUsage(from);
  return (used.user + used.system) / 1e6;
}

const PLAN_OPTIONS = { samplingRate: SAMPLING_RATE, frequencies: { low: F_LOW, high: F_HIGH, count: COUNT }, cycles: CYCLES };

function timeOurs(data: Float64Array[]): { seconds: number; cpu: number; totals: Float64Array } {
  const cpu = process.cpuUsage();
  const start = performance.now();
  // the plan (wavelet spectra, FFT plans, scratch) is built inside the timed region, once
  const plan = createMorletPlan(SAMPLES, PLAN_OPTIONS);
  const out = new Float64Array(plan.timeCount * plan.frequencyCount);
  const totals = new Float64Array(COUNT);
  for (const x of data) {
    plan.power(x, out);
    for (let i = 0; i < out.length; i++) totals[i % COUNT] = totals[i % COUNT]! + out[i]!;
  }
  return { seconds: (performance.now() - start) / 1000, cpu: cpuSeconds(cpu), totals };
}

/**
 * The kernel's inverse transforms alone for `signals` signals: per signal and frequency, one in-place
 * inverse of the plan's length for that frequency, asked for the plan's output prefix. Each call first
 * refills the arrays (an unscaled inverse grows the values); the refills are timed on their own and
 * subtracted. CPU seconds and wall seconds.
 */
function timeInverses(signals: number): { seconds: number; cpu: number } {
  const plan = createMorletPlan(SAMPLES, PLAN_OPTIONS);
  const lengths = plan.inverseLengths;
  const longest = Math.max(...lengths);
  const source = sineHashSignals(2, longest);
  const re = new Float64Array(longest),
    im = new Float64Array(longest);
  const run = (transform: boolean): { seconds: number; cpu: number } => {
    const cpu = process.cpuUsage();
    const start = performance.now();
    for (let s = 0; s < signals; s++) {
      for (const n of lengths) {
        re.set(source[0]!.subarray(0, n));
        im.set(source[1]!.subarray(0, n));
        if (transform) complexFftPlan(n).transform(re, im, true, Math.min(n, plan.timeCount));
      }
    }
    return { seconds: (performance.now() - start) / 1000, cpu: cpuSeconds(cpu) };
  };
  run(true); // warm-up
  const refill = run(false);
  const both = run(true);
  return { seconds: both.seconds - refill.seconds, cpu: both.cpu - refill.cpu };
}

function timeScipy(workers: number): { seconds: number; cpu: number; totals: number[]; versions: string } | string {
  const script = fileURLToPath(new URL('./scipy-morlet.py', import.meta.url));
  const args = [EPOCHS, CHANNELS, SAMPLES, SAMPLING_RATE, F_LOW, F_HIGH, COUNT, CYCLES, workers].map(String);
  const run = spawnSync('/usr/bin/python3', [script, ...args], { encoding: 'utf8', timeout: 900_000 });
  if (run.error !== undefined || run.status !== 0) {
    return `note: scipy reference unavailable (${run.error?.message ?? run.stderr.trim().split('\n').at(-1) ?? `exit ${run.status}`})`;
  }
  const parsed = JSON.parse(run.stdout) as { seconds: number; cpu: number; totals: number[]; numpy: string; scipy: string };
  return { seconds: parsed.seconds, cpu: parsed.cpu, totals: parsed.totals, versions: `numpy ${parsed.numpy}, scipy ${parsed.scipy}` };
}

function plan0Lengths(): number[] {
  return [...createMorletPlan(SAMPLES, PLAN_OPTIONS).inverseLengths].sort((p, q) => p - q);
}

const WORKLOAD: MorletWorkload = {
  epochs: EPOCHS,
  channels: CHANNELS,
  samples: SAMPLES,
  samplingRate: SAMPLING_RATE,
  low: F_LOW,
  high: F_HIGH,
  count: COUNT,
  cycles: CYCLES,
};

function worstRelative(ours: ArrayLike<number>, reference: readonly number[]): number {
  let worst = 0;
  reference.forEach((v, j) => {
    worst = Math.max(worst, Math.abs(ours[j]! - v) / Math.abs(v));
  });
  return worst;
}

/** Runs of each timed configuration, interleaved so that a noisy spell of the machine hits all alike. */
const RUNS = 3;

function median(values: number[]): number {
  const sorted = [...values].sort((p, q) => p - q);
  return sorted[Math.floor(sorted.length / 2)]!;
}

function spread(values: number[]): string {
  return `${median(values).toFixed(3)} s  (${Math.min(...values).toFixed(3)}–${Math.max(...values).toFixed(3)})`;
}

/** Runs the Morlet benchmark and returns printable lines. */
export async function benchMorlet(): Promise<string[]> {
  const data = makeData();
  const signals = EPOCHS * CHANNELS;
  timeOurs(data.slice(0, 64)); // warm-up for the JIT
  const { seconds, cpu, totals } = timeOurs(data);
  const inverses = timeInverses(signals);
  const signal = packSignal(data, WORKLOAD);
  // Warm-up for the job path, and a helper thread started (it stays up 30 s between jobs).
  const small = { ...WORKLOAD, epochs: 4, channels: 8 };
  timeEngineMorlet(packSignal(data.slice(0, 32), small), small, 2);
  await new Promise((resolve) => setTimeout(resolve, 2000));
  timeEngineMorlet(packSignal(data.slice(0, 32), small), small, 2);
  const job1: number[] = [],
    job2: number[] = [],
    scipy1: number[] = [],
    scipy1Cpu: number[] = [],
    scipy2: number[] = [];
  let threads = 0;
  let jobTotals: Float64Array = new Float64Array(0);
  let reference: Exclude<ReturnType<typeof timeScipy>, string> | null = null;
  let missing: string | null = null;
  for (let run = 0; run < RUNS; run++) {
    job1.push(timeEngineMorlet(signal, WORKLOAD, 1).seconds);
    const two = timeEngineMorlet(signal, WORKLOAD, 2);
    job2.push(two.seconds);
    threads = two.threads;
    jobTotals = two.totals;
    if (missing !== null) continue;
    const one = timeScipy(1);
    if (typeof one === 'string') {
      missing = one;
      continue;
    }
    reference = one;
    scipy1.push(one.seconds);
    scipy1Cpu.push(one.cpu);
    const both = timeScipy(2);
    if (typeof both !== 'string') scipy2.push(both.seconds);
  }
  const lines = [
    `morlet: ${EPOCHS} epochs × ${CHANNELS} channels × ${SAMPLES} samples at ${SAMPLING_RATE} Hz, ${COUNT} frequencies ${F_LOW}–${F_HIGH} Hz (log), ${CYCLES} cycles; median of ${RUNS} (min–max)`,
    `  rhythmetric kernel, 1 thread    ${seconds.toFixed(3)} s  (one run; ${((seconds / signals) * 1e3).toFixed(2)} ms per channel-epoch; CPU ${cpu.toFixed(3)} s)`,
    `    of which inverse FFTs          ${inverses.seconds.toFixed(3)} s  (CPU ${inverses.cpu.toFixed(3)} s, ${Math.round((100 * inverses.cpu) / cpu)} % of the kernel's CPU: ${signals}×${COUNT} inverses of lengths ${[...new Set(plan0Lengths())].join('/')}, timed alone)`,
    `  rhythmetric job, 1 thread       ${spread(job1)}`,
    `  rhythmetric job, 2 threads      ${spread(job2)}  (${threads} threads computed channels)`,
  ];
  if (reference === null) {
    lines.push(`  ${missing ?? 'note: scipy reference unavailable'}`);
    return lines;
  }
  lines.push(`  scipy/numpy, workers=1         ${spread(scipy1)}  (CPU median ${median(scipy1Cpu).toFixed(3)} s)`);
  if (scipy2.length > 0) lines.push(`  scipy/numpy, workers=2         ${spread(scipy2)}`);
  lines.push(`  ratio kernel 1 thread / scipy workers=1: ${(seconds / median(scipy1)).toFixed(2)}  (target ≤ 1; CPU seconds: ${(cpu / median(scipy1Cpu)).toFixed(2)})`);
  lines.push(`  ratio job 2 threads / scipy workers=1:   ${(median(job2) / median(scipy1)).toFixed(2)}  (target ≤ 0.6)`);
  if (scipy2.length > 0) lines.push(`  ratio job 2 threads / scipy workers=2:   ${(median(job2) / median(scipy2)).toFixed(2)}`);
  lines.push(
    `  reference: ${reference.versions} via /usr/bin/python3, vectorised over channels; per-frequency power sums agree to ${worstRelative(totals, reference.totals).toExponential(1)} (kernel), ${worstRelative(jobTotals, reference.totals).toExponential(1)} (job) relative`,
  );
  return lines;
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const line of await benchMorlet()) console.log(line);
}
