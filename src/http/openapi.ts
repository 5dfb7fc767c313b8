import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pino } from 'pino';
import { loadConfig } from '../config.js';
import type { JobQueue } from '../jobs/queue.js';
import { FilesystemStore } from '../stores/filesystem-store.js';
import { buildApp } from './app.js';

/** A queue that is never used: the document only needs the routes' schemas. */
const inertQueue: JobQueue = {
  mode: 'embedded',
  submit: () => Promise.reject(new Error('inert')),
  get: async () => null,
  cancel: async () => null,
  waitFor: () => Promise.reject(new Error('inert')),
  list: async () => [],
  onFinished: () => () => {},
  remove: async () => false,
  counts: async () => ({ queued: 0, running: 0, succeeded: 0, failed: 0, canceled: 0 }),
  ready: async () => false,
  close: async () => {},
};

/** The OpenAPI 3.1 document generated from the zod schemas of the routes, as committed in openapi/. */
export async function generateOpenApi(): Promise<string> {
  const config = loadConfig({ DATA_DIR: join(tmpdir(), 'rhythmetric-openapi-unused') });
  const app = await buildApp({ config, store: new FilesystemStore(config.dataDir), queue: inertQueue, logger: pino({ level: 'silent' }) });
  try {
    return JSON.stringify(app.swagger(), null, 2) + '\n';
  } finally {
    await app.close();
  }
}
