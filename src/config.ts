import { availableParallelism } from 'node:os';
import { deepFreeze } from './common/freeze.js';
import { resolve } from 'node:path';
import { z } from 'zod';
import type { RecipeLimits } from './recipes/resolve.js';
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
  REDIS_PREFIX: z.string().regex(/^[A-Za-z0-9_-]+$/).default('rhythmetric'),
  QUEUE_NAME: z.string().regex(/^[A-Za-z0-9_-]+$/).default('analyses'),
  STORE: z.enum(['filesystem', 'redis']).optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  WORKER_THREADS: int(Math.max(1, availableParallelism())),
  JOB_ATTEMPTS: int(3),
  BODY_LIMIT_BYTES: int(256 * 1024 * 1024),
  MAX_CHANNELS: int(512),
  MAX_EPOCHS: int(100_000),
  MAX_SAMPLES: int(64 * 1024 * 1024),
  MAX_SAMPLING_RATE: int(100_000),
  MAX_FFT_LENGTH: int(1 << 20),
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
  workerThreads: number;
  jobAttempts: number;
  bodyLimitBytes: number;
  signalLimits: SignalLimits;
  recipeLimits: RecipeLimits;
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
  const config: Config = {
    port: e.PORT,
    host: e.HOST,
    dataDir,
    redisUrl: e.REDIS_URL ?? null,
    redisPrefix: e.REDIS_PREFIX,
    queueName: e.QUEUE_NAME,
    store: storeKind === 'redis' ? { kind: 'redis', url: e.REDIS_URL!, prefix: e.REDIS_PREFIX } : { kind: 'filesystem', dataDir },
    logLevel: e.LOG_LEVEL,
    workerThreads: e.WORKER_THREADS,
    jobAttempts: e.JOB_ATTEMPTS,
    bodyLimitBytes: e.BODY_LIMIT_BYTES,
    signalLimits: { maxChannels: e.MAX_CHANNELS, maxEpochs: e.MAX_EPOCHS, maxSamples: e.MAX_SAMPLES, maxSamplingRate: e.MAX_SAMPLING_RATE },
    recipeLimits: { maxFftLength: e.MAX_FFT_LENGTH },
  };
  return deepFreeze(config);
}
