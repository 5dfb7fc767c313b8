/**
 * A 2-hour, 64-channel, 512 Hz EDF+C recording through the real server (a child process on
 * 127.0.0.1, see bench/upload.ts): build the file, upload it (POST /v1/signals?format=edf), then run
 * a Welch job over fixed 4-s epochs and one over 4-s epochs after each 'probe' event.
 *
 * The file is seeded and synthetic: per channel N(0, 10²) µV noise, a 10 Hz rhythm of 15 µV whose
 * amplitude differs across channels, and a 'probe' annotation every 30 s (at 15 s, 45 s, …). It is
 * written without holding the recording in memory: writeEdf makes the header from a 1-record file
 * (so its fields are the project's own), the two fields that depend on the length are patched (the
 * number of data records at offset 236 and the annotation signal's samples per record), and the
 * 7200 one-second records are appended as int16 with the same calibration, in batches.
 * The server stores the int16 codes as they are (450 MiB), and a job reads them a channel row at a
 * time through store.openSamples (src/jobs/open-source.ts), converting to float64 as it reads; the
 * RSS figure shows what the server and the engine hold beyond that.
 *
 * Then the engine alone, with no server: the same samples (the
 * same generators; past 2 hours each channel's 2 hours repeat) written channel-major as int16, read a row at a time by a file-backed
 * SampleSource in a fresh child process per length (RECORDING_HOURS, default "0.5,2,8" hours; the
 * shorter ones read a prefix of the longest file), the fixed-4-s Welch job timed and the child's peak
 * RSS (VmHWM) read. Its 2-hour record must have the server's result hash. Beside them, the Welch
 * benchmark's job (bench/welch.ts, one thread) gives the per-sample rate they are compared with.
 * RECORDING_SERVER=0 leaves out the server part.
 *
 * Bounded: 10 minutes for the server part and 10 for the rest, whatever happens; children are killed
 * and the temp files removed. Prints figures, never asserts. Run: npx tsx bench/recording.ts
 */
import { spawnSync } from 'node:child_process';
import { closeSync, createReadStream, openSync, readSync } from 'node:fs';
import { mkdtemp, open, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { createRandom, type Random } from '../src/common/random.js';
import { analyze } from '../src/engine/analyze.js';
import { normalizeRecipe } from '../src/recipes/normalize.js';
import { resolveRecipe } from '../src/recipes/resolve.js';
import { encodeTal, readEdfHeader, writeEdf, type EdfWriteSignal } from '../src/signals/edf/index.js';
import { checkRead, type SampleSource } from '../src/signals/sample-source.js';
import { callJson, mib, rate, readVm, startChildServer, uploadStream, type ChildServer } from './upload.js';
import { welchJobTimes } from './welch.js';

const CHANNELS = 64;
const SAMPLING_RATE = 512;
const RECORDS = 7200;
const EVENT_EVERY = 30;
const EVENT_FIRST = 15;
const PHYSICAL_MINIMUM = -3276.8;
const PHYSICAL_MAXIMUM = 3276.7;
const DIGITAL_MINIMUM = -32768;
const DIGITAL_MAXIMUM = 32767;
/** Bytes of the annotation signal per record: room for "+7199␔␔␀" and "+7185␔probe␔␀" (21 bytes). */
const ANNOTATION_BYTES = 32;
const BATCH_RECORDS = 60;
const BOUND_MS = 600_000;
const POLL_MS = 500;
const MiB = 2 ** 20;
const FINISHED = new Set(['succeeded', 'failed', 'canceled']);

const LABELS = Array.from({ length: CHANNELS }, (_, c) => `E${c + 1}`);
const RECIPES = [
  { name: 'fixed 4 s', recipe: { method: 'welch', epoching: { mode: 'fixed', epochSeconds: 4 } } },
  { name: "events 'probe' 0–4 s", recipe: { method: 'welch', epoching: { mode: 'events', labels: ['probe'], beforeSeconds: 0, afterSeconds: 4 } } },
] as const;

class Bound extends Error {}

const exists = (path: string) =>
  stat(path).then(
    () => true,
    () => false,
  );

/** One record of one channel, physical µV; the generators carry on from record to record. */
function recordSamples(random: Random, channel: number, record: number, out: Float64Array): void {
  const alpha = 15 * (0.5 + channel / CHANNELS);
  for (let i = 0; i < SAMPLING_RATE; i++) {
    const t = record + i / SAMPLING_RATE;
    out[i] = 10 * random.normal() + alpha * Math.sin(2 * Math.PI * 10 * t + channel);
  }
}

/** Physical → digital with the header's calibration, as writeEdf quantizes. */
function quantize(x: number): number {
  const gain = (PHYSICAL_MAXIMUM - PHYSICAL_MINIMUM) / (DIGITAL_MAXIMUM - DIGITAL_MINIMUM);
  const level = (x - PHYSICAL_MINIMUM) / gain + DIGITAL_MINIMUM;
  return Math.min(DIGITAL_MAXIMUM, Math.max(DIGITAL_MINIMUM, Math.round(level)));
}

const signalFields = (samples: Float64Array): EdfWriteSignal[] =>
  LABELS.map((label) => ({
    label,
    samples,
    samplingRate: SAMPLING_RATE,
    physicalDimension: 'uV',
    physicalMinimum: PHYSICAL_MINIMUM,
    physicalMaximum: PHYSICAL_MAXIMUM,
  }));

function patchField(header: Uint8Array, offset: number, value: number): void {
  const text = String(value).padEnd(8, ' ');
  for (let i = 0; i < 8; i++) header[offset + i] = text.charCodeAt(i);
}

/**
 * Writes the recording to `path` and returns its size, after checking the patched header by
 * reading it back and checking the appended records' quantization against writeEdf's own record.
 */
async function writeRecording(path: string, lines: string[]): Promise<number> {
  const randoms = LABELS.map((_, c) => createRandom(7000 + c));
  const first = LABELS.map((_, c) => {
    const x = new Float64Array(SAMPLING_RATE);
    recordSamples(randoms[c]!, c, 0, x);
    return x;
  });
  // Only the header of this 1-record file is kept (the physical range is given, so it does not
  // depend on the data); its E1 samples serve to check that quantize() matches writeEdf.
  const probe = writeEdf({
    signals: signalFields(first[0]!),
    recordDuration: 1,
    startDate: { year: 2024, month: 3, day: 4, hour: 22, minute: 0, second: 0 },
    annotations: [],
  });
  const ns = CHANNELS + 1;
  const headerBytes = 256 * (ns + 1);
  const header = probe.slice(0, headerBytes);
  patchField(header, 236, RECORDS);
  patchField(header, 256 + ns * 216 + 8 * CHANNELS, ANNOTATION_BYTES / 2);
  const parsed = readEdfHeader(header);
  const recordBytes = CHANNELS * SAMPLING_RATE * 2 + ANNOTATION_BYTES;
  const checks = [
    ['variant', parsed.variant, 'EDF+C'],
    ['number of data records (offset 236)', parsed.recordCount, RECORDS],
    ['header bytes', parsed.headerBytes, headerBytes],
    ['record bytes', parsed.recordBytes, recordBytes],
    ['annotation signal', parsed.annotationSignals.join(','), String(CHANNELS)],
    ['annotation samples per record', parsed.signals[CHANNELS]!.samplesPerRecord, ANNOTATION_BYTES / 2],
    ['record duration', parsed.recordDuration, 1],
  ] as const;
  const wrong = checks.filter(([, got, want]) => got !== want);
  if (wrong.length > 0) throw new Error(`patched EDF header read back wrong: ${wrong.map(([what, got, want]) => `${what} ${got}, not ${want}`).join('; ')}`);
  const view = new DataView(probe.buffer, probe.byteOffset + headerBytes);
  for (let k = 0; k < SAMPLING_RATE; k++) {
    if (view.getInt16(2 * k, true) !== quantize(first[0]![k]!)) throw new Error(`quantization differs from writeEdf at sample ${k}`);
  }
  lines.push(`  header from writeEdf (1 record), patched and read back: ${checks.map(([what, got]) => `${what} ${got}`).join(', ')}; record 0 of E1 quantized as writeEdf does`);

  const handle = await open(path, 'w');
  try {
    await handle.write(header, 0, header.length, 0);
    const batch = Buffer.alloc(BATCH_RECORDS * recordBytes);
    const x = new Float64Array(SAMPLING_RATE);
    let position = headerBytes;
    for (let r0 = 0; r0 < RECORDS; r0 += BATCH_RECORDS) {
      const r1 = Math.min(RECORDS, r0 + BATCH_RECORDS);
      batch.fill(0);
      for (let r = r0; r < r1; r++) {
        const at = (r - r0) * recordBytes;
        for (let c = 0; c < CHANNELS; c++) {
          if (r === 0) x.set(first[c]!);
          else recordSamples(randoms[c]!, c, r, x);
          const base = at + c * SAMPLING_RATE * 2;
          for (let k = 0; k < SAMPLING_RATE; k++) batch.writeInt16LE(quantize(x[k]!), base + 2 * k);
        }
        const tals = [encodeTal(r, null, [''])];
        if (r >= EVENT_FIRST && (r - EVENT_FIRST) % EVENT_EVERY === 0) tals.push(encodeTal(r, null, ['probe']));
        let t = at + CHANNELS * SAMPLING_RATE * 2;
        for (const tal of tals) {
          if (t + tal.length > at + recordBytes) throw new Error(`record ${r}: annotations need more than ${ANNOTATION_BYTES} bytes`);
          batch.set(tal, t);
          t += tal.length;
        }
      }
      const length = (r1 - r0) * recordBytes;
      for (let done = 0; done < length; ) done += (await handle.write(batch, done, length - done, position + done)).bytesWritten;
      position += length;
    }
  } finally {
    await handle.close();
  }
  return (await stat(path)).size;
}

interface JobState {
  id: string;
  state: string;
  problem?: { detail?: string };
}

interface RecordBody {
  result: { estimate: { epochsUsed: number; segmentsPerEpoch?: number }; epoching?: { kept?: unknown[]; dropped?: unknown[] } };
  resultHash: string;
  provenance: { durationMs: number };
}

interface JobFigures {
  line: string;
  resultHash?: string;
  engineSeconds?: number;
}

async function runJob(server: ChildServer, signalId: string, recipe: unknown, remaining: () => number): Promise<JobFigures> {
  server.resetPeak();
  const t0 = performance.now();
  const submitted = await callJson<JobState>(server.base, 'POST', '/v1/jobs', { signal: signalId, recipe }, [200, 202], remaining());
  let job = submitted.json;
  while (!FINISHED.has(job.state)) {
    await sleep(POLL_MS);
    job = (await callJson<JobState>(server.base, 'GET', `/v1/jobs/${job.id}`, undefined, [200], remaining())).json;
  }
  const wall = performance.now() - t0;
  const peak = server.peakRss();
  if (job.state !== 'succeeded') return { line: `${job.state} after ${(wall / 1000).toFixed(1)} s: ${job.problem?.detail ?? '(no detail)'}; server peak VmRSS ${mib(peak)} MiB` };
  const fetched = await fetch(`${server.base}/v1/jobs/${job.id}/record`, { signal: AbortSignal.timeout(remaining()) });
  const text = await fetched.text();
  const record = JSON.parse(text) as RecordBody;
  const epoching = record.result.epoching;
  const kept = epoching?.kept?.length;
  const dropped = epoching?.dropped?.length;
  const line =
    `submit → succeeded ${(wall / 1000).toFixed(1)} s (engine ${(record.provenance.durationMs / 1000).toFixed(1)} s), epochs used ${record.result.estimate.epochsUsed}` +
    `${kept === undefined ? '' : ` (kept ${kept}, dropped ${dropped ?? 0})`}, record ${(Buffer.byteLength(text) / 1024).toFixed(0)} KiB; server peak VmRSS ${mib(peak)} MiB`;
  return { line, resultHash: record.resultHash, engineSeconds: record.provenance.durationMs / 1000 };
}

/** What the server part found for the fixed-4-s job: the streamed engine must give the same hash. */
interface ServerFigures {
  resultHash?: string;
  engineSeconds?: number;
}

async function benchServer(lines: string[], figures: ServerFigures): Promise<void> {
  const began = performance.now();
  const remaining = (): number => {
    const left = began + BOUND_MS - performance.now();
    if (left <= 0) throw new Bound();
    return Math.ceil(left);
  };
  lines.push(`recording: ${RECORDS / 3600} h × ${CHANNELS} ch × ${SAMPLING_RATE} Hz EDF+C (1-s records, int16, 'probe' every ${EVENT_EVERY} s), to a child server over loopback`);
  const dir = await mkdtemp(join(tmpdir(), 'rhythmetric-recording-'));
  let server: ChildServer | null = null;
  try {
    // RECORDING_EDF=<path> keeps the built file there and reuses it on later runs (it is seeded, so the same).
    const kept = process.env.RECORDING_EDF;
    const path = kept ?? join(dir, 'recording.edf');
    const t0 = performance.now();
    const reused = kept !== undefined && (await exists(kept));
    const size = reused ? (await stat(kept)).size : await writeRecording(path, lines);
    const buildMs = performance.now() - t0;
    const samples = RECORDS * CHANNELS * SAMPLING_RATE;
    lines.push(
      `  file ${(size / 1e6).toFixed(1)} MB (${mib(size)} MiB, ${samples.toLocaleString('en')} samples), ${reused ? 'reused' : `built in ${(buildMs / 1000).toFixed(1)} s`}; VmHWM of this process so far ${mib(readVm(process.pid, 'VmHWM') ?? 0)} MiB (earlier benchmarks in the same process count too)`,
    );
    server = await startChildServer({
      BODY_LIMIT_BYTES: String(2 * size),
      MAX_SAMPLES: String(2 * samples),
      REQUEST_TIMEOUT_MS: String(BOUND_MS),
    });
    lines.push(`  server pid ${server.pid}, idle VmRSS ${mib(readVm(server.pid, 'VmRSS') ?? 0)} MiB`);
    server.resetPeak();
    const sent = await uploadStream(server.base, '/v1/signals?format=edf', createReadStream(path, { highWaterMark: MiB }), size, remaining());
    const signal = JSON.parse(sent.body) as { id: string; channels: string[]; samplesPerEpoch: number; samplingRate: number; events?: unknown[]; bytes: number };
    lines.push(
      `  upload: 201 after ${(sent.answeredMs / 1000).toFixed(1)} s (${rate(size, sent.answeredMs)} MiB/s end to end, body sent in ${(sent.sentMs / 1000).toFixed(1)} s); ` +
        `stored ${signal.channels.length} ch × ${signal.samplesPerEpoch} samples at ${signal.samplingRate} Hz, ${signal.events?.length ?? 0} events, ${mib(signal.bytes)} MiB as stored (${mib(signal.channels.length * signal.samplesPerEpoch * 8)} MiB as float64); server peak VmRSS ${mib(server.peakRss())} MiB`,
    );
    // RECORDING_UPLOAD_ONLY=1 stops after the upload, for measuring the upload alone.
    if (process.env.RECORDING_UPLOAD_ONLY !== '1') {
      for (const { name, recipe } of RECIPES) {
        const job = await runJob(server, signal.id, recipe, remaining);
        lines.push(`  job, ${name}: ${job.line}`);
        if (name === 'fixed 4 s') Object.assign(figures, { resultHash: job.resultHash, engineSeconds: job.engineSeconds });
      }
    }
    lines.push(`  server VmHWM at the end ${mib(readVm(server.pid, 'VmHWM') ?? 0)} MiB; total ${((performance.now() - began) / 1000).toFixed(1)} s`);
  } catch (error) {
    if (!(error instanceof Bound || (error instanceof Error && /took longer than|TimeoutError/.test(`${error.name} ${error.message}`)))) {
      throw new Error(`${error instanceof Error ? error.message : String(error)}\n  after: ${lines.join('\n')}\n  server output (tail): ${server?.tail().trim() || '(none)'}`);
    }
    lines.push(`  stopped at the ${BOUND_MS / 60_000} min bound`);
  } finally {
    await server?.stop();
    await rm(dir, { recursive: true, force: true });
  }
}

const STREAM_RECIPE = RECIPES[0].recipe;

/** Hours of the engine-alone runs, from RECORDING_HOURS. */
function streamHours(): number[] {
  const hours = (process.env.RECORDING_HOURS ?? '0.5,2,8').split(',').map((h) => Number(h.trim()));
  if (hours.some((h) => !(h > 0 && Number.isInteger(h * 3600)))) throw new Error(`RECORDING_HOURS must list positive hours of whole seconds, got "${process.env.RECORDING_HOURS}"`);
  return [...new Set(hours)].sort((a, b) => a - b);
}

/**
 * Every channel's `records` seconds one after another as int16: the EDF's samples, channel-major,
 * for the first 2 hours; a longer file repeats each channel's 2 hours (the cost of the analysis does
 * not depend on the values, and generating 8 hours took longer than analysing them).
 */
async function writeChannelMajor(path: string, records: number, remaining: () => number): Promise<number> {
  const handle = await open(path, 'w');
  try {
    const x = new Float64Array(SAMPLING_RATE);
    const generated = Math.min(records, RECORDS);
    const block = new Int16Array(generated * SAMPLING_RATE);
    const bytes = new Uint8Array(block.buffer);
    let position = 0;
    for (let c = 0; c < CHANNELS; c++) {
      remaining();
      const random = createRandom(7000 + c);
      for (let r = 0; r < generated; r++) {
        recordSamples(random, c, r, x);
        for (let k = 0; k < SAMPLING_RATE; k++) block[r * SAMPLING_RATE + k] = quantize(x[k]!);
      }
      for (let r0 = 0; r0 < records; r0 += generated) {
        const length = Math.min(generated, records - r0) * SAMPLING_RATE * 2;
        for (let done = 0; done < length; ) done += (await handle.write(bytes, done, length - done, position + done)).bytesWritten;
        position += length;
      }
    }
  } finally {
    await handle.close();
  }
  return (await stat(path)).size;
}

/** Physical values of int16 samples, as the EDF decoder calibrates them ((d − digital min) · gain + physical min). */
function calibrate(digits: Int16Array, into: Float64Array, n: number): void {
  const gain = (PHYSICAL_MAXIMUM - PHYSICAL_MINIMUM) / (DIGITAL_MAXIMUM - DIGITAL_MINIMUM);
  for (let i = 0; i < n; i++) into[i] = (digits[i]! - DIGITAL_MINIMUM) * gain + PHYSICAL_MINIMUM;
}

/**
 * The first `samples` of each channel of a channel-major int16 file of `stride` samples per channel,
 * read a row at a time and calibrated as the EDF decoder does ((d − digital min) · gain + physical
 * min): what a store that keeps rows as int16 on disk gives the engine.
 */
function fileSource(path: string, samples: number, stride: number): SampleSource {
  const fd = openSync(path, 'r');
  let digits = new Int16Array(0);
  let open = true;
  const shape = { samplingRate: SAMPLING_RATE, channels: LABELS, unit: 'uV', epochCount: 1, samplesPerEpoch: samples };
  return {
    ...shape,
    readRow(epoch, channel, from, to, into) {
      if (!open) throw new Error('the sample source is closed');
      checkRead(shape, epoch, channel, from, to, into);
      const n = to - from;
      if (digits.length < n) digits = new Int16Array(n);
      const bytes = new Uint8Array(digits.buffer, 0, n * 2);
      const at = (channel * stride + from) * 2;
      for (let done = 0; done < bytes.length; ) {
        const got = readSync(fd, bytes, done, bytes.length - done, at + done);
        if (got === 0) throw new Error(`${path} ends before byte ${at + bytes.length}`);
        done += got;
      }
      calibrate(digits, into, n);
    },
    close() {
      if (open) closeSync(fd);
      open = false;
    },
  };
}

interface StreamFigures {
  seconds: number;
  baselineRss: number;
  peakRss: number;
  resultHash: string;
  epochsUsed: number;
}

/** In a child process: the fixed-4-s Welch job over the first `hours` of the file, timed, and the peak RSS. */
function streamChild(path: string, hours: number, stride: number): StreamFigures {
  const source = fileSource(path, hours * 3600 * SAMPLING_RATE, stride);
  const pinned = normalizeRecipe(STREAM_RECIPE);
  // The per-job estimate (src/methods cost) still counts the whole signal as loaded (8 h: 7 GiB),
  // as it is until openSource reads rows from the store.
  const resolved = resolveRecipe(pinned.recipe, pinned.hash, source, { maxJobBytes: 64 * 2 ** 30 });
  const baselineRss = readVm(process.pid, 'VmRSS') ?? 0;
  const t0 = performance.now();
  const record = analyze(source, resolved, { signalId: 'sig_bench', sha256: 'bench', recipeId: pinned.id, mode: 'local' });
  const seconds = (performance.now() - t0) / 1000;
  source.close();
  return { seconds, baselineRss, peakRss: readVm(process.pid, 'VmHWM') ?? 0, resultHash: record.resultHash, epochsUsed: record.result.estimate.epochsUsed };
}

async function benchStreaming(lines: string[], server: ServerFigures): Promise<void> {
  const began = performance.now();
  const remaining = (): number => {
    const left = began + BOUND_MS - performance.now();
    if (left <= 0) throw new Bound();
    return Math.ceil(left);
  };
  const hours = streamHours();
  const longest = hours.at(-1)!;
  const welch = welchJobTimes()[0]!;
  lines.push(
    `engine alone, rows read on demand from a channel-major int16 file (${CHANNELS} ch × ${SAMPLING_RATE} Hz, the same samples), fixed 4-s Welch, one fresh child per length`,
    `  Welch benchmark job (bench/welch.ts: 64 ch × 600 s × 500 Hz, 1 thread, best of 3): ${welch.seconds.toFixed(3)} s, ${(welch.secondsPerSample * 1e9).toFixed(1)} ns per sample`,
  );
  if (server.engineSeconds !== undefined) {
    const perSample = server.engineSeconds / (CHANNELS * RECORDS * SAMPLING_RATE);
    lines.push(
      `  server job above (2 h, rows read from the store by openSource): ${(perSample * 1e9).toFixed(1)} ns per sample, ${(perSample / welch.secondsPerSample).toFixed(2)}× the Welch benchmark's`,
    );
  }
  const dir = await mkdtemp(join(tmpdir(), 'rhythmetric-rows-'));
  try {
    const path = join(dir, 'rows.i16');
    const stride = longest * 3600;
    const t0 = performance.now();
    const size = await writeChannelMajor(path, stride, remaining);
    lines.push(`  file ${mib(size)} MiB (${longest} h), written in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
    for (const h of hours) {
      const child = spawnSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), '--stream', path, String(h), String(stride * SAMPLING_RATE)], {
        encoding: 'utf8',
        timeout: remaining(),
        maxBuffer: 1 << 20,
      });
      const last = child.stdout?.trim().split('\n').at(-1) ?? '';
      if (child.status !== 0 || !last.startsWith('{')) {
        lines.push(`  ${h} h: child ${child.signal ? `killed (${child.signal})` : `exited ${child.status}`}: ${(child.stderr ?? '').trim().slice(-400)}`);
        continue;
      }
      const f = JSON.parse(last) as StreamFigures;
      const perSample = f.seconds / (CHANNELS * h * 3600 * SAMPLING_RATE);
      const same = h * 3600 === RECORDS && server.resultHash ? `; resultHash ${f.resultHash === server.resultHash ? 'equals' : 'DIFFERS from'} the server job's` : '';
      lines.push(
        `  ${h} h: engine ${f.seconds.toFixed(1)} s, ${(perSample * 1e9).toFixed(1)} ns per sample (${(perSample / welch.secondsPerSample).toFixed(2)}× the Welch benchmark's), ` +
          `epochs used ${f.epochsUsed}; peak RSS (VmHWM) ${mib(f.peakRss)} MiB, ${mib(f.peakRss - f.baselineRss)} MiB over the child's RSS before the job${same}`,
      );
    }
  } catch (error) {
    if (!(error instanceof Bound)) throw error;
    lines.push(`  stopped at the ${BOUND_MS / 60_000} min bound`);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

export async function benchRecording(): Promise<string[]> {
  const lines: string[] = [];
  const server: ServerFigures = {};
  if (process.env.RECORDING_SERVER !== '0') await benchServer(lines, server);
  await benchStreaming(lines, server);
  return lines;
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  const at = process.argv.indexOf('--stream');
  if (at >= 0) {
    const [path, hours, stride] = process.argv.slice(at + 1);
    console.log(JSON.stringify(streamChild(path!, Number(hours), Number(stride))));
  } else {
    for (const line of await benchRecording()) console.log(line);
  }
}
