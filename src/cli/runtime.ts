import { monitorEventLoopDelay } from 'node:perf_hooks';
import { pino, type Logger } from 'pino';
import { ConfigError, isLoopbackHost, type Config } from '../config.js';
import { buildApp } from '../http/app.js';
import { RecordCachingStore } from '../http/record-cache.js';
import { BullQueue } from '../jobs/bullmq-queue.js';
import { startBullWorker } from '../jobs/bullmq-worker.js';
import { createComputePool, type ComputePool } from '../jobs/compute-pool.js';
import { EmbeddedQueue } from '../jobs/embedded-queue.js';
import type { JobQueue } from '../jobs/queue.js';
import { sweepExpired } from '../jobs/retention.js';
import { createStore } from '../stores/create-store.js';
import { createThreadBudget } from '../threads/budget.js';
import { uploadAreaOf } from '../stores/upload-area.js';

export function createLogger(config: Pick<Config, 'logLevel'>, destination?: NodeJS.WritableStream): Logger {
  const options = { level: config.logLevel, base: { service: 'rhythmetric' }, redact: ['req.headers.authorization'] };
  return destination ? pino(options, destination as never) : pino(options);
}

/**
 * Wires the API for a configuration: embedded (in-process queue on a worker-thread pool) without
 * REDIS_URL, distributed (BullMQ; workers run elsewhere) with it.
 */
export async function startApi(config: Readonly<Config>, logger: Logger = createLogger(config)) {
  if (config.apiKeys.length === 0) {
    if (!isLoopbackHost(config.host) && !config.allowOpenMode) {
      throw new ConfigError(
        `no API keys are configured (open mode) and HOST=${config.host} is reachable from other machines; configure API_KEYS or API_KEYS_FILE, or set ALLOW_OPEN_MODE=true to serve without authentication anyway`,
      );
    }
    logger.warn({ host: config.host }, 'OPEN MODE: no API keys are configured, so every caller can read, submit and delete; configure API_KEYS before exposing this service');
  } else {
    logger.info({ keys: config.apiKeys.length, tenants: [...new Set(config.apiKeys.map((k) => k.tenant))].length }, 'API keys loaded');
  }
  for (const message of config.deprecations) logger.warn({ deprecated: true }, message);
  // Records are immutable, so with STORE=redis the API may keep those it has read: they stay readable while Redis is down.
  const store = config.store.kind === 'redis' && config.recordCacheBytes > 0 ? new RecordCachingStore(createStore(config.store), config.recordCacheBytes) : createStore(config.store);
  let pool: ComputePool | null = null;
  let queue: JobQueue;
  if (config.redisUrl) {
    const bull = new BullQueue({ url: config.redisUrl, prefix: config.redisPrefix, queueName: config.queueName, attempts: config.jobAttempts });
    if (!(await bull.connected())) logger.warn({ redis: redactUrl(config.redisUrl) }, 'Redis does not answer yet; submissions get 503 until it does');
    queue = bull;
  } else {
    pool = createComputePool(config.workerThreads, config.jobThreads, createThreadBudget(config.threads));
    queue = await EmbeddedQueue.open({
      store,
      storeConfig: config.store,
      pool,
      maxAttempts: config.jobAttempts,
      onError: (error, jobId) => logger.error({ err: error, jobId }, 'job attempt failed'),
    });
  }
  const app = await buildApp({ config, store, queue, logger, ...(pool ? { poolReady: () => pool!.threads > 0 } : {}) });
  // Abandoned uploads and temp files of interrupted writes go at start-up and in every sweep, whatever RETENTION_DAYS.
  const sweepLeftovers = () =>
    uploadAreaOf(store)
      .sweep(config.uploadExpirySeconds * 1000)
      .then(
        (removed) => logger.info({ removed, uploadExpirySeconds: config.uploadExpirySeconds }, 'leftovers sweep'),
        (error: unknown) => logger.warn({ err: error }, 'leftovers sweep failed'),
      );
  await sweepLeftovers();
  const sweep = async () => {
    await sweepLeftovers();
    if (config.retentionDays <= 0) return;
    await sweepExpired(store, queue, config.retentionDays * 86_400_000).then(
      (removed) => logger.info({ removed, retentionDays: config.retentionDays }, 'retention sweep'),
      (error: unknown) => logger.warn({ err: error }, 'retention sweep failed'),
    );
  };
  const sweeper = setInterval(() => void sweep(), config.sweepIntervalSeconds * 1000);
  sweeper.unref();
  return {
    app,
    queue,
    store,
    async close() {
      clearInterval(sweeper);
      await app.close();
      await queue.close();
      await pool?.close();
      await store.close();
    },
  };
}

/** A `rhythmetric worker` process: consumes the BullMQ queue, computes on its own thread pool. */
export function startWorker(config: Readonly<Config>, logger: Logger = createLogger(config)) {
  if (!config.redisUrl) throw new Error('rhythmetric worker needs REDIS_URL (embedded mode computes inside the API process)');
  for (const message of config.deprecations) logger.warn({ deprecated: true }, message);
  const pool = createComputePool(config.workerThreads, config.jobThreads, createThreadBudget(config.threads));
  // The longest event-loop stall since the last finished job goes into its log line: a stall
  // longer than the lock renewal margin (WORKER_LOCK_MS / 2) would get the job redelivered.
  const loop = monitorEventLoopDelay({ resolution: 10 });
  loop.enable();
  const withLoop = (detail: Record<string, unknown>) => {
    const eventLoopMaxMs = Math.round(loop.max / 1e6);
    loop.reset();
    return { ...detail, eventLoopMaxMs };
  };
  const handle = startBullWorker({
    url: config.redisUrl,
    prefix: config.redisPrefix,
    queueName: config.queueName,
    store: config.store,
    pool,
    lockDurationMs: config.workerLockMs,
    maxStalledCount: config.workerMaxStalled,
    onEvent: (event, detail) => {
      if (event === 'error' || event === 'stalled' || event === 'lock-lost') logger.warn(detail, `worker ${event}`);
      else logger.info(event === 'completed' || event === 'failed' ? withLoop(detail) : detail, `job ${event}`);
    },
  });
  return {
    worker: handle.worker,
    async close() {
      loop.disable();
      await handle.close();
      await pool.close();
    },
  };
}

/** A Redis URL without its password, for logs. */
export function redactUrl(url: string): string {
  return url.replace(/\/\/([^@/]*)@/, '//***@');
}
