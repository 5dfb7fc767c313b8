import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeEdf } from '../../src/signals/edf/index.js';
import { startTestApi } from '../helpers/app.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi();
});
afterAll(async () => {
  await api.stop();
});

const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');
const octet = { 'content-type': 'application/octet-stream' };
const samples = Buffer.from(new Float32Array(3 * 5000).map((_, i) => Math.sin(i / 9) * 40).buffer);

describe('when a large file is uploaded in parts', () => {
  it('should accept parts in any order, let a part be resent, check the hash and store the same signal as one request', async () => {
    const start = await api.app.inject({ method: 'POST', url: '/v1/uploads', payload: { format: 'float32', samplingRate: 500, channels: ['F3', 'F4', 'Fz'], sha256: sha(samples) } });
    expect(start.statusCode).toBe(201);
    const id = start.json().id;
    const cuts = [samples.subarray(0, 20_000), samples.subarray(20_000, 40_000), samples.subarray(40_000)];
    for (const n of [3, 1, 2]) {
      const res = await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/${n}`, headers: octet, payload: Buffer.from(n === 2 ? Buffer.alloc(20_000, 7) : cuts[n - 1]!) });
      expect(res.statusCode).toBe(200);
    }
    // Part 2 was wrong: resend it, as a client resuming after a failure would.
    const resent = await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/2`, headers: octet, payload: Buffer.from(cuts[1]!) });
    expect(resent.json()).toMatchObject({ part: 2, bytes: 20_000, sha256: sha(Buffer.from(cuts[1]!)) });
    const state = (await api.app.inject({ method: 'GET', url: `/v1/uploads/${id}` })).json();
    expect(state.parts.map((p: { part: number }) => p.part)).toEqual([1, 2, 3]);
    const done = await api.app.inject({ method: 'POST', url: `/v1/uploads/${id}/complete`, payload: { parts: 3 } });
    expect(done.statusCode).toBe(201);
    const direct = await api.app.inject({ method: 'POST', url: '/v1/signals?samplingRate=500&channels=F3,F4,Fz', headers: octet, payload: samples });
    expect(done.json().id).toBe(direct.json().id);
    expect((await api.app.inject({ method: 'GET', url: `/v1/uploads/${id}` })).statusCode).toBe(404);
  });

  it('should refuse a hash mismatch and missing parts, storing nothing', async () => {
    const before = (await api.store.usage()).signals;
    const id = (await api.app.inject({ method: 'POST', url: '/v1/uploads', payload: { format: 'float32', samplingRate: 500, channels: ['A'] } })).json().id;
    await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/1`, headers: octet, payload: Buffer.alloc(4000) });
    await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/3`, headers: octet, payload: Buffer.alloc(4000) });
    const gap = await api.app.inject({ method: 'POST', url: `/v1/uploads/${id}/complete`, payload: {} });
    expect(gap.statusCode).toBe(422);
    expect(gap.json().detail).toContain('missing 2');
    await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/2`, headers: octet, payload: Buffer.alloc(4000) });
    const wrong = await api.app.inject({ method: 'POST', url: `/v1/uploads/${id}/complete`, payload: { sha256: '0'.repeat(64) } });
    expect(wrong.statusCode).toBe(422);
    expect(wrong.json().type).toBe('/problems/hash-mismatch');
    expect((await api.store.usage()).signals).toBe(before);
  });

  it('should store an EDF sent in parts exactly as the same EDF sent at once', async () => {
    const edf = Buffer.from(
      writeEdf({
        signals: ['C3', 'C4'].map((label, c) => ({
          label,
          samplingRate: 256,
          physicalDimension: 'uV',
          samples: Float64Array.from({ length: 256 * 30 }, (_, i) => Math.round(100 * Math.sin(i / 11 + c)) / 4),
        })),
        recordDuration: 1,
        startDate: { year: 2026, month: 12, day: 1, hour: 2, minute: 30, second: 0 },
        annotations: [{ onset: 3, duration: 1.5, label: 'arousal' }],
      }),
    );
    const id = (await api.app.inject({ method: 'POST', url: '/v1/uploads', payload: { format: 'edf' } })).json().id;
    const size = Math.ceil(edf.length / 4);
    for (let n = 0; n < 4; n++) await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/${n + 1}`, headers: octet, payload: edf.subarray(n * size, (n + 1) * size) });
    const parts = await api.app.inject({ method: 'POST', url: `/v1/uploads/${id}/complete`, payload: { sha256: sha(edf) } });
    expect(parts.statusCode).toBe(201);
    const once = await api.app.inject({ method: 'POST', url: '/v1/signals?format=edf', headers: octet, payload: edf });
    expect(parts.json().id).toBe(once.json().id);
    expect(parts.json().events).toEqual([{ onset: 3, duration: 1.5, label: 'arousal' }]);
  });

  it('should answer 404 for an unknown upload, and 413 for a part over the limit', async () => {
    expect((await api.app.inject({ method: 'GET', url: `/v1/uploads/upl_${'0'.repeat(32)}` })).statusCode).toBe(404);
    const small = await startTestApi({ BODY_LIMIT_BYTES: '1000' });
    try {
      const id = (await small.app.inject({ method: 'POST', url: '/v1/uploads', payload: { format: 'edf' } })).json().id;
      const big = await small.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/1`, headers: octet, payload: Buffer.alloc(5000) });
      expect(big.statusCode).toBe(413);
      expect(big.json().type).toBe('/problems/payload-too-large');
    } finally {
      await small.stop();
    }
  });
});
