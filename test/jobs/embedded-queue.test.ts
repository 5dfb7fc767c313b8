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
    const { job } = await queue.submit(spec, 'job_close');
    for (let i = 0; i < 100 && (await queue.get(job.id))?.state !== 'running'; i++) await new Promise((r) => setTimeout(r, 5));
    expect((await queue.get(job.id))?.state).toBe('running');

    let closed = false;
    const closing = queue.close().then(() => (closed = true));
    await new Promise((r) => setTimeout(r, 50));
    expect(closed).toBe(false);
    release();
    await closing;

    const stored = JSON.parse((await store.getDocument('jobs', job.id))!) as { view: { state: string; attempts: number } };
    expect(stored.view).toMatchObject({ state: 'running', attempts: 1 });
  });
});
