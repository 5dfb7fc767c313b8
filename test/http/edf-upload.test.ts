import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeEdf } from '../../src/signals/edf/index.js';
import { pollJob, startTestApi } from '../helpers/app.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi();
});
afterAll(async () => {
  await api.stop();
});

const fs = 256;
const seconds = 20;
const start = { year: 2026, month: 11, day: 30, hour: 23, minute: 5, second: 0 };

/** Digital codes of a 10 Hz rhythm; both files below hold exactly these codes. */
const codes = Array.from({ length: fs * seconds }, (_, i) => Math.round(20000 * Math.sin((2 * Math.PI * 10 * i) / fs) + 300 * Math.sin(i)));

/** EDF (Kemp et al. 1992): physical = (digital − digmin)·(physmax − physmin)/(digmax − digmin) + physmin. */
function file(unit: 'mV' | 'uV') {
  const [pmin, pmax] = unit === 'mV' ? [-3.2768, 3.2767] : [-3276.8, 3276.7];
  const gain = (pmax - pmin) / 65535;
  const samples = codes.map((d) => (d + 32768) * gain + pmin);
  return Buffer.from(
    writeEdf({
      signals: ['O1', 'O2'].map((label) => ({
        label,
        samples,
        samplingRate: fs,
        physicalDimension: unit,
        physicalMinimum: pmin,
        physicalMaximum: pmax,
        digitalMinimum: -32768,
        digitalMaximum: 32767,
      })),
      recordDuration: 1,
      startDate: start,
      annotations: [{ onset: 5, duration: 10, label: 'eyes closed' }],
    }),
  );
}

async function upload(bytes: Buffer, query = '') {
  return api.app.inject({ method: 'POST', url: `/v1/signals?format=edf${query}`, headers: { 'content-type': 'application/octet-stream' }, payload: bytes });
}

describe('when an EDF+ file is uploaded', () => {
  it('should store labels, rate, µV samples and annotations as events', async () => {
    const res = await upload(file('uV'));
    expect(res.statusCode).toBe(201);
    expect(res.json()).toMatchObject({ channels: ['O1', 'O2'], samplingRate: 256, unit: 'uV', epochCount: 1, samplesPerEpoch: fs * seconds });
    expect(res.json().events).toEqual([{ onset: 5, duration: 10, label: 'eyes closed' }]);
  });

  it('should give the same signal id, and so the same record, for the same data in mV and in µV', async () => {
    const micro = (await upload(file('uV'))).json();
    const milli = (await upload(file('mV'))).json();
    expect(milli.id).toBe(micro.id);
    const job = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: milli.id, recipe: { method: 'welch' } } });
    expect((await pollJob(api.app, job.json().id)).state).toBe('succeeded');
  });

  it('should select channels by label and name the labels that exist when one is unknown', async () => {
    expect((await upload(file('uV'), '&channels=O2')).json().channels).toEqual(['O2']);
    const res = await upload(file('uV'), '&channels=Oz');
    expect(res.statusCode).toBe(422);
    expect(res.json().pointer).toMatch(/^\/query\/channels/);
    expect(res.json().detail).toContain('O1');
  });

  it('should refuse a malformed header naming the field and byte offset', async () => {
    const bytes = file('uV');
    bytes.write('512     ', 184, 'latin1'); // header byte count: EDF puts it at offset 184, 8 ASCII bytes
    const res = await upload(bytes);
    expect(res.statusCode).toBe(422);
    expect(res.json().type).toBe('/problems/invalid-signal');
    expect(res.json().detail).toMatch(/184/);
  });
});

describe('when an EDF+C file rounds its record onsets', () => {
  it('should accept a record onset off by less than half a sample, as the whole-file reader does', async () => {
    const bytes = file('uV');
    // EDF+ §2.2.4: each record's time-keeping TAL holds its onset. Record 2 of these 1 s records says
    // "+1"; "+1.001" is 1 ms late, under half a sample (1/512 s ≈ 1.95 ms) at 256 Hz, so not a gap.
    const tal = Buffer.from('+1\x14\x14\x00', 'latin1');
    const at = bytes.indexOf(tal);
    expect(at).toBeGreaterThan(0);
    bytes.set(Buffer.from('+1.001\x14\x14\x00', 'latin1'), at);
    const res = await upload(bytes);
    expect(res.statusCode, res.body).toBe(201);
  });
});
