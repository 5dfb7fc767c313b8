import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import type { ComputePool } from '../../src/jobs/compute-pool.js';
import { EmbeddedQueue } from '../../src/jobs/embedded-queue.js';
import type { JobSpec } from '../../src/jobs/spec.js';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';

const dirs: string[] = [];
afterEach(async () => {
  for (const dir of dirs.splice(0)) await rm(dir, { recursive: true, force: true });
});

/** A pool whose computations never finish on their own: they end only when aborted. */
const idlePool: ComputePool = {
  threads: 1,
  run: (_spec, _store, _mode, _progress, signal) => new Promise((_resolve, reject) => signal?.addEventListener('abort', () => reject(new Error('aborted')))),
  close: async () => {},
};

const spec = { tenant: 'lab', signalId: 'sig_x', sha256: 'x', recipeId: 'rcp_x', recipeHash: 'h', recipe: {}, recordKey: 'lab/x/h/0' } as unknown as JobSpec;

describe('when the embedded queue closes while a job-state write is under way', () => {
  it('should wait for the write, so a restart reads the running state and its attempt', async () => {
    const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-close-'));
    dirs.push(dataDir);
    const store = new FilesystemStore(dataDir);
    // Hold back the write of the "running" state, as a slow disk would.
    let release = () => {};
    const held = new Promise<void>((resolve) => (release = resolve));
    const put = store.putDocument.bind(store);
    store.putDocument = async (kind, key, text, options) => {
      if (kind === 'jobs' && (JSON.parse(text) as { view: { state: string } }).view.state === 'running') await held;
      return put(kind, key, text, options);
    };
    const queue = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool: idlePool });
    // A job that finds a free thread is accepted with its start written, so submit waits too.
    const submitting = queue.submit(spec, 'job_close');
    const job = { id: 'job_close' };
    for (let i = 0; i < 100 && (await queue.get(job.id))?.state !== 'running'; i++) await new Promise((r) => setTimeout(r, 5));
    expect((await queue.get(job.id))?.state).toBe('running');

    let closed = false;
    const closing = queue.close().then(() => (closed = true));
    await new Promise((r) => setTimeout(r, 50));
    expect(closed).toBe(false);
    release();
    await closing;
    await submitting;

    const stored = JSON.parse((await store.getDocument('jobs', job.id))!) as { view: { state: string; attempts: number } };
    expect(stored.view).toMatchObject({ state: 'running', attempts: 1 });
  });
});

describe('when the embedded queue restarts with a job that was running', () => {
  async function runningThen(dataDir: string, end: (queue: EmbeddedQueue) => Promise<void>, maxAttempts: number) {
    const store = new FilesystemStore(dataDir);
    const queue = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool: idlePool, maxAttempts });
    const { job } = await queue.submit(spec, 'job_restart');
    for (let i = 0; i < 100 && (await queue.get(job.id))?.state !== 'running'; i++) await new Promise((r) => setTimeout(r, 5));
    // Let the "running" write land, as the computation would have begun by then.
    await new Promise((r) => setTimeout(r, 50));
    await end(queue);
    return job.id;
  }

  it('should fail the job without starting it when the process died during its last attempt', async () => {
    const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-crash-'));
    dirs.push(dataDir);
    // A process that dies runs no close(): abandoning the queue object is what the disk sees.
    const id = await runningThen(dataDir, async () => {}, 1);
    let starts = 0;
    const countingPool: ComputePool = { ...idlePool, run: (...args) => (starts++, idlePool.run(...args)) };
    const store = new FilesystemStore(dataDir);
    const reopened = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool: countingPool, maxAttempts: 1 });
    const job = await reopened.get(id);
    expect(job).toMatchObject({ state: 'failed', attempts: 1 });
    expect(job?.problem?.detail).toMatch(/took the process down 1 time\(s\)/);
    expect(starts).toBe(0);
    await reopened.close();
  });

  it('should not count a graceful shutdown as a crash, however often it happens', async () => {
    const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-shutdown-'));
    dirs.push(dataDir);
    const id = await runningThen(dataDir, (queue) => queue.close(), 1);
    for (let restart = 0; restart < 3; restart++) {
      const store = new FilesystemStore(dataDir);
      const queue = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool: idlePool, maxAttempts: 1 });
      for (let i = 0; i < 100 && (await queue.get(id))?.state !== 'running'; i++) await new Promise((r) => setTimeout(r, 5));
      expect((await queue.get(id))?.state).toBe('running');
      await new Promise((r) => setTimeout(r, 50));
      await queue.close();
    }
  });
});
