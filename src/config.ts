import { availableParallelism } from 'node:os';
import { deepFreeze } from './common/freeze.js';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { z } from 'zod';
import { DEFAULT_MAX_JOB_BYTES, type RecipeLimits } from './recipes/resolve.js';
import type { SignalLimits } from './signals/limits.js';
import type { StoreConfig } from './stores/store.js';

const int = (fallback: number, min = 1) => z.coerce.number().int().min(min).default(fallback);

/** Every setting comes from the environment, parsed once; the defaults live here and only here. */
const EnvSchema = z.object({
  PORT: int(8080, 0).pipe(z.number().max(65535)),
  HOST: z.string().min(1).default('127.0.0.1'),
  DATA_DIR: z.string().min(1).default('./data'),
  REDIS_URL: z
    .string()
    .regex(/^rediss?:\/\//, 'must start with redis:// or rediss://')
    .optional(),
  REDIS_PREFIX: z
    .string()
    .regex(/^[A-Za-z0-9_-]+$/)
    .default('rhythmetric'),
  QUEUE_NAME: z
    .string()
    .regex(/^[A-Za-z0-9_-]+$/)
    .default('analyses'),
  STORE: z.enum(['filesystem', 'redis']).optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  THREADS: int(Math.max(1, availableParallelism())),
  // Deprecated in 0.3.0 for THREADS; still honoured, with a warning in the log, until the next version.
  WORKER_THREADS: z.coerce.number().int().min(1).optional(),
  JOB_THREADS: z.coerce.number().int().min(1).optional(),
  JOB_ATTEMPTS: int(3),
  BODY_LIMIT_BYTES: int(256 * 1024 * 1024),
  MAX_CHANNELS: int(512),
  MAX_EPOCHS: int(100_000),
  MAX_SAMPLES: int(64 * 1024 * 1024),
  MAX_SAMPLING_RATE: int(100_000),
  MIN_SAMPLING_RATE: z.coerce.number().positive().finite().default(0.01),
  MAX_FFT_LENGTH: int(1 << 20),
  MAX_OUTPUT_VALUES: int(64 * 1024 * 1024),
  MAX_JOB_BYTES: int(DEFAULT_MAX_JOB_BYTES),
  MAX_STORE_BYTES: int(0, 0),
  API_KEYS: z.string().optional(),
  API_KEYS_FILE: z.string().min(1).optional(),
  ALLOW_OPEN_MODE: z.enum(['true', 'false', '1', '0']).default('false'),
  RATE_LIMIT_PER_MINUTE: z.coerce.number().int().min(0).optional(),
  AUTH_FAILURES_PER_MINUTE: int(20, 0),
  METRICS_TOKEN_SHA256: z
    .string()
    .regex(/^[0-9a-f]{64}$/, 'give the SHA-256 of the token as 64 lowercase hex digits, never the token itself')
    .optional(),
  CORS_ORIGINS: z.string().optional(),
  WORKER_LOCK_MS: int(30_000, 1000),
  WORKER_MAX_STALLED: int(2, 0),
  REQUEST_TIMEOUT_MS: int(120_000, 0),
  DATA_ROOT: z.string().min(1).optional(),
  FETCH_ALLOWED_HOSTS: z.string().optional(),
  FETCH_ALLOW_PRIVATE: z.enum(['true', 'false', '1', '0']).default('false'),
  FETCH_TIMEOUT_MS: int(30_000),
  FETCH_MAX_REDIRECTS: int(3, 0),
  RETENTION_DAYS: z.coerce.number().min(0).default(0),
  SWEEP_INTERVAL_SECONDS: int(3600),
  UPLOAD_EXPIRY_SECONDS: int(86_400),
  RECORD_CACHE_BYTES: int(64 * 1024 * 1024, 0),
  STUDY_RUN_WINDOW: z.coerce.number().int().min(1).optional(),
  MAX_WAIT_SECONDS: int(30, 0),
});

export interface Config {
  port: number;
  host: string;
  dataDir: string;
  redisUrl: string | null;
  redisPrefix: string;
  queueName: string;
  store: StoreConfig;
  logLevel: z.infer<typeof EnvSchema>['LOG_LEVEL'];
  /** computing threads of this process, shared by concurrent jobs and their channel helpers */
  threads: number;
  /** jobs computed at once (THREADS, or the deprecated WORKER_THREADS) */
  workerThreads: number;
  /** threads one job may spread its channels over, its own included (THREADS, or the deprecated JOB_THREADS) */
  jobThreads: number;
  /** deprecated settings in use, one line each, for the start-up log */
  deprecations: string[];
  jobAttempts: number;
  bodyLimitBytes: number;
  signalLimits: SignalLimits;
  recipeLimits: RecipeLimits;
  /** bytes of samples the store may hold; 0 = no limit */
  maxStoreBytes: number;
  /** API keys as `tenant:role:sha256hex[:label]` entries; empty = open mode */
  apiKeys: ApiKeyEntry[];
  allowOpenMode: boolean;
  /** requests per minute per key (or per address in open mode); 0 = no limit; default 6000 with keys, none in open mode */
  rateLimitPerMinute: number;
  /** failed authentications per client address and minute before 429; 0 = no limit */
  authFailuresPerMinute: number;
  /** SHA-256 of a token that may read /metrics (besides admin keys); null = admin keys only */
  metricsTokenSha256: string | null;
  corsOrigins: string[];
  workerLockMs: number;
  workerMaxStalled: number;
  /** ms a request (headers and body) may take; 0 = no limit */
  requestTimeoutMs: number;
  /** directory whose files jobs and imports may name; null = off */
  dataRoot: string | null;
  /** hosts (exact, or *.domain for subdomains) whose http(s) URLs may be imported; empty = off */
  fetchAllowedHosts: string[];
  fetchAllowPrivate: boolean;
  fetchTimeoutMs: number;
  fetchMaxRedirects: number;
  /** days after which signals, jobs and records are swept; 0 = kept */
  retentionDays: number;
  sweepIntervalSeconds: number;
  /** seconds without a new part after which a resumable upload is abandoned and removed */
  uploadExpirySeconds: number;
  /** bytes of records and attachments the API keeps in memory with STORE=redis (readable while Redis is down); 0 = off */
  recordCacheBytes: number;
  /** jobs of one study run in the queue at once (fairness towards other jobs) */
  studyRunWindow: number;
  /** seconds a `POST /v1/jobs?wait=` may hold its request for the job to finish; 0 = no waiting */
  maxWaitSeconds: number;
}

export const ROLES = ['read', 'submit', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export interface ApiKeyEntry {
  tenant: string;
  role: Role;
  /** SHA-256 of the key, lowercase hex: the key itself is never configured or stored */
  sha256: string;
  label: string;
}

/** Parses `tenant:role:sha256hex[:label]` entries separated by commas or new lines. */
export function parseApiKeys(text: string, source: string): ApiKeyEntry[] {
  return text
    .split(/[,\n]/)
    .map((line) => line.trim())
    .filter((line) => line !== '' && !line.startsWith('#'))
    .map((line, i) => {
      const [tenant = '', role = '', sha256 = '', label] = line.split(':');
      if (!/^[A-Za-z0-9_-]{1,64}$/.test(tenant)) throw new ConfigError(`${source} entry ${i + 1}: tenant "${tenant}" must be 1–64 letters, digits, _ or -`);
      if (!(ROLES as readonly string[]).includes(role)) throw new ConfigError(`${source} entry ${i + 1}: role "${role}" must be one of ${ROLES.join(', ')}`);
      if (!/^[0-9a-f]{64}$/.test(sha256)) throw new ConfigError(`${source} entry ${i + 1}: give the SHA-256 of the key as 64 lowercase hex digits, never the key itself`);
      return { tenant, role: role as Role, sha256, label: label ?? `${tenant}-${role}-${i + 1}` };
    });
}

export class ConfigError extends Error {
  override readonly name = 'ConfigError';
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Readonly<Config> {
  const picked = Object.fromEntries(Object.keys(EnvSchema.shape).flatMap((k) => (env[k] === undefined || env[k] === '' ? [] : [[k, env[k]]])));
  const parsed = EnvSchema.safeParse(picked);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new ConfigError(`environment variable ${String(issue.path[0])}=${JSON.stringify(picked[String(issue.path[0])])}: ${issue.message}`);
  }
  const e = parsed.data;
  if (e.STORE === 'redis' && !e.REDIS_URL) throw new ConfigError('environment variable STORE=redis needs REDIS_URL');
  const dataDir = resolve(e.DATA_DIR);
  const storeKind = e.STORE ?? (e.REDIS_URL ? 'redis' : 'filesystem');
  const threading = threadSettings(e, env.THREADS !== undefined && env.THREADS !== '');
  const config: Config = {
    port: e.PORT,
    host: e.HOST,
    dataDir,
    redisUrl: e.REDIS_URL ?? null,
    redisPrefix: e.REDIS_PREFIX,
    queueName: e.QUEUE_NAME,
    store: storeKind === 'redis' ? { kind: 'redis', url: e.REDIS_URL!, prefix: e.REDIS_PREFIX } : { kind: 'filesystem', dataDir },
    logLevel: e.LOG_LEVEL,
    ...threading,
    jobAttempts: e.JOB_ATTEMPTS,
    bodyLimitBytes: e.BODY_LIMIT_BYTES,
    signalLimits: { maxChannels: e.MAX_CHANNELS, maxEpochs: e.MAX_EPOCHS, maxSamples: e.MAX_SAMPLES, maxSamplingRate: e.MAX_SAMPLING_RATE, minSamplingRate: e.MIN_SAMPLING_RATE },
    recipeLimits: { maxFftLength: e.MAX_FFT_LENGTH, maxOutputValues: e.MAX_OUTPUT_VALUES, maxJobBytes: e.MAX_JOB_BYTES },
    maxStoreBytes: e.MAX_STORE_BYTES,
    apiKeys: [
      ...(e.API_KEYS ? parseApiKeys(e.API_KEYS, 'environment variable API_KEYS') : []),
      ...(e.API_KEYS_FILE ? parseApiKeys(readKeysFile(e.API_KEYS_FILE), `API_KEYS_FILE ${e.API_KEYS_FILE}`) : []),
    ],
    allowOpenMode: e.ALLOW_OPEN_MODE === 'true' || e.ALLOW_OPEN_MODE === '1',
    // Per key once keys exist; open mode serves only this machine (or a forced network), so no default limit.
    rateLimitPerMinute: e.RATE_LIMIT_PER_MINUTE ?? (e.API_KEYS || e.API_KEYS_FILE ? 6000 : 0),
    authFailuresPerMinute: e.AUTH_FAILURES_PER_MINUTE,
    metricsTokenSha256: e.METRICS_TOKEN_SHA256 ?? null,
    corsOrigins: e.CORS_ORIGINS
      ? e.CORS_ORIGINS.split(',')
          .map((o) => o.trim())
          .filter(Boolean)
      : [],
    workerLockMs: e.WORKER_LOCK_MS,
    workerMaxStalled: e.WORKER_MAX_STALLED,
    requestTimeoutMs: e.REQUEST_TIMEOUT_MS,
    dataRoot: e.DATA_ROOT ? resolve(e.DATA_ROOT) : null,
    fetchAllowedHosts: e.FETCH_ALLOWED_HOSTS
      ? e.FETCH_ALLOWED_HOSTS.split(',')
          .map((h) => h.trim())
          .filter(Boolean)
      : [],
    fetchAllowPrivate: e.FETCH_ALLOW_PRIVATE === 'true' || e.FETCH_ALLOW_PRIVATE === '1',
    fetchTimeoutMs: e.FETCH_TIMEOUT_MS,
    fetchMaxRedirects: e.FETCH_MAX_REDIRECTS,
    retentionDays: e.RETENTION_DAYS,
    sweepIntervalSeconds: e.SWEEP_INTERVAL_SECONDS,
    uploadExpirySeconds: e.UPLOAD_EXPIRY_SECONDS,
    recordCacheBytes: e.RECORD_CACHE_BYTES,
    // A run keeps at most this many of its jobs in the queue at once, so other jobs wait behind a
    // few of a run's, never behind all of them; by default one per job thread.
    studyRunWindow: e.STUDY_RUN_WINDOW ?? threading.workerThreads,
    maxWaitSeconds: e.MAX_WAIT_SECONDS,
  };
  return deepFreeze(config);
}

/**
 * One budget, THREADS, split at run time: a job always has its own thread and takes free ones for
 * its channels. The old variables still cap jobs at once and threads per job for one version; the
 * budget is then the larger of the settings, as the two together could use before.
 */
function threadSettings(e: { THREADS: number; WORKER_THREADS?: number | undefined; JOB_THREADS?: number | undefined }, explicit: boolean) {
  const deprecations: string[] = [];
  if (e.WORKER_THREADS !== undefined) deprecations.push('WORKER_THREADS is deprecated: set THREADS, the one thread budget shared by jobs and their channel helpers');
  if (e.JOB_THREADS !== undefined) deprecations.push('JOB_THREADS is deprecated: set THREADS, the one thread budget shared by jobs and their channel helpers');
  const threads = explicit || deprecations.length === 0 ? e.THREADS : Math.max(e.WORKER_THREADS ?? 1, e.JOB_THREADS ?? 1);
  return { threads, workerThreads: e.WORKER_THREADS ?? threads, jobThreads: e.JOB_THREADS ?? threads, deprecations };
}

function readKeysFile(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    throw new ConfigError(`environment variable API_KEYS_FILE=${JSON.stringify(path)}: cannot be read (${(error as NodeJS.ErrnoException).code ?? 'error'})`);
  }
}

/** Hosts that only this machine can reach. */
export function isLoopbackHost(host: string): boolean {
  return host === 'localhost' || host === '::1' || /^127\.\d+\.\d+\.\d+$/.test(host);
}
