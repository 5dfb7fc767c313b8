import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { loadConfig } from '../../src/config.js';
import type { ComputePool } from '../../src/jobs/compute-pool.js';
import { EmbeddedQueue, HANDOFF_BYTES } from '../../src/jobs/embedded-queue.js';
import { planJob } from '../../src/jobs/plan.js';
import type { PoolTaskOutput } from '../../src/jobs/pool-task.js';
import { runJob } from '../../src/jobs/run-job.js';
import type { JobSpec } from '../../src/jobs/spec.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { decodeJsonSignal } from '../../src/signals/decode-json.js';
import type { Signal } from '../../src/signals/signal.js';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';
import { storeSignal } from '../../src/stores/signals.js';

const dirs: string[] = [];
afterEach(async () => {
  for (const dir of dirs.splice(0)) await rm(dir, { recursive: true, force: true });
});

async function tempStore(): Promise<{ dataDir: string; store: FilesystemStore }> {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-handoff-'));
  dirs.push(dataDir);
  return { dataDir, store: new FilesystemStore(dataDir) };
}

const { signalLimits, recipeLimits } = loadConfig({ DATA_DIR: tmpdir(), LOG_LEVEL: 'silent' });

/** An upload as a client sends it: 3 epochs × 4 channels × 300 samples at 150 Hz, with events. */
function upload() {
  const random = createRandom(77);
  const epochs = Array.from({ length: 3 }, () => Array.from({ length: 4 }, (_, c) => Array.from({ length: 300 }, (_, i) => Math.sin((2 * Math.PI * (6 + c) * i) / 150) + 0.5 * random.normal())));
  return { samplingRate: 150, channels: ['F3', 'F4', 'Cz', 'Pz'], unit: 'uV', epochs, events: [{ onset: 0.5, duration: 0, label: 'cue' }] };
}

/** The record minus provenance (timings, host), which is not part of the result. */
function recordWithoutProvenance(text: string): unknown {
  const { provenance: _provenance, ...rest } = JSON.parse(text) as { provenance: unknown };
  return rest;
}

describe('when a job is given the samples of its upload', () => {
  it('should store the record bytes the job gives when it reads the signal back, without reading it', async () => {
    const decoded = decodeJsonSignal(upload(), signalLimits);
    const pinned = normalizeRecipe({ method: 'welch', segmentSeconds: 1 });

    const handed = await tempStore();
    const meta = await storeSignal(handed.store, decoded, 'lab');
    const { spec } = planJob(recipeLimits, meta, pinned);
    let reads = 0;
    const getSignal = handed.store.getSignal.bind(handed.store);
    handed.store.getSignal = (id) => {
      reads++;
      return getSignal(id);
    };
    const outcome = await runJob(spec, handed.store, 'embedded', undefined, { signal: decoded });
    expect(reads).toBe(0);

    // The reference: the same job reading its signal from the store, as every job did before.
    const readBack = await tempStore();
    await storeSignal(readBack.store, decodeJsonSignal(upload(), signalLimits), 'lab');
    const reference = await runJob(spec, readBack.store, 'embedded');

    expect(outcome.resultHash).toBe(reference.resultHash);
    const text = (await handed.store.getDocument('records', spec.recordKey))!;
    const referenceText = (await readBack.store.getDocument('records', spec.recordKey))!;
    expect(recordWithoutProvenance(text)).toEqual(recordWithoutProvenance(referenceText));
    // The result part is stored as the canonical text its hash was taken over: byte for byte.
    expect(text.slice(text.indexOf('"result":'))).toBe(referenceText.slice(referenceText.indexOf('"result":')));
  });
});

const spec = (id: string) => ({ tenant: 'lab', signalId: `sig_${id}`, sha256: id, recipeId: 'rcp_x', recipeHash: 'h', recipe: { method: 'welch' }, recordKey: `lab/${id}/h/0` }) as unknown as JobSpec;
const signalOf = (bytes: number): Signal => ({ samplingRate: 100, channels: ['A'], unit: 'uV', epochCount: 1, samplesPerEpoch: bytes / 8, data: new Float64Array(bytes / 8) });
const succeeded: PoolTaskOutput = { ok: true, outcome: { recordKey: 'k', resultHash: 'r', computed: true } };

/** A pool that records what each start was given and answers when `finishNext` is called. */
function recordingPool(threads = 1) {
  const given: (Signal | undefined)[] = [];
  const finishers: ((output: PoolTaskOutput | Error) => void)[] = [];
  const pool: ComputePool = {
    threads,
    run: (_spec, _store, _mode, _progress, signal, samples) => {
      given.push(samples);
      return new Promise((resolve, reject) => {
        const finisher = (output: PoolTaskOutput | Error) => (output instanceof Error ? reject(output) : resolve(output));
        finishers.push(finisher);
        signal?.addEventListener('abort', () => {
          finishers.splice(finishers.indexOf(finisher), 1);
          reject(new Error('aborted'));
        });
      });
    },
    close: async () => {},
  };
  const finishNext = async (output: PoolTaskOutput | Error = succeeded) => {
    for (let i = 0; i < 2000 && finishers.length === 0; i++) await new Promise((r) => setTimeout(r, 5));
    finishers.shift()!(output);
  };
  return { pool, given, finishNext };
}

describe('when the embedded queue is given an upload with a job', () => {
  it('should hand the samples to its first start only, and read them back on a retry', async () => {
    const { dataDir, store } = await tempStore();
    const { pool, given, finishNext } = recordingPool();
    const queue = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool, maxAttempts: 2 });
    const signal = signalOf(800);
    await queue.submit(spec('a'), 'job_a', { signal });
    await finishNext(new Error('the thread died'));
    await finishNext();
    expect(await queue.waitFor('job_a', 10_000)).toMatchObject({ state: 'succeeded', attempts: 2 });
    expect(given).toEqual([signal, undefined]);
    await queue.close();
  });

  it(`should hold at most ${HANDOFF_BYTES} bytes for jobs waiting for a thread`, async () => {
    const { dataDir, store } = await tempStore();
    const { pool, given, finishNext } = recordingPool();
    const queue = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool });
    const half = HANDOFF_BYTES / 2;
    await queue.submit(spec('a'), 'job_a', { signal: signalOf(8) }); // takes the thread
    await queue.submit(spec('b'), 'job_b', { signal: signalOf(half) }); // held
    await queue.submit(spec('c'), 'job_c', { signal: signalOf(half + 8) }); // over the bound: read back
    await queue.submit(spec('d'), 'job_d', { signal: signalOf(8) }); // fits beside b
    for (const id of ['job_a', 'job_b', 'job_c', 'job_d']) {
      await finishNext();
      expect((await queue.waitFor(id, 10_000)).state).toBe('succeeded');
    }
    expect(given.map((s) => s?.data.byteLength)).toEqual([8, half, undefined, 8]);
    await queue.close();
  });
});

describe('when a job computes while its acceptance is being written', () => {
  async function heldStore() {
    const { dataDir, store } = await tempStore();
    let release: (error?: Error) => void = () => {};
    const held = new Promise<void>((resolve, reject) => (release = (error) => (error ? reject(error) : resolve())));
    const put = store.putDocument.bind(store);
    const written: string[] = [];
    store.putDocument = async (kind, key, text, options) => {
      const { state } = (JSON.parse(text) as { view: { state: string } }).view;
      if (kind === 'jobs' && state === 'running' && options?.durable) await held;
      await put(kind, key, text, options);
      written.push(state);
    };
    return { dataDir, store, release, written };
  }

  it('should not finish before the write lands', async () => {
    const { dataDir, store, release, written } = await heldStore();
    const { pool, finishNext } = recordingPool();
    const queue = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool });
    const submitting = queue.submit(spec('a'), 'job_a');
    await finishNext();
    await new Promise((r) => setTimeout(r, 50));
    expect((await queue.get('job_a'))?.state).toBe('running');
    release();
    expect((await submitting).job.state).toBe('running');
    expect((await queue.waitFor('job_a', 10_000)).state).toBe('succeeded');
    await queue.close();
    expect(written).toEqual(['running', 'succeeded']);
  });

  it('should abandon the job without a trace when the write fails, and take the next job', async () => {
    const { dataDir, store, release, written } = await heldStore();
    const { pool, given, finishNext } = recordingPool();
    const queue = await EmbeddedQueue.open({ store, storeConfig: { kind: 'filesystem', dataDir }, pool });
    const submitting = queue.submit(spec('a'), 'job_a');
    for (let i = 0; i < 2000 && given.length === 0; i++) await new Promise((r) => setTimeout(r, 5));
    release(new Error('disk full'));
    await expect(submitting).rejects.toThrow('disk full');
    expect(await queue.get('job_a')).toBeNull();
    expect(await store.getDocument('jobs', 'job_a')).toBeNull();

    // The thread slot came back: the next job starts at once.
    store.putDocument = FilesystemStore.prototype.putDocument.bind(store);
    expect((await queue.submit(spec('b'), 'job_b')).job.state).toBe('running');
    await finishNext();
    expect((await queue.waitFor('job_b', 10_000)).state).toBe('succeeded');
    await queue.close();
    expect(written).toEqual([]);
  });
});
