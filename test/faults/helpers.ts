import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { createServer, type AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import { fileURLToPath } from 'node:url';
import { createLogger, startApi } from '../../src/cli/runtime.js';
import { createRandom } from '../../src/common/random.js';
import { loadConfig } from '../../src/config.js';
import { Redis } from 'ioredis';
import { sink } from '../helpers/app.js';
import { TEST_REDIS_URL, uniqueName } from '../helpers/redis.js';

export const REPO_ROOT = resolve(fileURLToPath(new URL('../..', import.meta.url)));
export const FINISHED = new Set(['succeeded', 'failed', 'canceled']);

/** A loopback port that was free a moment ago (the OS picks it). */
export async function freePort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((ok) => server.listen(0, '127.0.0.1', ok));
  const { port } = server.address() as AddressInfo;
  await new Promise<void>((ok) => server.close(() => ok()));
  return port;
}

/** Polls `check` until it returns a value other than undefined; bounded in time. */
export async function until<T>(what: string, check: () => Promise<T | undefined> | T | undefined, timeoutMs: number, everyMs = 100): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let lastError: unknown = null;
  while (Date.now() < deadline) {
    try {
      const value = await check();
      if (value !== undefined) return value;
    } catch (error) {
      lastError = error;
    }
    await sleep(everyMs);
  }
  throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}${lastError ? ` (last error: ${String(lastError)})` : ''}`);
}

/** The environment a child process gets: only what it needs plus the test's own settings. */
function childEnv(env: Record<string, string>): NodeJS.ProcessEnv {
  return { PATH: process.env.PATH ?? '/usr/bin:/bin', HOME: process.env.HOME ?? '/tmp', LOG_LEVEL: 'info', WORKER_THREADS: '1', ...env };
}

/** A `rhythmetric` child (`serve` or `worker`) whose JSON log lines are collected. */
export class ServiceProcess {
  readonly lines: Record<string, unknown>[] = [];
  readonly stderr: string[] = [];
  readonly exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  private readonly child: ChildProcess;

  constructor(command: 'serve' | 'worker', env: Record<string, string>) {
    this.child = spawn(process.execPath, ['--import', 'tsx', 'src/cli/main.ts', command], { cwd: REPO_ROOT, env: childEnv(env), stdio: ['ignore', 'pipe', 'pipe'] });
    let partial = '';
    this.child.stdout!.on('data', (chunk: Buffer) => {
      const text = partial + chunk.toString('utf8');
      const parts = text.split('\n');
      partial = parts.pop() ?? '';
      for (const line of parts) {
        if (!line.trim()) continue;
        try {
          this.lines.push(JSON.parse(line) as Record<string, unknown>);
        } catch {
          this.stderr.push(`stdout: ${line}`);
        }
      }
    });
    this.child.stderr!.on('data', (chunk: Buffer) => this.stderr.push(chunk.toString('utf8')));
    this.exited = new Promise((ok) => this.child.once('exit', (code, signal) => ok({ code, signal })));
  }

  get pid(): number {
    return this.child.pid!;
  }

  get alive(): boolean {
    return this.child.exitCode === null && this.child.signalCode === null;
  }

  /** Resolves with the first log line whose `msg` is `msg` and that passes `match`. */
  waitForLog(msg: string, timeoutMs: number, match: (line: Record<string, unknown>) => boolean = () => true): Promise<Record<string, unknown>> {
    return until(
      `log "${msg}" from pid ${this.pid}`,
      () => {
        if (!this.alive && !this.lines.some((l) => l.msg === msg && match(l))) throw new Error(`process exited; stderr: ${this.stderr.join('').slice(-2000)}`);
        return this.lines.find((l) => l.msg === msg && match(l));
      },
      timeoutMs,
      50,
    );
  }

  logs(msg: string): Record<string, unknown>[] {
    return this.lines.filter((l) => l.msg === msg);
  }

  kill(signal: NodeJS.Signals): void {
    if (this.alive) this.child.kill(signal);
  }

  /** SIGKILL and wait for the exit; safe to call on a dead process (afterAll). */
  async stop(): Promise<void> {
    this.kill('SIGKILL');
    await Promise.race([this.exited, sleep(5000)]);
  }
}

/**
 * An embedded-mode `rhythmetric serve` child on `dataDir` and a free loopback port, pushed onto
 * `children` (for afterAll); resolves once it serves.
 */
export async function serveEmbedded(dataDir: string, children: ServiceProcess[], env: Record<string, string> = {}): Promise<{ child: ServiceProcess; base: string }> {
  const port = await freePort();
  const child = new ServiceProcess('serve', { DATA_DIR: dataDir, PORT: String(port), HOST: '127.0.0.1', RATE_LIMIT_PER_MINUTE: '0', ...env });
  children.push(child);
  await child.waitForLog('rhythmetric serving', 20_000);
  return { child, base: `http://127.0.0.1:${port}` };
}

export function startWorkerProcess(env: Record<string, string>): ServiceProcess {
  return new ServiceProcess('worker', env);
}

/** CPU time (user + system, clock ticks) a process has used so far, from /proc (Linux). */
export async function cpuTicks(pid: number): Promise<number> {
  const stat = await readFile(`/proc/${pid}/stat`, 'utf8');
  // Fields after the parenthesised command name; utime and stime are fields 14 and 15.
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return Number(fields[11]) + Number(fields[12]);
}

/** Of several processes, the one burning CPU: the one computing a job (the others wait on Redis). */
export async function busiest(processes: readonly ServiceProcess[], windowMs = 800): Promise<{ process: ServiceProcess; ticks: number[] }> {
  const live = processes.filter((p) => p.alive);
  const before = await Promise.all(live.map((p) => cpuTicks(p.pid).catch(() => 0)));
  await sleep(windowMs);
  const after = await Promise.all(live.map((p) => cpuTicks(p.pid).catch(() => 0)));
  const ticks = after.map((a, i) => a - before[i]!);
  const best = ticks.indexOf(Math.max(...ticks));
  return { process: live[best]!, ticks };
}

/**
 * The process computing a job, once it is clearly computing: a job is "running" as soon as a worker
 * takes it, but the worker then loads the signal (a 19 MB GET took 0.8 s on the shared test Redis)
 * before its thread burns CPU, so a single sample taken at once can find every process idle.
 */
export async function computing(processes: readonly ServiceProcess[], timeoutMs = 20_000): Promise<{ process: ServiceProcess; ticks: number[] }> {
  return until(
    'a process to compute',
    async () => {
      const sample = await busiest(processes);
      return Math.max(...sample.ticks) > 3 * Math.min(...sample.ticks) + 5 ? sample : undefined;
    },
    timeoutMs,
    0,
  );
}

/** A redis-server of the test's own on a free loopback port, with AOF in its own directory. */
export class OwnRedis {
  private child: ChildProcess | null = null;
  private constructor(
    readonly port: number,
    readonly dir: string,
  ) {}

  static async start(): Promise<OwnRedis> {
    const redis = new OwnRedis(await freePort(), await mkdtemp(join(tmpdir(), 'rhythmetric-redis-')));
    await redis.up();
    return redis;
  }

  get url(): string {
    return `redis://127.0.0.1:${this.port}`;
  }

  /** Starts (or restarts) the server on the same port and directory; resolves when it answers PING. */
  async up(): Promise<void> {
    // Already running: a second server would fail to bind and orphan the first on destroy().
    if (this.child && this.child.exitCode === null && this.child.signalCode === null) return;
    const args = ['--port', String(this.port), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'yes', '--appendfsync', 'always', '--dir', this.dir, '--protected-mode', 'yes'];
    const child = spawn('/usr/bin/redis-server', args, { stdio: 'ignore' });
    this.child = child;
    await until(`redis-server on port ${this.port}`, async () => ((await this.cli('ping')).trim() === 'PONG' ? true : undefined), 10_000, 100);
  }

  cli(...args: string[]): Promise<string> {
    return new Promise((ok) => {
      const cli = spawn('/usr/bin/redis-cli', ['-h', '127.0.0.1', '-p', String(this.port), ...args], { stdio: ['ignore', 'pipe', 'ignore'] });
      let out = '';
      cli.stdout.on('data', (c: Buffer) => (out += c.toString()));
      cli.on('exit', () => ok(out));
      cli.on('error', () => ok(''));
    });
  }

  /** SIGTERM: redis fsyncs the AOF and exits (no NOSAVE, which would be wrong with AOF). */
  async down(): Promise<void> {
    const child = this.child;
    if (!child || child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise<void>((ok) => child.once('exit', () => ok()));
    child.kill('SIGTERM');
    await Promise.race([exited, sleep(5000).then(() => child.kill('SIGKILL'))]);
    await exited;
  }

  async destroy(): Promise<void> {
    await this.down().catch(() => this.child?.kill('SIGKILL'));
    await rm(this.dir, { recursive: true, force: true });
  }
}

/** The real server in this process, listening on 127.0.0.1 with a port the OS picks. */
export async function startHttpApi(env: Record<string, string>) {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-faults-'));
  const config = loadConfig({ DATA_DIR: dataDir, LOG_LEVEL: 'info', WORKER_THREADS: '1', RATE_LIMIT_PER_MINUTE: '0', ...env, HOST: '127.0.0.1', PORT: '0' });
  const logs = sink();
  const api = await startApi(config, createLogger(config, logs.stream));
  await api.app.listen({ port: 0, host: '127.0.0.1' });
  const { port } = api.app.server.address() as AddressInfo;
  return {
    ...api,
    config,
    dataDir,
    port,
    base: `http://127.0.0.1:${port}`,
    logs: logs.lines,
    async stop() {
      await api.close().catch(() => undefined);
      await rm(dataDir, { recursive: true, force: true });
    },
  };
}

export interface HttpAnswer {
  status: number;
  headers: Headers;
  body: Record<string, unknown>;
}

export async function http(base: string, method: string, path: string, body?: unknown, contentType = 'application/json'): Promise<HttpAnswer> {
  const init: RequestInit = { method, signal: AbortSignal.timeout(30_000) };
  if (body !== undefined) {
    init.headers = { 'content-type': contentType };
    init.body = body instanceof Uint8Array ? body : JSON.stringify(body);
  }
  const res = await fetch(`${base}${path}`, init);
  const text = await res.text();
  let parsed: Record<string, unknown> = {};
  try {
    parsed = text ? (JSON.parse(text) as Record<string, unknown>) : {};
  } catch {
    parsed = { text };
  }
  return { status: res.status, headers: res.headers, body: parsed };
}

/** Polls GET /v1/jobs/:id until the job finishes. */
export async function pollJobHttp(base: string, id: string, timeoutMs: number): Promise<Record<string, unknown>> {
  return until(
    `job ${id} to finish`,
    async () => {
      const res = await http(base, 'GET', `/v1/jobs/${id}`);
      if (res.status !== 200) throw new Error(`GET /v1/jobs/${id} answered ${res.status}`);
      return FINISHED.has(res.body.state as string) ? res.body : undefined;
    },
    timeoutMs,
    100,
  );
}

/** Seeded white noise plus a 10 Hz rhythm (invented data), [channel][sample] as float32 little-endian. */
export function noiseFloat32(seed: number, channels: number, seconds: number, samplingRate: number): Uint8Array {
  const random = createRandom(seed);
  const n = channels * seconds * samplingRate;
  const data = new Float32Array(n);
  for (let i = 0; i < n; i++) data[i] = 10 * random.normal() + 5 * Math.sin((2 * Math.PI * 10 * (i % (seconds * samplingRate))) / samplingRate);
  return new Uint8Array(data.buffer);
}

export function channelNames(count: number): string[] {
  return Array.from({ length: count }, (_, c) => `E${c + 1}`);
}

/** Uploads a float32 signal and answers its id. */
export async function uploadFloat32(base: string, bytes: Uint8Array, channels: number, samplingRate: number): Promise<string> {
  const res = await http(base, 'POST', `/v1/signals?samplingRate=${samplingRate}&channels=${channelNames(channels).join(',')}`, bytes, 'application/octet-stream');
  if (res.status !== 201) throw new Error(`upload answered ${res.status}: ${JSON.stringify(res.body)}`);
  return res.body.id as string;
}

/** A small inline signal (channel × sample, 3 decimals), distinct for every seed. */
export function smallInlineSignal(seed: number, channels = 4, seconds = 2, samplingRate = 256) {
  const random = createRandom(seed);
  const data = Array.from({ length: channels }, () => Array.from({ length: seconds * samplingRate }, () => Math.round(10_000 * random.normal()) / 1000));
  return { samplingRate, channels: channelNames(channels), unit: 'uV', data };
}

/**
 * A job that computes for several seconds on one thread: 16 channels × 300 s × 500 Hz, Welch with
 * 2-s segments at 98 % overlap (about 7 500 segments a channel) and a 1009-point (prime) FFT.
 */
export const LONG_RECIPE = { method: 'welch', fftLength: 1009, overlap: 0.98 } as const;
export const LONG_SIGNAL = { channels: 16, seconds: 300, samplingRate: 500 } as const;

/**
 * Distributed mode on TEST_REDIS_URL under a fresh key prefix: the API in this process and
 * `workerCount` worker children. `start()` adds another worker; `destroy()` kills every child,
 * closes the API and deletes the prefix's keys (call it from afterAll).
 */
export async function startDistributed(stem: string, extraEnv: Record<string, string>, workerCount: number) {
  const prefix = uniqueName(stem);
  const env = { REDIS_URL: TEST_REDIS_URL, REDIS_PREFIX: prefix, QUEUE_NAME: 'analyses', ...extraEnv };
  const redis = new Redis(TEST_REDIS_URL, { maxRetriesPerRequest: 1 });
  redis.on('error', () => {});
  const api = await startHttpApi(env);
  const workers: ServiceProcess[] = [];
  const start = async () => {
    const worker = startWorkerProcess(env);
    workers.push(worker);
    await worker.waitForLog('rhythmetric worker started', 20_000);
    return worker;
  };
  await Promise.all(Array.from({ length: workerCount }, start));
  return {
    prefix,
    env,
    api,
    redis,
    workers,
    start,
    /** A field of BullMQ's job hash, e.g. "ats" (attempts started). */
    jobField: (jobId: string, field: string) => redis.hget(`${prefix}:analyses:${jobId}`, field),
    async destroy() {
      await Promise.all(workers.map((w) => w.stop()));
      await api.stop();
      const keys = await redis.keys(`${prefix}:*`);
      for (let i = 0; i < keys.length; i += 500) await redis.del(...keys.slice(i, i + 500));
      redis.disconnect();
    },
  };
}
export type Distributed = Awaited<ReturnType<typeof startDistributed>>;
