import { mkdtemp, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { loadConfig } from '../../src/config.js';
import { createComputePool, QUIET_JOB_WORK } from '../../src/jobs/compute-pool.js';
import { planJob } from '../../src/jobs/plan.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import type { Signal } from '../../src/signals/signal.js';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';
import { storeSignal } from '../../src/stores/signals.js';

const { recipeLimits } = loadConfig({ DATA_DIR: tmpdir(), LOG_LEVEL: 'silent' });
const pool = createComputePool(1, 1);
const dirs: string[] = [];
afterAll(async () => {
  await pool.close();
  for (const dir of dirs) await rm(dir, { recursive: true, force: true });
});

function noise(channels: number, samples: number, seed: number): Signal {
  const random = createRandom(seed);
  const data = Float64Array.from({ length: channels * samples }, () => random.normal());
  return { samplingRate: 256, channels: Array.from({ length: channels }, (_, c) => `E${c + 1}`), unit: 'uV', epochCount: 1, samplesPerEpoch: samples, data };
}

async function job(signal: Signal) {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-pool-'));
  dirs.push(dataDir);
  const store = new FilesystemStore(dataDir);
  const meta = await storeSignal(store, signal, 'lab');
  const { spec } = planJob(recipeLimits, meta, normalizeRecipe({ method: 'welch', segmentSeconds: 1 }));
  return { spec, store, storeConfig: { kind: 'filesystem' as const, dataDir } };
}

describe('when the compute pool runs a job', () => {
  it(`should report no progress for a job estimated at most ${QUIET_JOB_WORK} work, and succeed`, async () => {
    const { spec, store, storeConfig } = await job(noise(4, 512, 1));
    expect(spec.resolved!.cost.work).toBeLessThanOrEqual(QUIET_JOB_WORK);
    const progress: number[] = [];
    const output = await pool.run(spec, storeConfig, 'embedded', (f) => progress.push(f));
    expect(output.ok).toBe(true);
    expect(progress).toEqual([]);
    // The thread wrote the record synchronously: in place, whole, and no temp file left behind.
    const record = JSON.parse((await store.getDocument('records', spec.recordKey))!) as { resultHash: string };
    expect(output.ok && record.resultHash).toBe(output.ok && output.outcome.resultHash);
    expect(await readdir(join(storeConfig.dataDir, 'tmp'))).toEqual([]);
  });

  it('should report rising progress ending at 1 for a larger job', async () => {
    const { spec, storeConfig } = await job(noise(32, 256 * 120, 2));
    expect(spec.resolved!.cost.work).toBeGreaterThan(QUIET_JOB_WORK);
    const progress: number[] = [];
    const output = await pool.run(spec, storeConfig, 'embedded', (f) => progress.push(f));
    expect(output.ok).toBe(true);
    expect(progress.length).toBeGreaterThan(1);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));
    expect(progress[0]).toBeGreaterThanOrEqual(0);
    // The last messages may trail the task's answer on another port; the pool takes them before closing.
    expect(progress.at(-1)).toBe(1);
  });
});
