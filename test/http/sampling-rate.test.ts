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

// 1e-300 and 5e-324 (the smallest positive double, IEEE 754 subnormal) are the rates a probe sent;
// 0.001 Hz is below the default minimum of 0.01 Hz (README, MIN_SAMPLING_RATE).
const ABSURD = [1e-300, 5e-324, 0.001];

const expectRefused = (res: { statusCode: number; headers: Record<string, unknown>; json: () => Record<string, unknown> }, pointer: string) => {
  expect(res.statusCode).toBe(422);
  expect(String(res.headers['content-type'])).toMatch(/^application\/problem\+json/);
  const body = res.json();
  expect(body.type).toBe('/problems/invalid-signal');
  expect(body.pointer).toBe(pointer);
  expect(body.detail).toMatch(/samplingRate .* below this server's minimum of 0\.01 Hz/);
};

describe('when a signal is uploaded with an absurdly low sampling rate', () => {
  it.each(ABSURD)('should refuse a JSON body at %s Hz with 422 pointing at /samplingRate', async (samplingRate) => {
    const res = await api.app.inject({ method: 'POST', url: '/v1/signals', payload: { samplingRate, channels: ['Cz'], data: [[1, 2, 3, 4, 5, 6, 7, 8]] } });
    expectRefused(res, '/samplingRate');
  });

  it.each(ABSURD)('should refuse a float32 body at %s Hz with 422 pointing at the query parameter', async (samplingRate) => {
    const res = await api.app.inject({
      method: 'POST',
      url: `/v1/signals?samplingRate=${samplingRate}&channels=Cz`,
      headers: { 'content-type': 'application/octet-stream' },
      payload: Buffer.from(new Float32Array(64).buffer),
    });
    expectRefused(res, '/query/samplingRate');
  });

  it('should refuse an EDF file whose records make the rate 1e-8 Hz (one sample per 99 999 999 s record)', async () => {
    const bytes = Buffer.from(
      writeEdf({
        signals: [{ label: 'Cz', samples: [1, 2, 3, 4], samplingRate: 1, physicalMinimum: 0, physicalMaximum: 10 }],
        recordDuration: 1,
        startDate: { year: 2026, month: 1, day: 1, hour: 0, minute: 0, second: 0 },
      }),
    );
    // The record-duration field: 8 ASCII characters at byte 244 of the header (EDF, Kemp et al. 1992).
    expect(bytes.subarray(244, 252).toString('ascii').trim()).toBe('1');
    bytes.write('99999999', 244, 'ascii');
    const res = await api.app.inject({ method: 'POST', url: '/v1/signals?format=edf', headers: { 'content-type': 'application/octet-stream' }, payload: bytes });
    expectRefused(res, '/body');
  });

  it('should refuse a resumable upload at its start, before any part is sent', async () => {
    const res = await api.app.inject({ method: 'POST', url: '/v1/uploads', payload: { format: 'float32', samplingRate: 5e-324, channels: ['Cz'] } });
    expectRefused(res, '/samplingRate');
  });

  it('should accept the minimum itself, and a lower rate once MIN_SAMPLING_RATE allows it', async () => {
    const data = [[1, 2, 3, 4, 5, 6, 7, 8]];
    expect((await api.app.inject({ method: 'POST', url: '/v1/signals', payload: { samplingRate: 0.01, channels: ['Cz'], data } })).statusCode).toBe(201);
    const lenient = await startTestApi({ MIN_SAMPLING_RATE: '0.0001' });
    try {
      expect((await lenient.app.inject({ method: 'POST', url: '/v1/signals', payload: { samplingRate: 0.001, channels: ['Cz'], data } })).statusCode).toBe(201);
    } finally {
      await lenient.stop();
    }
  });
});
