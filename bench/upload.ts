/**
 * A 1 GiB binary upload to the real server, run as a child process (`node --import tsx
 * src/cli/main.ts serve`) on 127.0.0.1 so that its memory is its own: 64 channels × 4 194 304
 * samples (1 epoch, 500 Hz) of little-endian float32, generated on the fly in 1 MiB chunks (seeded
 * noise plus a 10 Hz rhythm) and streamed with node:http, never held whole in memory.
 *
 * - one request: POST /v1/signals?samplingRate=500&channels=E1,…,E64
 * - the resumable path: POST /v1/uploads, 16 PUT parts of 64 MiB, POST …/complete with the SHA-256
 *
 * The server's VmRSS is read from /proc/<pid>/status every 100 ms; its peak and the kernel's VmHWM
 * are printed with the upload time and rate. Skipped with a note below 8 GiB of free disk. Bounded:
 * 5 minutes per request and 10 in all; the child is killed and the temp directory removed whatever happens.
 * Prints figures, never asserts. Run: npx tsx bench/upload.ts
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createHash, type Hash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { mkdtemp, rm, statfs } from 'node:fs/promises';
import { request } from 'node:http';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { Readable } from 'node:stream';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { createRandom } from '../src/common/random.js';

const CHANNELS = 64;
const SAMPLING_RATE = 500;
const CHANNEL_SAMPLES = 4_194_304;
const CHANNEL_BYTES = CHANNEL_SAMPLES * 4;
const TOTAL_BYTES = CHANNELS * CHANNEL_BYTES;
const CHUNK_BYTES = 1 << 20;
const PARTS = 16;
const CHANNELS_PER_PART = CHANNELS / PARTS;
const UPLOAD_BOUND_MS = 300_000;
const TOTAL_BOUND_MS = 600_000;
const MIN_FREE_BYTES = 8 * 2 ** 30;
const MiB = 2 ** 20;

const REPO = fileURLToPath(new URL('..', import.meta.url));

/** A port the kernel just handed out on loopback; free unless someone takes it in between. */
async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      const port = typeof address === 'object' && address !== null ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

/** Reads one `Vm…:  N kB` line of /proc/<pid>/status, in bytes; null once the process is gone. */
export function readVm(pid: number, field: 'VmRSS' | 'VmHWM'): number | null {
  try {
    const match = new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return match ? Number(match[1]) * 1024 : null;
  } catch {
    return null;
  }
}

export interface ChildServer {
  base: string;
  pid: number;
  dataDir: string;
  /** the highest VmRSS seen since the last `resetPeak` (sampled every 100 ms) */
  peakRss(): number;
  resetPeak(): void;
  /** the last lines the child wrote to stderr/stdout, for a failure note */
  tail(): string;
  /** SIGTERM, then SIGKILL after 10 s; removes the data directory */
  stop(): Promise<void>;
}

/**
 * Starts `rhythmetric serve` as a child process on 127.0.0.1 with a temp DATA_DIR, waits for
 * /healthz (at most 60 s) and samples its VmRSS every 100 ms until stopped.
 */
export async function startChildServer(env: Record<string, string>): Promise<ChildServer> {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-bench-'));
  const port = await freePort();
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'src/cli/main.ts', 'serve'], {
    cwd: REPO,
    env: { ...process.env, HOST: '127.0.0.1', PORT: String(port), DATA_DIR: dataDir, LOG_LEVEL: 'warn', REDIS_URL: '', STORE: '', API_KEYS: '', API_KEYS_FILE: '', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  const keep = (chunk: Buffer) => {
    output = (output + chunk.toString('utf8')).slice(-4000);
  };
  child.stdout?.on('data', keep);
  child.stderr?.on('data', keep);
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  // A crash of this process must not leave the server running.
  const killOnExit = () => child.kill('SIGKILL');
  process.once('exit', killOnExit);
  let peak = 0;
  const pid = child.pid!;
  const sampler = setInterval(() => {
    const rss = readVm(pid, 'VmRSS');
    if (rss !== null && rss > peak) peak = rss;
  }, 100);
  const stop = async () => {
    clearInterval(sampler);
    if (child.exitCode === null && child.signalCode === null) {
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
      await exited;
      clearTimeout(timer);
    }
    process.removeListener('exit', killOnExit);
    await rm(dataDir, { recursive: true, force: true });
  };
  const base = `http://127.0.0.1:${port}`;
  const deadline = performance.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) {
      await stop();
      throw new Error(`the server exited with code ${child.exitCode} before answering /healthz:\n${output}`);
    }
    const ok = await fetch(`${base}/healthz`, { signal: AbortSignal.timeout(2000) }).then(
      (r) => r.ok,
      () => false,
    );
    if (ok) break;
    if (performance.now() > deadline) {
      await stop();
      throw new Error(`the server did not answer /healthz within 60 s:\n${output}`);
    }
    await sleep(200);
  }
  return { base, pid, dataDir, peakRss: () => peak, resetPeak: () => (peak = readVm(pid, 'VmRSS') ?? 0), tail: () => output, stop };
}

/**
 * Seeded float32 little-endian samples of `channelCount` channels starting at `firstChannel`, in
 * 1 MiB chunks: channel c is N(0, 10²) noise from seed 1000 + c plus a 20-unit 10 Hz sine (exactly
 * 50 samples a period at 500 Hz, so one table serves). The same channel always gives the same
 * bytes, so a part stream is the matching slice of the whole body.
 */
function syntheticBody(firstChannel: number, channelCount: number, hash?: Hash): Readable {
  const period = SAMPLING_RATE / 10;
  const sine = Float64Array.from({ length: period }, (_, i) => 20 * Math.sin((2 * Math.PI * i) / period));
  let channel = firstChannel;
  let sample = 0;
  let random = createRandom(1000 + channel);
  return new Readable({
    highWaterMark: CHUNK_BYTES,
    read() {
      if (channel >= firstChannel + channelCount) {
        this.push(null);
        return;
      }
      const chunk = Buffer.allocUnsafe(CHUNK_BYTES);
      const values = new Float32Array(chunk.buffer, chunk.byteOffset, CHUNK_BYTES / 4);
      for (let i = 0; i < values.length; i++, sample++) values[i] = 10 * random.normal() + sine[sample % period]!;
      if (sample === CHANNEL_SAMPLES) {
        channel++;
        sample = 0;
        random = createRandom(1000 + channel);
      }
      // Float32Array is host-endian; every platform node runs on here is little-endian, checked below.
      hash?.update(chunk);
      this.push(chunk);
    },
  });
}

/** MiB/s of `syntheticBody` alone over 64 MiB, read synchronously. */
function generatorRate(): string {
  const body = syntheticBody(0, CHANNELS_PER_PART);
  const t0 = performance.now();
  let bytes = 0;
  for (let chunk = body.read() as Buffer | null; chunk !== null; chunk = body.read() as Buffer | null) bytes += chunk.length;
  return rate(bytes, performance.now() - t0);
}

interface Sent {
  status: number;
  body: string;
  /** ms from the first byte to the last byte handed to the socket */
  sentMs: number;
  /** ms from the first byte to the complete answer */
  answeredMs: number;
}

/** Streams a body with node:http (no buffering) and reads the answer; destroyed at `boundMs`. */
function send(base: string, method: string, path: string, body: Readable | string | null, length: number, boundMs: number): Promise<Sent> {
  return new Promise((resolve, reject) => {
    const t0 = performance.now();
    let sentMs = 0;
    const isJson = typeof body === 'string';
    const req = request(`${base}${path}`, {
      method,
      headers: { 'content-type': isJson ? 'application/json' : 'application/octet-stream', 'content-length': String(length) },
    });
    const timer = setTimeout(() => req.destroy(new Error(`${method} ${path} took longer than ${boundMs / 1000} s`)), boundMs);
    req.on('finish', () => (sentMs = performance.now() - t0));
    req.on('error', (error) => {
      clearTimeout(timer);
      reject(error);
    });
    req.on('response', (res) => {
      let text = '';
      res.setEncoding('utf8');
      res.on('data', (chunk: string) => (text += chunk));
      res.on('end', () => {
        clearTimeout(timer);
        resolve({ status: res.statusCode ?? 0, body: text, sentMs: sentMs || performance.now() - t0, answeredMs: performance.now() - t0 });
      });
      res.on('error', reject);
    });
    if (body === null) req.end();
    else if (isJson) req.end(body);
    else body.pipe(req);
  });
}

/** A JSON request to the child server over loopback; throws on a status other than `expect`. */
export async function callJson<T>(base: string, method: string, path: string, payload: unknown, expect: number[], boundMs = 60_000): Promise<{ status: number; json: T; ms: number }> {
  const text = payload === undefined ? null : JSON.stringify(payload);
  const sent = await send(base, method, path, text, text === null ? 0 : Buffer.byteLength(text), boundMs);
  if (!expect.includes(sent.status)) throw new Error(`${method} ${path} answered ${sent.status}: ${sent.body.slice(0, 500)}`);
  return { status: sent.status, json: JSON.parse(sent.body) as T, ms: sent.answeredMs };
}

/** Streams a file-like body (EDF, float32) to `path`; throws on a status other than 201. */
export async function uploadStream(base: string, path: string, body: Readable, length: number, boundMs = UPLOAD_BOUND_MS): Promise<Sent> {
  const sent = await send(base, 'POST', path, body, length, boundMs);
  if (sent.status !== 201) throw new Error(`POST ${path} answered ${sent.status}: ${sent.body.slice(0, 500)}`);
  return sent;
}

export const mib = (bytes: number): string => (bytes / MiB).toFixed(0);
/** MiB/s over `ms` milliseconds */
export const rate = (bytes: number, ms: number): string => (bytes / MiB / (ms / 1000)).toFixed(1);

interface SignalInfo {
  id: string;
  sha256: string;
  samplingRate: number;
  channels: string[];
  epochCount: number;
  samplesPerEpoch: number;
  bytes: number;
}

const describe = (s: SignalInfo): string =>
  `${s.id}: ${s.channels.length} ch (${s.channels[0]}…${s.channels.at(-1)}), ${s.epochCount} epoch × ${s.samplesPerEpoch} samples at ${s.samplingRate} Hz, ${mib(s.bytes)} MiB stored (float32 as uploaded)`;

const memory = (server: ChildServer): string => {
  const hwm = readVm(server.pid, 'VmHWM');
  return `server peak VmRSS ${mib(server.peakRss())} MiB (100 ms samples), VmHWM so far ${hwm === null ? '?' : mib(hwm)} MiB`;
};

export async function benchUpload(): Promise<string[]> {
  const lines: string[] = [];
  const began = performance.now();
  // Each request gets at most 5 minutes, and all of them together 10.
  const left = (): number => Math.max(1, Math.min(UPLOAD_BOUND_MS, began + TOTAL_BOUND_MS - performance.now()));
  const fs = await statfs(tmpdir());
  const free = fs.bavail * fs.bsize;
  lines.push(`upload: 1 GiB float32 body (${CHANNELS} ch × ${CHANNEL_SAMPLES} samples, 1 epoch, ${SAMPLING_RATE} Hz), generated in 1 MiB chunks, node:http over loopback to a child server`);
  if (free < MIN_FREE_BYTES) {
    lines.push(`  skipped: ${(free / 2 ** 30).toFixed(1)} GiB free under ${tmpdir()}, below the 8 GiB a run needs (raw upload + stored copy + stored signal, with room to spare)`);
    return lines;
  }
  if (new Uint8Array(Float32Array.of(1).buffer)[3] !== 0x3f) {
    lines.push('  skipped: this machine is big-endian; the body generator writes host-order float32');
    return lines;
  }
  lines.push(`  ${(free / 2 ** 30).toFixed(1)} GiB free under ${tmpdir()}`);
  lines.push(`  the generator alone, no network: ${generatorRate()} MiB/s on this thread (an upper bound on the client's sending rate)`);
  const server = await startChildServer({
    BODY_LIMIT_BYTES: String(2 * TOTAL_BYTES),
    MAX_SAMPLES: String(2 * CHANNELS * CHANNEL_SAMPLES),
    REQUEST_TIMEOUT_MS: String(UPLOAD_BOUND_MS),
  });
  try {
    const idle = readVm(server.pid, 'VmRSS') ?? 0;
    lines.push(`  server pid ${server.pid}, idle VmRSS ${mib(idle)} MiB after /healthz`);
    const channels = Array.from({ length: CHANNELS }, (_, c) => `E${c + 1}`).join(',');

    server.resetPeak();
    const whole = createHash('sha256');
    const one = await uploadStream(server.base, `/v1/signals?samplingRate=${SAMPLING_RATE}&channels=${channels}`, syntheticBody(0, CHANNELS, whole), TOTAL_BYTES, left());
    const wholeSha = whole.digest('hex');
    const signal = JSON.parse(one.body) as SignalInfo;
    lines.push(
      `  one request: body sent in ${(one.sentMs / 1000).toFixed(1)} s (${rate(TOTAL_BYTES, one.sentMs)} MiB/s), 201 after ${(one.answeredMs / 1000).toFixed(1)} s ` +
        `(${rate(TOTAL_BYTES, one.answeredMs)} MiB/s end to end, ingest included); ${memory(server)}`,
    );
    lines.push(`    stored ${describe(signal)}`);
    const onePeak = server.peakRss();

    // Delete it, so that the resumable path converts and stores again instead of finding it.
    await callJson(server.base, 'DELETE', `/v1/signals/${signal.id}`, undefined, [200], left());
    server.resetPeak();
    const t0 = performance.now();
    const started = await callJson<{ id: string }>(server.base, 'POST', '/v1/uploads', { format: 'float32', samplingRate: SAMPLING_RATE, channels: channels.split(',') }, [201], left());
    let partsSentMs = 0;
    for (let p = 0; p < PARTS; p++) {
      const sent = await send(server.base, 'PUT', `/v1/uploads/${started.json.id}/parts/${p + 1}`, syntheticBody(p * CHANNELS_PER_PART, CHANNELS_PER_PART), CHANNELS_PER_PART * CHANNEL_BYTES, left());
      if (sent.status !== 200) throw new Error(`PUT part ${p + 1} answered ${sent.status}: ${sent.body.slice(0, 500)}`);
      partsSentMs += sent.answeredMs;
    }
    const completed = await callJson<SignalInfo>(server.base, 'POST', `/v1/uploads/${started.json.id}/complete`, { sha256: wholeSha, parts: PARTS }, [201], left());
    const resumableMs = performance.now() - t0;
    lines.push(
      `  resumable: ${PARTS} PUT parts of ${mib(CHANNELS_PER_PART * CHANNEL_BYTES)} MiB in ${(partsSentMs / 1000).toFixed(1)} s (${rate(TOTAL_BYTES, partsSentMs)} MiB/s), ` +
        `complete (join, SHA-256 check, ingest) ${(completed.ms / 1000).toFixed(1)} s; ${(resumableMs / 1000).toFixed(1)} s in all (${rate(TOTAL_BYTES, resumableMs)} MiB/s); ${memory(server)}`,
    );
    lines.push(
      `    stored ${describe(completed.json)}; ${completed.json.id === signal.id ? 'the same id as the one-request upload (same bytes)' : `a DIFFERENT id from the one-request upload (${signal.id})`}`,
    );
    // VmHWM covers the whole life of the process, start-up included, so the bound takes the larger.
    const hwm = readVm(server.pid, 'VmHWM') ?? 0;
    const worst = Math.max(onePeak, server.peakRss(), hwm);
    lines.push(`  bound for the README: peak RSS stayed under ${Math.ceil(worst / MiB / 10) * 10} MiB for a 1 GiB upload, in one request or in ${PARTS} parts (VmHWM at the end ${mib(hwm)} MiB)`);
  } catch (error) {
    throw new Error(`${error instanceof Error ? error.message : String(error)}\n  after: ${lines.join('\n')}\n  server output (tail): ${server.tail().trim() || '(none)'}`);
  } finally {
    await server.stop();
  }
  return lines;
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const line of await benchUpload()) console.log(line);
}
