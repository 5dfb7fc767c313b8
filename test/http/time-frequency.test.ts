import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { pollJob, startTestApi } from '../helpers/app.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi();
});
afterAll(async () => {
  await api.stop();
});

const fs = 250;
const trials = 20;
const before = 0.5;
const after = 1.5;

/**
 * Invented event-related study: 20 events 3 s apart; channels O1/O2 carry a 10 Hz burst from 0.3 s
 * to 0.6 s after each event (random phase), Fz/Cz a 6 Hz component phase-locked to the event,
 * all over white noise.
 */
function study() {
  const random = createRandom(2026);
  const seconds = trials * 3 + 2;
  const n = seconds * fs;
  const channels = ['O1', 'O2', 'Fz', 'Cz'];
  const events = Array.from({ length: trials }, (_, k) => ({ onset: 1 + 3 * k, duration: null, label: 'probe' }));
  const phases = events.map(() => 2 * Math.PI * random.uniform());
  const data = channels.map((_, c) =>
    Array.from({ length: n }, (_, i) => {
      const t = i / fs;
      let v = 0.5 * random.normal();
      events.forEach((ev, k) => {
        const u = t - ev.onset;
        if (c < 2 && u >= 0.3 && u < 0.6) v += 3 * Math.sin(2 * Math.PI * 10 * u + phases[k]!);
        if (c >= 2 && u >= 0 && u < 1) v += 1.5 * Math.sin(2 * Math.PI * 6 * u);
      });
      return v;
    }),
  );
  return { samplingRate: fs, channels, data, events };
}

async function run(recipe: Record<string, unknown>, signal: unknown = study()) {
  const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal, recipe } });
  expect(res.statusCode, res.body).toBe(202);
  const job = await pollJob(api.app, res.json().id, 60_000);
  expect(job.state, JSON.stringify(job.problem)).toBe('succeeded');
  return { job, record: (await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` })).json() };
}

async function matrix(jobId: string, name: string) {
  const res = await api.app.inject({ method: 'GET', url: `/v1/jobs/${jobId}/attachments/${name}` });
  expect(res.statusCode).toBe(200);
  const shape = String(res.headers['x-rhythmetric-shape']).split(',').map(Number);
  const bytes = res.rawPayload;
  return { shape, values: new Float64Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength)) };
}

describe('when the recipe asks for Morlet power around events', () => {
  it('should recover the 10 Hz burst at 0.3–0.6 s in O1/O2 only, in dB against the pre-event baseline', async () => {
    const { job, record } = await run({
      method: 'morlet',
      frequencies: [4, 6, 8, 10, 12, 16, 20],
      cycles: 7,
      epoching: { mode: 'events', beforeSeconds: before, afterSeconds: after },
      baseline: { start: -0.4, end: -0.1, mode: 'decibel' },
      phaseConsistency: true,
      summary: [
        { name: 'burst', low: 9, high: 11, start: 0.35, end: 0.55 },
        { name: 'late', low: 9, high: 11, start: 1.0, end: 1.3 },
      ],
    });
    const tf = record.result.timeFrequency;
    expect(tf.timeOrigin).toBe('event');
    expect(tf.times[0]).toBeCloseTo(-before, 12);
    expect(tf.trials).toBe(trials);
    const burst = (name: string) => record.result.channels.find((c: { name: string }) => c.name === name).summary[0].value;
    const late = (name: string) => record.result.channels.find((c: { name: string }) => c.name === name).summary[1].value;
    // Burst power A²/2 = 4.5 µV² against the white noise a unit-gain 7-cycle wavelet passes,
    // 2σ²·Σψ̃² = σ²/(√π·σ_t·fs) = 0.25/(√π·0.1114·250) ≈ 0.005 µV²: about 29 dB at the burst centre
    // (σ_t = n/(2πf), docs/references.md §7); 10 dB is a wide margin below it.
    expect(burst('O1')).toBeGreaterThan(10);
    expect(burst('O2')).toBeGreaterThan(10);
    expect(Math.abs(late('O1'))).toBeLessThan(3);
    // Fz has no 10 Hz burst; what it shows there is the skirt of its 6 Hz component (σ_f = f/7).
    expect(burst('Fz')).toBeLessThan(burst('O1') - 10);

    // The matrix of one channel is fetched on its own; its peak lies at 10 Hz inside the burst window.
    const { shape, values } = await matrix(job.id as string, 'power-0');
    const [T, F] = shape as [number, number];
    expect(T).toBe(tf.times.length);
    expect(F).toBe(7);
    let best = -Infinity;
    let at = [0, 0];
    for (let t = 0; t < T; t++) for (let k = 0; k < F; k++) if (values[t * F + k]! > best) [best, at] = [values[t * F + k]!, [t, k]];
    expect(record.result.frequencies[at[1]!]).toBe(10);
    expect(tf.times[at[0]!]).toBeGreaterThan(0.25);
    expect(tf.times[at[0]!]).toBeLessThan(0.65);

    // Phase consistency: the event-locked 6 Hz component in Fz stands far above the no-locking level
    // (E ≈ √(π/(4n)), common practice), the random-phase burst in O1 does not.
    expect(tf.phaseConsistencyNull.trialCount).toBe(trials);
    expect(tf.phaseConsistencyNull.rootMeanSquare).toBeCloseTo(1 / Math.sqrt(trials), 12);
    const fz = (await matrix(job.id as string, 'phase-consistency-2')).values;
    const o1 = (await matrix(job.id as string, 'phase-consistency-0')).values;
    const cell = (t: number, k: number) => t * F + k;
    const t05 = tf.times.findIndex((x: number) => x >= 0.5);
    expect(fz[cell(t05, 1)]!).toBeGreaterThan(0.9);
    expect(o1[cell(t05, 3)]!).toBeLessThan(tf.phaseConsistencyNull.threshold + 0.1);
  });

  it('should list its attachments with shape, dtype and hash, and give only summaries when asked', async () => {
    const { job, record } = await run({
      method: 'morlet',
      frequencies: { low: 4, high: 20, count: 5 },
      epoching: { mode: 'events', beforeSeconds: before, afterSeconds: after },
      output: 'summary',
      summary: [{ name: 'alpha-burst', low: 8, high: 13, start: 0.3, end: 0.6 }],
    });
    expect(record.result.timeFrequency.attachments).toEqual([]);
    expect(record.result.channels[0].summary[0].value).toBeGreaterThan(1);
    expect((await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/attachments/power-0` })).statusCode).toBe(404);
  });
});

describe('when the recipe asks for a spectrogram', () => {
  it('should show the burst at 10 Hz in the windows centred inside 0.3–0.6 s', async () => {
    const { job, record } = await run({
      method: 'spectrogram',
      segmentSeconds: 0.2,
      stepSeconds: 0.05,
      frequencyRange: [0, 40],
      epoching: { mode: 'events', beforeSeconds: before, afterSeconds: after },
    });
    const { shape, values } = await matrix(job.id as string, 'power-0');
    const [T, F] = shape as [number, number];
    const k10 = record.result.frequencies.indexOf(10);
    const times: number[] = record.result.timeFrequency.times;
    const inside = times.findIndex((t) => t >= 0.45);
    const outside = times.findIndex((t) => t >= 1.2);
    expect(T).toBe(times.length);
    expect(values[inside * F + k10]! / values[outside * F + k10]!).toBeGreaterThan(20);
  });
});

describe('when the recipe asks for connectivity', () => {
  it('should find coherence near 1 for a shared component and near its null for independent noise', async () => {
    const random = createRandom(9);
    const n = 60 * fs;
    const shared = Array.from({ length: n }, () => random.normal());
    const signal = {
      samplingRate: fs,
      channels: ['C3', 'C4', 'Pz'],
      data: [shared.map((v) => v + 0.1 * random.normal()), shared.map((v) => 0.8 * v + 0.1 * random.normal()), Array.from({ length: n }, () => random.normal())],
    };
    const { record } = await run({ method: 'connectivity', segmentSeconds: 1, overlap: 0, epoching: { mode: 'fixed', epochSeconds: 4 } }, signal);
    const c = record.result.connectivity;
    const pair = (a: string, b: string) => c.pairs.find((p: { channels: string[] }) => p.channels[0] === a && p.channels[1] === b);
    const mean = (v: (number | null)[]) => v.filter((x): x is number => x !== null).reduce((s, x) => s + x, 0) / v.length;
    expect(mean(pair('C3', 'C4').coherence)).toBeGreaterThan(0.95);
    // Independent Gaussian signals, n non-overlapped segments: E[MSC] = 1/n (Carter et al. 1973; docs/references.md §7).
    expect(c.coherenceBias).toBeCloseTo(1 / c.effectiveSegments, 12);
    expect(mean(pair('C3', 'Pz').coherence)).toBeLessThan(3 / c.effectiveSegments);
  });
});

describe('when connectivity meets flat channels', () => {
  it('should succeed with null values and a warning naming them, never failing on NaN', async () => {
    // Two flat channels (a disconnected electrode reading zero, one stuck at a constant) beside a live
    // one. 0/0 is undefined, as scipy.signal.coherence gives NaN (docs/references.md §7); before the
    // fix NaN band values reached the canonical JSON and the job failed after every retry.
    const random = createRandom(31);
    const n = 16 * fs;
    const signal = {
      samplingRate: fs,
      channels: ['Fz', 'Cz', 'Pz'],
      data: [Array.from({ length: n }, () => random.normal()), new Array<number>(n).fill(0), new Array<number>(n).fill(12.5)],
    };
    const { job, record } = await run({ method: 'connectivity', segmentSeconds: 1, overlap: 0.5, bands: [{ name: 'alpha', low: 8, high: 13 }], epoching: { mode: 'fixed', epochSeconds: 4 } }, signal);
    expect(job.state).toBe('succeeded');
    const c = record.result.connectivity;
    for (const pair of c.pairs) {
      expect(pair.coherence.every((v: number | null) => v === null)).toBe(true);
      expect(pair.imaginaryCoherency.every((v: number | null) => v === null)).toBe(true);
      expect(pair.phaseLocking.every((v: number | null) => v === null)).toBe(true);
      expect(pair.bands[0]).toMatchObject({ coherence: null, imaginaryCoherency: null, phaseLocking: null });
    }
    const warnings = record.result.warnings.join('\n');
    expect(warnings).toMatch(/channel Cz is flat/);
    expect(warnings).toMatch(/channel Pz is flat/);
  });
});
