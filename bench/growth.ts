/**
 * How the time and peak memory of analyze() grow with the size of the input, for Welch, multitaper
 * and Morlet: from each method's base workload, one of channel count, epoch length and epoch count
 * is doubled three times (4 points) while the other two stay at the base. Everything runs on one
 * thread (no channel runner). Each point runs in a child process of its own (`--point`), and
 * CHILD_ROUNDS such children per point are run in turn over all points:
 *
 * - memory: the child's first analyze() fills the caches (DPSS tapers, FFT plans); read is the peak
 *   resident set (VmHWM, reset through /proc/self/clear_refs just before the signal is made) minus
 *   the resident set at that moment, so the input itself counts, as it does in a worker;
 * - time: after WARM_MS of warm-up, ROUNDS runs, each after a full GC; the least CPU time (user +
 *   system of the process) over all of a point's children is fitted (other work stretches wall time
 *   far more than CPU time); the exponent of the least wall time is printed beside it.
 *   One child per point, because sizes timed side by side in one child were not independent: there
 *   Welch's base point took 57–66 ms of CPU beside the three larger sizes against 25 ms in a
 *   process holding only small ones, which pulled every slope under 1. Two children per point, in
 *   turn, because one child per point measured the same base workload at 0.036–0.063 s at a load
 *   average of 8.
 *
 * The exponent b of time ≈ a·n^b (and of memory) is fitted by least squares on the logs
 * (bench/power-law-fit.ts) and printed beside what one would expect:
 * - channels and epoch count: b ≈ 1, every channel–epoch is the same independent work (common practice);
 * - epoch length, Welch: b ≈ 1, segments keep their length and their count grows with the epoch
 *   (common practice);
 * - epoch length, multitaper and Morlet: one FFT of about the epoch's length per taper or frequency,
 *   so n·log n (common practice); the printed expectation is the exponent fitted to n·ln n over the
 *   same n, a little above 1;
 * - memory: b ≈ 1 on every axis, the input and its prepared copies grow with n (Morlet's matrices are
 *   averaged over trials, so they stay put as epochs are added, and its memory grows more slowly there);
 *   a fixed part (code and heap the first run touches, some MiB) pulls the fitted b under 1 where the
 *   input is small, so the peak over the input at the largest point is printed too.
 *
 * Bounded: each child at most 60 s. Prints figures, never asserts. Run: npx tsx bench/growth.ts
 */
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { fitPowerLaw } from './power-law-fit.js';
import { readVm } from './upload.js';

const SAMPLING_RATE = 256;
/** timed runs per child */
const ROUNDS = 4;
/** children per point, run in turn over all points */
const CHILD_ROUNDS = 2;
/**
 * Each size is run until WARM_MS have passed (at least 2 runs) before timing: V8 optimizes a function
 * after enough calls, on a background thread whose CPU time the process's figure counts. With a single
 * warm-up run the smallest Welch point took 1.5–2× its later least time; the longer warm-up did not
 * lift the slopes measured at a load average of 7–12 either, so compilation is not the whole story.
 */
const WARM_MS = 500;
const CHILD_BOUND_MS = 60_000;
const MiB = 2 ** 20;

type Axis = 'channels' | 'epochSeconds' | 'epochs';

interface Workload {
  channels: number;
  epochSeconds: number;
  epochs: number;
}

interface Method {
  name: string;
  recipe: Record<string, unknown>;
  base: Workload;
  /** what b of time should be on the epoch-length axis: 'linear' or 'n log n' */
  lengthGrowth: 'linear' | 'n log n';
}

// Base workloads sized so that the smallest point takes tens of milliseconds and the largest a few
// hundred on one thread. Most of the block's time goes into starting its 60 children under tsx.
const METHODS: readonly Method[] = [
  { name: 'welch', recipe: { method: 'welch', segmentSeconds: 1 }, base: { channels: 32, epochSeconds: 4, epochs: 40 }, lengthGrowth: 'linear' },
  { name: 'multitaper', recipe: { method: 'multitaper', timeBandwidth: 4 }, base: { channels: 32, epochSeconds: 2, epochs: 20 }, lengthGrowth: 'n log n' },
  {
    name: 'morlet',
    recipe: { method: 'morlet', frequencies: { low: 8, high: 40, count: 16 }, cycles: 7 },
    base: { channels: 16, epochSeconds: 2, epochs: 10 },
    lengthGrowth: 'n log n',
  },
];

const AXES: readonly Axis[] = ['channels', 'epochSeconds', 'epochs'];
const AXIS_LABEL: Record<Axis, string> = { channels: 'channels', epochSeconds: 'epoch length', epochs: 'epoch count' };
const STEPS = [1, 2, 4, 8];

interface PointResult {
  /** wall seconds of each timed run */
  seconds: number[];
  /** CPU seconds (user + system, this process) of each timed run */
  cpuSeconds: number[];
  peakGrowthBytes: number;
  inputBytes: number;
  /** false when VmHWM could not be reset, so the peak may be an earlier one */
  peakReset: boolean;
}

type Engine = { makeRun(w: Workload): { run: () => unknown; inputBytes: number } };

async function loadEngine(method: Method): Promise<Engine> {
  const { analyze } = await import('../src/engine/analyze.js');
  const { normalizeRecipe } = await import('../src/recipes/normalize.js');
  const { resolveRecipe } = await import('../src/recipes/resolve.js');
  const pinned = normalizeRecipe(method.recipe);
  return {
    makeRun(w) {
      const samples = w.epochSeconds * SAMPLING_RATE;
      const data = new Float64Array(w.epochs * w.channels * samples);
      // The sine-hash noise of bench/sine-hash.ts (signal k at k·samples), written straight into the
      // packed array so that no temporary copy counts towards the peak.
      for (let i = 0; i < data.length; i++) {
        const h = Math.sin((i + 1) * 12.9898) * 43758.5453;
        data[i] = h - Math.floor(h) - 0.5;
      }
      const signal = { samplingRate: SAMPLING_RATE, channels: Array.from({ length: w.channels }, (_, c) => `E${c + 1}`), unit: 'uV', epochCount: w.epochs, samplesPerEpoch: samples, data };
      const context = { signalId: 'sig_growth', sha256: 'growth', recipeId: pinned.id, mode: 'local' as const };
      return { run: () => analyze(signal, resolveRecipe(pinned.recipe, pinned.hash, signal), context), inputBytes: data.byteLength };
    },
  };
}

const gc = (): void => (globalThis as { gc?: () => void }).gc?.();

/**
 * One point, in this (child) process: the memory of its first run, then the times of ROUNDS runs
 * after WARM_MS of warm-up. Prints one JSON line.
 */
async function runPoint(method: Method, w: Workload): Promise<void> {
  const engine = await loadEngine(method);
  gc();
  const before = readVm(process.pid, 'VmRSS') ?? process.memoryUsage().rss;
  let peakReset = true;
  try {
    // "5" resets the peak resident set (VmHWM) to the current one (Linux ≥ 4.0).
    writeFileSync('/proc/self/clear_refs', '5');
  } catch {
    peakReset = false;
  }
  const { run, inputBytes } = engine.makeRun(w);
  run();
  const peak = readVm(process.pid, 'VmHWM') ?? process.resourceUsage().maxRSS * 1024;
  const warmStart = performance.now();
  for (let r = 0; r < 2 || performance.now() - warmStart < WARM_MS; r++) run();
  const result: PointResult = { seconds: [], cpuSeconds: [], peakGrowthBytes: peak - before, inputBytes, peakReset };
  for (let round = 0; round < ROUNDS; round++) {
    gc();
    const t0 = performance.now();
    const cpu0 = process.cpuUsage();
    run();
    const cpu = process.cpuUsage(cpu0);
    result.seconds.push((performance.now() - t0) / 1000);
    result.cpuSeconds.push((cpu.user + cpu.system) / 1e6);
  }
  console.log(JSON.stringify(result));
}

/** Runs this file in a child with `args`; its last stdout line as JSON, or why there is none. */
function inChild<T>(args: string[]): T | string {
  const child = spawnSync(process.execPath, ['--expose-gc', '--import', 'tsx', fileURLToPath(import.meta.url), ...args], { encoding: 'utf8', timeout: CHILD_BOUND_MS });
  const line = child.stdout?.trim().split('\n').at(-1) ?? '';
  if (child.status !== 0 || !line.startsWith('{')) return `${child.error?.message ?? child.stderr?.trim().split('\n').at(-1) ?? `exit ${child.status}`}`;
  return JSON.parse(line) as T;
}

const fmt = (v: number, digits = 2): string => v.toFixed(digits);
/** The 1-minute load average: other work on this shared machine changes every figure. */
const load = (): string => loadavg()[0]!.toFixed(1);

export async function benchGrowth(): Promise<string[]> {
  const started = performance.now();
  const lines = [
    `growth: analyze() on one thread, ${SAMPLING_RATE} Hz sine-hash noise; one axis doubled 3 times from each method's base, the others held`,
    `  each point in its own child, ${CHILD_ROUNDS} children per point in turn; time: ${ROUNDS} runs per child after ${WARM_MS} ms of warm-up, the least CPU time`,
    '  (user + system; other work on the machine disturbs it less than wall time); b wall: the same fit on the least wall time',
    `  memory: peak resident growth during a child's first run, input included; peak/input at the largest n; load average ${load()} at the start`,
    '  method      axis          n                     CPU s (least)            b cpu  r²     b wall  expected        peak MiB         b mem  peak/input',
  ];
  // Every point in its own child, CHILD_ROUNDS times over in turn, so that a noisy spell of the
  // machine hits one child of each point rather than all of one; the base point serves all 3 axes.
  const measured = new Map<string, PointResult[]>();
  const key = (method: Method, w: Workload) => `${method.name} ${w.channels} ${w.epochSeconds} ${w.epochs}`;
  const sizesOf = (method: Method, axis: Axis) => STEPS.map((step) => ({ ...method.base, [axis]: method.base[axis] * step }));
  const failures = new Map<string, string>();
  for (let round = 0; round < CHILD_ROUNDS; round++) {
    for (const method of METHODS) {
      const seen = new Set<string>();
      for (const w of AXES.flatMap((axis) => sizesOf(method, axis))) {
        const k = key(method, w);
        if (seen.has(k) || failures.has(k)) continue;
        seen.add(k);
        const result = inChild<PointResult>(['--point', JSON.stringify({ method: method.name, workload: w })]);
        if (typeof result === 'string') failures.set(k, result);
        else measured.set(k, [...(measured.get(k) ?? []), result]);
      }
    }
  }
  let notes = 0;
  for (const method of METHODS) {
    lines.push(`  ${method.name} base: ${method.base.channels} ch × ${method.base.epochSeconds} s × ${method.base.epochs} epochs; recipe ${JSON.stringify(method.recipe)}`);
    for (const axis of AXES) {
      const sizes = sizesOf(method, axis);
      const ns = sizes.map((w) => w[axis]);
      const label = `  ${method.name.padEnd(11)} ${AXIS_LABEL[axis].padEnd(13)}`;
      const failed = sizes.map((w) => failures.get(key(method, w))).find((f) => f !== undefined);
      if (failed !== undefined) {
        lines.push(`${label} not measured (${failed})`);
        notes++;
        continue;
      }
      const points = sizes.map((w) => measured.get(key(method, w))!);
      // Memory from each point's first child; time the least over all of its children's runs.
      const results = points.map((p) => p[0]!);
      const cpuSeconds = points.map((p) => p.flatMap((r) => r.cpuSeconds));
      const seconds = points.map((p) => p.flatMap((r) => r.seconds));
      const times = cpuSeconds.map((t) => Math.min(...t));
      const walls = seconds.map((t) => Math.min(...t));
      const peaks = results.map((r) => r.peakGrowthBytes);
      const time = fitPowerLaw(ns, times);
      const wall = fitPowerLaw(ns, walls);
      const last = results.at(-1)!;
      const memory = peaks.every((p) => p > 0) ? fitPowerLaw(ns, peaks) : null;
      const nlogn = fitPowerLaw(
        ns,
        ns.map((n) => n * SAMPLING_RATE * Math.log(n * SAMPLING_RATE)),
      ).b;
      const expected = axis === 'epochSeconds' && method.lengthGrowth === 'n log n' ? `${fmt(nlogn)} (n log n)` : '1 (linear)';
      const nText = axis === 'epochSeconds' ? ns.map((n) => `${n} s`).join(', ') : ns.join(', ');
      lines.push(
        `${label} ${nText.padEnd(21)} ${times
          .map((t) => fmt(t, 3))
          .join(' ')
          .padEnd(24)} ${fmt(time.b).padStart(5)}  ${fmt(time.r2, 3)}  ${fmt(wall.b).padStart(5)}   ${expected.padEnd(15)} ${peaks
          .map((p) => (p / MiB).toFixed(0))
          .join(' ')
          .padEnd(16)} ${(memory === null ? 'n/a' : fmt(memory.b)).padStart(5)}  ${fmt(last.peakGrowthBytes / last.inputBytes, 1)}×`,
      );
      if (results.some((r) => !r.peakReset)) lines.push(`    (VmHWM could not be reset here: the peaks may include the process start)`);
    }
  }
  lines.push(
    '  expected: linear in channels and epochs (independent channel–epochs); Welch linear in epoch length (fixed segments);',
    '  multitaper and Morlet n log n in epoch length (an FFT of about the epoch per taper or frequency): common practice.',
    `  (${((performance.now() - started) / 1000).toFixed(0)} s for ${CHILD_ROUNDS * measured.size} child processes; load average ${load()} at the end${notes > 0 ? `; ${notes} axis(es) not measured` : ''})`,
  );
  return lines;
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const at = process.argv.indexOf('--point');
  if (at >= 0) {
    const spec = JSON.parse(process.argv[at + 1] ?? '{}') as { method: string; workload: Workload };
    const method = METHODS.find((m) => m.name === spec.method);
    if (method === undefined) throw new RangeError(`--point: unknown method ${JSON.stringify(spec.method)}; use one of ${METHODS.map((m) => m.name).join(', ')}`);
    await runPoint(method, spec.workload);
  } else {
    for (const line of await benchGrowth()) console.log(line);
  }
}
