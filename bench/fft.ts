/**
 * Complex FFT micro-benchmark: µs per in-place transform, forward and inverse, at the lengths the Morlet
 * transform (m·2^a, m ∈ {1, 3, 5, 9}) and Welch use. Single thread. Each timed call first refills the
 * arrays from a seeded source (an unscaled transform grows the values by about √n per call); that copy is
 * timed on its own and subtracted, and the best of several rounds is kept, since the machine is shared.
 * fft.js (radix 4, interleaved arrays, out of place) is timed beside ours for powers of two as a yardstick.
 * "inverse[:1000]" is the inverse asked for its first 1000 outputs only (outputCount), as the Morlet
 * kernel asks of its 1000-sample epochs. "scipy inverse" is scipy.fft.ifft (workers=1) per row of a
 * 32-row call, as bench/scipy-morlet.py uses it over an epoch's channels (bench/scipy-fft.py; the best of
 * 7 rounds there too): the Morlet kernel's reference does one such full inverse per trial and frequency.
 *
 * Standalone: `npx tsx bench/fft.ts`. Prints figures; never fails on time.
 */
import FFT from 'fft.js';
import { spawnSync } from 'node:child_process';
import { performance } from 'node:perf_hooks';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { createRandom } from '../src/common/random.js';
import { complexFftPlan } from '../src/dsp/fft.js';

const SIZES = [1024, 1152, 1280, 1536, 2048, 2304, 2560, 3072, 4096];
const ROUNDS = 7;
const ROUND_MS = 40;

function seeded(n: number, seed: number): Float64Array {
  const random = createRandom(seed);
  return new Float64Array(n).map(() => 2 * random.uniform() - 1);
}

/** Best (smallest) µs per call of `body` over ROUNDS rounds of about ROUND_MS each. */
function bestMicros(body: () => void): number {
  let calls = 1;
  // grow the batch until one batch lasts a few ms, so the clock's resolution does not matter
  for (;;) {
    const t0 = performance.now();
    for (let i = 0; i < calls; i++) body();
    if (performance.now() - t0 > 2) break;
    calls *= 2;
  }
  let best = Infinity;
  for (let round = 0; round < ROUNDS; round++) {
    let done = 0;
    const t0 = performance.now();
    let elapsed = 0;
    while (elapsed < ROUND_MS) {
      for (let i = 0; i < calls; i++) body();
      done += calls;
      elapsed = performance.now() - t0;
    }
    best = Math.min(best, (elapsed * 1e3) / done);
  }
  return best;
}

const PREFIX = 1000;

function timeSize(n: number): { forward: number; inverse: number; prefix: number; copy: number; fftJs?: number } {
  const srcRe = seeded(n, n),
    srcIm = seeded(n, 3 * n + 1);
  const re = new Float64Array(n),
    im = new Float64Array(n);
  const plan = complexFftPlan(n);
  const copy = bestMicros(() => {
    re.set(srcRe);
    im.set(srcIm);
  });
  const forward =
    bestMicros(() => {
      re.set(srcRe);
      im.set(srcIm);
      plan.transform(re, im);
    }) - copy;
  const inverse =
    bestMicros(() => {
      re.set(srcRe);
      im.set(srcIm);
      plan.transform(re, im, true);
    }) - copy;
  const count = Math.min(PREFIX, n);
  const prefix =
    bestMicros(() => {
      re.set(srcRe);
      im.set(srcIm);
      plan.transform(re, im, true, count);
    }) - copy;
  if ((n & (n - 1)) !== 0) return { forward, inverse, prefix, copy };
  const f = new FFT(n);
  const input = f.createComplexArray() as number[];
  const output = f.createComplexArray() as number[];
  for (let i = 0; i < n; i++) {
    input[2 * i] = srcRe[i]!;
    input[2 * i + 1] = srcIm[i]!;
  }
  // out of place, so no refill is needed
  const fftJs = bestMicros(() => {
    f.inverseTransform(output, input);
  });
  return { forward, inverse, prefix, copy, fftJs };
}

const SCIPY_ROWS = 32;

/** µs per row of scipy.fft.ifft at `n`, or a note when the reference cannot run. */
function timeScipy(n: number): { micros: Record<string, number>; versions: string } | string {
  const script = fileURLToPath(new URL('./scipy-fft.py', import.meta.url));
  const run = spawnSync('/usr/bin/python3', [script, String(SCIPY_ROWS), String(n)], { encoding: 'utf8', timeout: 600_000 });
  if (run.error !== undefined || run.status !== 0) {
    return `note: scipy reference unavailable (${run.error?.message ?? run.stderr.trim().split('\n').at(-1) ?? `exit ${run.status}`})`;
  }
  const parsed = JSON.parse(run.stdout) as { micros: Record<string, number>; numpy: string; scipy: string };
  return { micros: parsed.micros, versions: `numpy ${parsed.numpy}, scipy ${parsed.scipy}` };
}

/** Runs the FFT micro-benchmark and returns printable lines. */
export async function benchFft(): Promise<string[]> {
  const lines = [
    `fft: µs per complex transform (best of ${ROUNDS} rounds; the input refill, column copy, is subtracted), single thread`,
    `      n   inverse   inverse[:${PREFIX}]   forward   copy   scipy inverse   fft.js inverse`,
  ];
  for (const n of SIZES) timeSize(n); // warm-up for the JIT, every size once
  let scipy: ReturnType<typeof timeScipy> = 'note: scipy reference not run';
  for (const n of SIZES) {
    const t = timeSize(n);
    // right after ours at the same size, so that both see about the same load on the shared machine
    if (typeof scipy !== 'string' || n === SIZES[0]) scipy = timeScipy(n);
    const reference = typeof scipy === 'string' ? '' : scipy.micros[String(n)]!.toFixed(2);
    const js = t.fftJs === undefined ? '' : t.fftJs.toFixed(2);
    lines.push(
      `  ${String(n).padStart(5)} ${t.inverse.toFixed(2).padStart(9)} ${t.prefix.toFixed(2).padStart(15)} ${t.forward.toFixed(2).padStart(9)} ${t.copy.toFixed(2).padStart(6)} ${reference.padStart(15)} ${js.padStart(16)}`,
    );
  }
  lines.push(typeof scipy === 'string' ? `  ${scipy}` : `  scipy inverse: ${scipy.versions} via /usr/bin/python3, per row of a ${SCIPY_ROWS}-row call`);
  return lines;
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const line of await benchFft()) console.log(line);
}
