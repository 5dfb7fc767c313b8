import { pino, type Logger } from 'pino';
import { ConfigError, isLoopbackHost, type Config } from '../config.js';
import { buildApp } from '../http/app.js';
import { BullQueue } from '../jobs/bullmq-queue.js';
import { startBullWorker } from '../jobs/bullmq-worker.js';
import { createComputePool, type ComputePool } from '../jobs/compute-pool.js';
import { EmbeddedQueue } from '../jobs/embedded-queue.js';
import type { JobQueue } from '../jobs/queue.js';
import { sweepExpired } from '../jobs/retention.js';
import { createStore } from '../stores/create-store.js';
import { createThreadBudget } from '../threads/budget.js';

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
  const store = createStore(config.store);
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
  let sweeper: NodeJS.Timeout | null = null;
  if (config.retentionDays > 0) {
    const sweep = () =>
      sweepExpired(store, queue, config.retentionDays * 86_400_000).then(
        (removed) => logger.info({ removed, retentionDays: config.retentionDays }, 'retention sweep'),
        (error: unknown) => logger.warn({ err: error }, 'retention sweep failed'),
      );
    sweeper = setInterval(sweep, config.sweepIntervalSeconds * 1000);
    sweeper.unref();
  }
  return {
    app,
    queue,
    store,
    async close() {
      if (sweeper) clearInterval(sweeper);
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
  const handle = startBullWorker({
    url: config.redisUrl,
    prefix: config.redisPrefix,
    queueName: config.queueName,
    store: config.store,
    pool,
    lockDurationMs: config.workerLockMs,
    maxStalledCount: config.workerMaxStalled,
    onEvent: (event, detail) => (event === 'error' || event === 'stalled' ? logger.warn(detail, `worker ${event}`) : logger.info(detail, `job ${event}`)),
  });
  return {
    worker: handle.worker,
    async close() {
      await handle.close();
      await pool.close();
    },
  };
}

/** A Redis URL without its password, for logs. */
export function redactUrl(url: string): string {
  return url.replace(/\/\/([^@/]*)@/, '//***@');
}
