/**
 * Multitaper throughput: 200 epochs × 32 channels × 1000 samples, NW = 4, K = 7, fftLength 1024,
 * single thread, beside the same computation in scipy/numpy (bench/scipy-multitaper.py).
 *
 * Standalone: `npx tsx bench/multitaper.ts`. Prints figures; never fails on time.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { createMultitaperPlan, type TaperWeighting } from '../src/dsp/multitaper.js';
import { sineHashSignals } from './sine-hash.js';

const EPOCHS = 200;
const CHANNELS = 32;
const SAMPLES = 1000;
const TIME_BANDWIDTH = 4;
const TAPERS = 7;
const FFT_LENGTH = 1024;
const SAMPLING_RATE = 1000;

function makeData(): Float64Array[] {
  return sineHashSignals(EPOCHS * CHANNELS, SAMPLES);
}

function timeOurs(data: Float64Array[], weighting: TaperWeighting): { seconds: number; iterations: number } {
  const start = performance.now();
  // The plan (tapers, FFT, scratch) is built inside the timed region, once, as the engine would.
  const plan = createMultitaperPlan(SAMPLES, {
    samplingRate: SAMPLING_RATE,
    timeBandwidth: TIME_BANDWIDTH,
    taperCount: TAPERS,
    fftLength: FFT_LENGTH,
    weighting,
    detrend: 'mean',
  });
  let iterations = 0;
  let checksum = 0;
  for (const x of data) {
    const r = plan.compute(x);
    iterations = Math.max(iterations, r.iterations);
    checksum += r.psd[100]!;
  }
  if (!Number.isFinite(checksum)) throw new Error('non-finite PSD in benchmark');
  return { seconds: (performance.now() - start) / 1000, iterations };
}

function timeScipy(): { equal: number; adaptive: number; versions: string } | string {
  const script = fileURLToPath(new URL('./scipy-multitaper.py', import.meta.url));
  const run = spawnSync('/usr/bin/python3', [script, String(EPOCHS), String(CHANNELS), String(SAMPLES), String(TIME_BANDWIDTH), String(TAPERS), String(FFT_LENGTH)], {
    encoding: 'utf8',
    timeout: 600_000,
  });
  if (run.error !== undefined || run.status !== 0) {
    return `scipy reference unavailable (${run.error?.message ?? run.stderr.trim().split('\n').at(-1) ?? `exit ${run.status}`})`;
  }
  const parsed = JSON.parse(run.stdout) as { equal: number; adaptive: number; numpy: string; scipy: string };
  return { equal: parsed.equal, adaptive: parsed.adaptive, versions: `numpy ${parsed.numpy}, scipy ${parsed.scipy}` };
}

/** Runs the multitaper benchmark and returns printable lines. */
export async function benchMultitaper(): Promise<string[]> {
  const data = makeData();
  const signals = EPOCHS * CHANNELS;
  timeOurs(data.slice(0, 64), 'equal'); // warm-up for the JIT
  const lines = [`multitaper: ${EPOCHS} epochs × ${CHANNELS} channels × ${SAMPLES} samples, NW ${TIME_BANDWIDTH}, K ${TAPERS}, fftLength ${FFT_LENGTH}, single thread`];
  const ours: Record<string, number> = {};
  for (const weighting of ['equal', 'adaptive'] as const) {
    const { seconds, iterations } = timeOurs(data, weighting);
    ours[weighting] = seconds;
    const extra = weighting === 'adaptive' ? `, max ${iterations} iterations` : '';
    lines.push(`  rhythmetric ${weighting.padEnd(8)} ${seconds.toFixed(3)} s  (${((seconds / signals) * 1e6).toFixed(1)} µs per channel-epoch, ${(EPOCHS / seconds).toFixed(1)} epochs/s${extra})`);
  }
  const reference = timeScipy();
  if (typeof reference === 'string') {
    lines.push(`  ${reference}`);
  } else {
    for (const weighting of ['equal', 'adaptive'] as const) {
      const theirs = reference[weighting];
      lines.push(`  scipy/numpy ${weighting.padEnd(8)} ${theirs.toFixed(3)} s  (ratio rhythmetric/scipy ${(ours[weighting]! / theirs).toFixed(2)})`);
    }
    lines.push(`  reference: ${reference.versions} via /usr/bin/python3, vectorised over channels`);
  }
  lines.push(...memoryInChild());
  return lines;
}

/**
 * Peak memory of the whole service path (engine analyze() on one 200 × 32 × 1000 signal, adaptive
 * multitaper), measured in a fresh child process so earlier blocks do not count: the growth of the
 * peak resident set over the baseline taken before the input exists, against the input's size.
 */
function memoryInChild(): string[] {
  const child = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), '--memory'], { encoding: 'utf8', timeout: 120_000 });
  const line = child.stdout.trim().split('\n').at(-1) ?? '';
  return child.status === 0 && line.startsWith('memory') ? [`  ${line}`] : [`  memory: not measured (${child.stderr.trim().split('\n').at(-1) ?? `exit ${child.status}`})`];
}

async function measureMemory(): Promise<void> {
  const { analyze } = await import('../src/engine/analyze.js');
  const { normalizeRecipe } = await import('../src/recipes/normalize.js');
  const { resolveRecipe } = await import('../src/recipes/resolve.js');
  const pinned = normalizeRecipe({ method: 'multitaper', timeBandwidth: TIME_BANDWIDTH, taperCount: TAPERS, fftLength: FFT_LENGTH });
  const baseline = process.memoryUsage().rss;
  const data = new Float64Array(EPOCHS * CHANNELS * SAMPLES);
  makeData().forEach((x, i) => data.set(x, i * SAMPLES));
  const signal = { samplingRate: SAMPLING_RATE, channels: Array.from({ length: CHANNELS }, (_, c) => `E${c}`), unit: 'uV', epochCount: EPOCHS, samplesPerEpoch: SAMPLES, data };
  analyze(signal, resolveRecipe(pinned.recipe, pinned.hash, signal), { signalId: 'sig_bench', sha256: 'bench', recipeId: pinned.id, mode: 'local' });
  const peak = process.resourceUsage().maxRSS * 1024;
  const input = data.byteLength;
  console.log(
    `memory: analyze() peak resident growth ${((peak - baseline) / 2 ** 20).toFixed(1)} MiB for a ${(input / 2 ** 20).toFixed(1)} MiB input (${((peak - baseline) / input).toFixed(2)}× the input, counting the generator's temporary copy; target < 3×)`,
  );
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  if (process.argv.includes('--memory')) await measureMemory();
  else for (const line of await benchMultitaper()) console.log(line);
}
