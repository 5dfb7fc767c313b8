import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { RecordCachingStore } from '../../src/http/record-cache.js';
import { jobIdOf } from '../../src/jobs/spec.js';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';

const dirs: string[] = [];
afterEach(async () => {
  for (const dir of dirs.splice(0)) await rm(dir, { recursive: true, force: true });
});

/** A filesystem store that can be made to fail as a Redis store does while Redis is down. */
async function failingStore() {
  const dir = await mkdtemp(join(tmpdir(), 'rhythmetric-cache-'));
  dirs.push(dir);
  const store = new FilesystemStore(dir);
  let down = false;
  for (const method of ['getDocument', 'getAttachment'] as const) {
    const original = store[method].bind(store) as (...args: unknown[]) => Promise<unknown>;
    (store as unknown as Record<string, unknown>)[method] = (...args: unknown[]) =>
      down ? Promise.reject(Object.assign(new Error('connect ECONNREFUSED'), { code: 'ECONNREFUSED' })) : original(...args);
  }
  return { store, setDown: (value: boolean) => (down = value) };
}

const key = (tenant: string, n: number) => `${tenant}.${String(n).padStart(64, '0')}.${'f'.repeat(64)}.1.0.0`;
const text = (n: number, size: number) => JSON.stringify({ n, pad: 'x'.repeat(size) });

describe('when records are read through the cache', () => {
  it('should serve records read before while the store fails, and answer the job index entry from the record key', async () => {
    const { store, setDown } = await failingStore();
    const cache = new RecordCachingStore(store, 1_000_000);
    await store.putDocument('records', key('lab-a', 1), text(1, 10));
    expect(await cache.getDocument('records', key('lab-a', 1))).toBe(text(1, 10));
    setDown(true);
    expect(await cache.getDocument('records', key('lab-a', 1))).toBe(text(1, 10));
    expect(JSON.parse((await cache.getDocument('job-index', jobIdOf(key('lab-a', 1))))!)).toEqual({ tenant: 'lab-a', recordKey: key('lab-a', 1) });
    await expect(cache.getDocument('job-index', jobIdOf(key('lab-a', 2)))).rejects.toThrow(/ECONNREFUSED/);
  });

  it('should keep no more than its byte budget, dropping the least recently used first', async () => {
    const { store, setDown } = await failingStore();
    // 2 bytes a UTF-16 character: a record of ~1 015 characters counts ~2 030 bytes, and records get
    // half of the budget, so three fit in 14 000 / 2 and a fourth pushes one out.
    const cache = new RecordCachingStore(store, 14_000);
    for (const n of [1, 2, 3, 4]) await store.putDocument('records', key('lab-a', n), text(n, 1000));
    for (const n of [1, 2, 3]) await cache.getDocument('records', key('lab-a', n));
    await cache.getDocument('records', key('lab-a', 1)); // 1 is now the most recent; 2 the least
    await cache.getDocument('records', key('lab-a', 4));
    expect(cache.cachedBytes).toBeLessThanOrEqual(7_000);
    expect(cache.cachedBytes).toBeGreaterThan(6_000);
    setDown(true);
    await expect(cache.getDocument('records', key('lab-a', 2))).rejects.toThrow();
    for (const n of [1, 3, 4]) expect(await cache.getDocument('records', key('lab-a', n))).toBe(text(n, 1000));
  });

  it('should forget a record and an attachment removed through it', async () => {
    const { store, setDown } = await failingStore();
    const cache = new RecordCachingStore(store, 1_000_000);
    await store.putDocument('records', key('lab-a', 5), text(5, 10));
    await store.putAttachment(`${key('lab-a', 5)}.power-0`, new Uint8Array([1, 2, 3]));
    await cache.getDocument('records', key('lab-a', 5));
    expect([...(await cache.getAttachment(`${key('lab-a', 5)}.power-0`))!]).toEqual([1, 2, 3]);
    await cache.deleteAttachment(`${key('lab-a', 5)}.power-0`);
    await cache.deleteDocument('records', key('lab-a', 5));
    expect(await cache.getDocument('records', key('lab-a', 5))).toBeNull();
    setDown(true);
    await expect(cache.getAttachment(`${key('lab-a', 5)}.power-0`)).rejects.toThrow();
    await expect(cache.getDocument('job-index', jobIdOf(key('lab-a', 5)))).rejects.toThrow();
  });
});
