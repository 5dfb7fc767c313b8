import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApi } from '../helpers/app.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi();
});
afterAll(async () => {
  await api.stop();
});

// Invented samples of a 20 µV rhythm, written once in µV and once in V and mV as a lab's export
// script would print them (SI prefixes: 1 V = 10^6 µV, 1 mV = 10^3 µV; BIPM SI Brochure, common practice).
const microvolts = [
  [12.5, -3.25, 20, -18.75, 0.5, 7, -11.125, 2],
  [1.5, 2.5, -4, 6.25, -8, 10, -12.5, 14],
];
const asText = (rows: number[][], exponent: number) => rows.map((row) => row.map((v) => Number(`${v}e${exponent}`)));

function post(payload: Record<string, unknown>) {
  return api.app.inject({ method: 'POST', url: '/v1/signals', payload });
}

describe('when JSON uploads declare a voltage unit', () => {
  it('should store V, mV and µV versions of the same recording under one id, in µV', async () => {
    const base = { samplingRate: 128, channels: ['O1', 'O2'] };
    const micro = await post({ ...base, unit: 'µV', data: microvolts });
    const volts = await post({ ...base, unit: 'V', data: asText(microvolts, -6) });
    const milli = await post({ ...base, unit: 'mV', data: asText(microvolts, -3) });
    expect(micro.statusCode, micro.body).toBe(201);
    expect(volts.json().id).toBe(micro.json().id);
    expect(milli.json().id).toBe(micro.json().id);
    expect(volts.json().unit).toBe('uV');
  });

  it('should refuse an unknown unit with 422 at /unit, and keep a declared non-voltage as given', async () => {
    const refused = await post({ samplingRate: 128, channels: ['BP'], unit: 'mmHg', data: [[80, 81, 82, 83]] });
    expect(refused.statusCode).toBe(422);
    expect(refused.json()).toMatchObject({ pointer: '/unit' });
    expect(refused.json().detail).toMatch(/unknown voltage unit "mmHg".*"voltage": false/);
    const kept = await post({ samplingRate: 128, channels: ['BP'], unit: 'mmHg', voltage: false, data: [[80, 81, 82, 83]] });
    expect(kept.statusCode, kept.body).toBe(201);
    expect(kept.json()).toMatchObject({ unit: 'mmHg', warnings: [] });
  });

  it('should warn when volts are uploaded as µV', async () => {
    const res = await post({ samplingRate: 128, channels: ['O1', 'O2'], data: asText(microvolts, -6) });
    expect(res.statusCode).toBe(201);
    expect(res.json().warnings).toHaveLength(2);
    expect(res.json().warnings[0]).toMatch(/channel "O1" has an RMS of .* µV, far outside the EEG range/);
    const again = await api.app.inject({ method: 'GET', url: `/v1/signals/${res.json().id}` });
    expect(again.json().warnings).toEqual(res.json().warnings);
  });
});

describe('when float32 uploads declare a voltage unit', () => {
  const upload = (values: number[], query: string) =>
    api.app.inject({
      method: 'POST',
      url: `/v1/signals?samplingRate=128&channels=O1,O2${query}`,
      headers: { 'content-type': 'application/octet-stream' },
      payload: Buffer.from(Float32Array.from(values).buffer),
    });

  it('should convert mV to µV (values exact in float32, so the ids agree) and refuse an unknown unit', async () => {
    const micro = [500, -250, 125, 1000, -62.5, 31.25, 2, -4];
    const milli = micro.map((v) => v / 1000);
    // the float32 nearest each mV value times 1000 is not always the µV value itself; use exact ones
    const exact = micro.filter((_, i) => Math.fround(milli[i]!) * 1000 === micro[i]);
    expect(exact.length).toBeGreaterThanOrEqual(4);
    const a = await upload(exact, '&unit=uV');
    const b = await upload(
      exact.map((v) => v / 1000),
      '&unit=mV',
    );
    expect(a.statusCode, a.body).toBe(201);
    expect(b.json().id).toBe(a.json().id);
    const bad = await upload(micro, '&unit=uv2');
    expect(bad.statusCode).toBe(422);
    expect(bad.json().pointer).toBe('/query/unit');
    const other = await upload(micro, '&unit=mmHg&voltage=false');
    expect(other.statusCode, other.body).toBe(201);
    expect(other.json().unit).toBe('mmHg');
  });
});
