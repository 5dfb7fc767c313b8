#!/usr/bin/env node
import { ConfigError, loadConfig } from '../config.js';
import { createLogger, startApi, startWorker } from './runtime.js';

const USAGE = `usage: rhythmetric <command>

commands:
  serve     run the HTTP API (embedded mode unless REDIS_URL is set)
  worker    consume jobs from the Redis queue (needs REDIS_URL)
  demo      write the invented demo recording (night-shift alertness study) as JSON
  help      this text

configuration is by environment variables; see README.md.`;

async function main(argv: string[]): Promise<number> {
  const command = argv[0] ?? 'help';
  if (command === 'help' || command === '--help' || command === '-h') {
    process.stdout.write(USAGE + '\n');
    return 0;
  }
  if (command === 'demo') {
    const { runDemoCommand } = await import('./demo.js');
    return runDemoCommand(argv.slice(1));
  }
  const config = loadConfig();
  const logger = createLogger(config);
  if (command === 'serve') {
    const api = await startApi(config, logger);
    await api.app.listen({ port: config.port, host: config.host });
    logger.info({ mode: api.queue.mode, store: config.store.kind, dataDir: config.store.kind === 'filesystem' ? config.dataDir : undefined }, 'rhythmetric serving');
    onShutdown(logger, () => api.close());
    return -1;
  }
  if (command === 'worker') {
    const worker = startWorker(config, logger);
    logger.info({ queue: config.queueName, threads: config.threads, store: config.store.kind }, 'rhythmetric worker started');
    onShutdown(logger, () => worker.close());
    return -1;
  }
  process.stderr.write(`unknown command "${command}"\n\n${USAGE}\n`);
  return 2;
}

/** Stop accepting, let running work finish or go back to the queue, then exit. */
function onShutdown(logger: ReturnType<typeof createLogger>, close: () => Promise<void>): void {
  let closing = false;
  for (const signal of ['SIGTERM', 'SIGINT'] as const) {
    process.on(signal, () => {
      if (closing) return;
      closing = true;
      logger.info({ signal }, 'shutting down');
      close().then(
        () => process.exit(0),
        (error: unknown) => {
          logger.error({ err: error }, 'shutdown failed');
          process.exit(1);
        },
      );
    });
  }
}

main(process.argv.slice(2)).then(
  (code) => {
    if (code >= 0) process.exitCode = code;
  },
  (error: unknown) => {
    process.stderr.write(`${error instanceof ConfigError ? 'configuration error: ' : ''}${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 1;
  },
);
