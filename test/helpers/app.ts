import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Writable } from 'node:stream';
import { afterAll, beforeAll } from 'vitest';
import { loadConfig } from '../../src/config.js';
import { createLogger, startApi } from '../../src/cli/runtime.js';

/** Captured JSON log lines, as pino writes them (after pino's own test helper). */
export function sink() {
  const lines: Record<string, unknown>[] = [];
  const stream = new Writable({
    write(chunk, _encoding, done) {
      for (const line of String(chunk).split('\n')) if (line.trim()) lines.push(JSON.parse(line) as Record<string, unknown>);
      done();
    },
  });
  return { stream, lines };
}

/** An embedded-mode API on a fresh data directory. */
export async function startTestApi(env: Record<string, string> = {}) {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-test-'));
  const config = loadConfig({ DATA_DIR: dataDir, LOG_LEVEL: 'info', WORKER_THREADS: '2', ...env });
  const logs = sink();
  const api = await startApi(config, createLogger(config, logs.stream));
  return {
    ...api,
    config,
    dataDir,
    logs: logs.lines,
    async stop() {
      await api.close();
      await rm(dataDir, { recursive: true, force: true });
    },
  };
}

/** An API started before the tests of the enclosing `describe` and stopped after them; call `api()` inside a test. */
export function useTestApi(env: Record<string, string> = {}): () => Awaited<ReturnType<typeof startTestApi>> {
  let api: Awaited<ReturnType<typeof startTestApi>> | null = null;
  beforeAll(async () => {
    api = await startTestApi(env);
  });
  afterAll(async () => {
    await api?.stop();
  });
  return () => api!;
}

/** Polls a job through the API until it finishes. */
export async function pollJob(app: Awaited<ReturnType<typeof startTestApi>>['app'], id: string, timeoutMs = 20_000, headers: Record<string, string> = {}) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await app.inject({ method: 'GET', url: `/v1/jobs/${id}`, headers });
    if (res.statusCode !== 200) throw new Error(`GET /v1/jobs/${id} answered ${res.statusCode}: ${res.body}`);
    const job = res.json() as { state: string };
    if (['succeeded', 'failed', 'canceled'].includes(job.state)) return job as Record<string, unknown> & { state: string };
    if (Date.now() > deadline) throw new Error(`job ${id} still ${job.state}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}
