import { afterEach, describe, expect, it } from 'vitest';
import { channelNames, http, smallInlineSignal, startHttpApi } from './helpers.js';

/** 2 channels × 2 s × 256 Hz, stored as float64: 2 · 512 · 8 = 8192 bytes of samples. */
const SIGNAL_BYTES = 2 * 512 * 8;
const LIMIT = 2 * SIGNAL_BYTES + 100;
const signal = (seed: number) => smallInlineSignal(seed, 2, 2, 256);

function float32Body(seed: number): Uint8Array {
  const data = new Float32Array(2 * 512).map((_, i) => Math.sin(i * 0.1 + seed));
  return new Uint8Array(data.buffer);
}

/** RFC 4918 §11.5: 507 Insufficient Storage; RFC 9457 problem+json with our stable type. */
function expectStorageFull(res: Awaited<ReturnType<typeof http>>) {
  expect(res.status).toBe(507);
  expect(res.headers.get('content-type')).toMatch(/^application\/problem\+json/);
  expect(res.body.type).toBe('/problems/storage-full');
  expect(res.body.detail).toMatch(/nothing was stored/);
}

describe('when the store has reached MAX_STORE_BYTES', () => {
  let api: Awaited<ReturnType<typeof startHttpApi>> | null = null;
  afterEach(async () => {
    await api?.stop();
    api = null;
  });

  it('should refuse further uploads (JSON, binary, inline in a job) with 507 and store nothing', async () => {
    api = await startHttpApi({ MAX_STORE_BYTES: String(LIMIT) });
    const a = await http(api.base, 'POST', '/v1/signals', signal(1));
    const b = await http(api.base, 'POST', '/v1/signals', signal(2));
    expect([a.status, b.status]).toEqual([201, 201]);
    const usage = await api.store.usage();
    expect(usage).toEqual({ signals: 2, bytes: 2 * SIGNAL_BYTES });

    expectStorageFull(await http(api.base, 'POST', '/v1/signals', signal(3)));
    expectStorageFull(await http(api.base, 'POST', `/v1/signals?samplingRate=256&channels=${channelNames(2).join(',')}`, float32Body(4), 'application/octet-stream'));
    expectStorageFull(await http(api.base, 'POST', '/v1/jobs', { signal: signal(5), recipe: { method: 'welch', segmentSeconds: 1 } }));

    expect(await api.store.usage()).toEqual(usage);
    expect((await api.store.listSignals()).sort()).toEqual([a.body.id, b.body.id].sort());
    expect(await api.store.listDocuments('jobs')).toEqual([]);
    expect((await http(api.base, 'GET', '/v1/jobs')).body.jobs).toEqual([]);

    // The same content again is not new data: answered from the store, nothing grows.
    const again = await http(api.base, 'POST', '/v1/signals', signal(1));
    expect(again.status).toBe(201);
    expect(again.body.id).toBe(a.body.id);
    expect(await api.store.usage()).toEqual(usage);
  });

  // Concurrent uploads must not all pass the check together (before reservations, 8 × 8192 bytes
  // were stored under a 16 484-byte limit).
  it('should keep the limit when many distinct uploads arrive at once', async () => {
    api = await startHttpApi({ MAX_STORE_BYTES: String(LIMIT) });
    const answers = await Promise.all(Array.from({ length: 8 }, (_, i) => http(api!.base, 'POST', '/v1/signals', signal(100 + i))));
    const stored = answers.filter((r) => r.status === 201);
    for (const r of answers.filter((x) => x.status !== 201)) expectStorageFull(r);
    const usage = await api.store.usage();
    expect(usage.bytes).toBeLessThanOrEqual(LIMIT);
    expect(usage.signals).toBe(stored.length);
    expect(stored.length).toBe(2);
  });
});
