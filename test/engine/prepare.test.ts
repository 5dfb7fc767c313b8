import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { analyze } from '../../src/engine/analyze.js';
import type { FeatureRecord, FeatureResult } from '../../src/engine/record.js';
import { viewedShape } from '../../src/jobs/spec.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe } from '../../src/recipes/resolve.js';
import type { Signal, SignalEvent } from '../../src/signals/signal.js';
import type { SignalView } from '../../src/signals/view.js';

const fs = 200;

function continuous(seconds: number, channels: string[], fill: (c: number, t: number, i: number) => number, events: SignalEvent[] = []): Signal {
  const n = seconds * fs;
  const data = new Float64Array(channels.length * n);
  channels.forEach((_, c) => {
    for (let i = 0; i < n; i++) data[c * n + i] = fill(c, i / fs, i);
  });
  return { samplingRate: fs, channels, unit: 'uV', epochCount: 1, samplesPerEpoch: n, data, ...(events.length ? { events } : {}) };
}

function run(signal: Signal, recipe: unknown, view: SignalView | null = null) {
  const pinned = normalizeRecipe(recipe);
  const resolved = resolveRecipe(pinned.recipe, pinned.hash, viewedShape(signal, view));
  return analyze(signal, resolved, { signalId: 'sig_x', sha256: 'x', recipeId: pinned.id, mode: 'local', view }) as FeatureRecord<FeatureResult>;
}

const random = createRandom(77);
const noise = continuous(60, ['O1', 'O2', 'Cz'], (c, t) => random.normal() + (c < 2 ? 3 * Math.sin(2 * Math.PI * 10 * t) : 0));

describe('when a job names a window and channels of a stored signal', () => {
  it('should give the same result, bit for bit, as uploading that window alone', () => {
    const view = { start: 10, end: 30, channels: ['O2', 'Cz'] };
    const viewed = run(noise, { method: 'welch' }, view);
    const n = noise.samplesPerEpoch;
    const cut = new Float64Array(2 * 20 * fs);
    cut.set(noise.data.subarray(n + 10 * fs, n + 30 * fs), 0);
    cut.set(noise.data.subarray(2 * n + 10 * fs, 2 * n + 30 * fs), 20 * fs);
    const direct = run({ ...noise, channels: ['O2', 'Cz'], samplesPerEpoch: 20 * fs, data: cut }, { method: 'welch' });
    expect(viewed.resultHash).toBe(direct.resultHash);
    expect(viewed.input.view).toEqual(view);
  });
});

describe('when bad spans are marked', () => {
  it('should leave out exactly the Welch segments that overlap them, and say how many per channel', () => {
    const spans: SignalEvent[] = [{ onset: 5, duration: 2, label: 'movement' }];
    const signal = { ...noise, events: spans };
    const record = run(signal, { method: 'welch', badSpans: { labels: ['movement'] } });
    // 2 s segments, 1 s step: segment k covers [k, k + 2) s; it overlaps [5, 7] for k = 4, 5, 6, 7 (k + 2 − 1/fs ≥ 5 and k ≤ 7).
    const total = Math.floor((60 * fs - fs) / fs);
    expect(record.result.estimate.segments[0]).toEqual({ name: 'O1', used: total - 4, leftOut: 4 });
  });

  it('should leave out segments whose peak-to-peak amplitude exceeds the limit in that channel only', () => {
    const spiky = continuous(20, ['A', 'B'], (c, _t, i) => (c === 1 && i === 1000 ? 500 : Math.sin(i / 7)));
    const record = run(spiky, { method: 'welch', badSpans: { peakToPeak: 100 } });
    // Sample 1000 (5 s) lies in the 2 s segments starting at 4 s and at 5 s ([3, 5) excludes it).
    expect(record.result.estimate.segments).toEqual([
      { name: 'A', used: 19, leftOut: 0 },
      { name: 'B', used: 17, leftOut: 2 },
    ]);
  });
});

describe('when the recipe cuts epochs around events', () => {
  const events: SignalEvent[] = [
    { onset: 2, duration: null, label: 'eyes-closed' },
    { onset: 12, duration: null, label: 'eyes-open' },
    { onset: 22, duration: null, label: 'eyes-closed' },
    { onset: 32, duration: null, label: 'eyes-open' },
    { onset: 59.5, duration: null, label: 'eyes-closed' },
  ];
  // 10 Hz of amplitude 4 for 4 s after every eyes-closed event, nothing after eyes-open (invented).
  const signal = continuous(60, ['Oz'], (_c, t) => ((t >= 2 && t < 6) || (t >= 22 && t < 26) ? 4 * Math.sin(2 * Math.PI * 10 * (t - 2)) : 0), events);

  it('should keep in-bounds epochs, drop the rest with the reason, and group features by label', () => {
    const record = run(signal, {
      method: 'welch',
      window: 'rectangular',
      detrend: 'none',
      segmentSeconds: 1,
      overlap: 0,
      epoching: { mode: 'events', beforeSeconds: 0, afterSeconds: 4 },
      bands: [{ name: 'alpha', low: 8, high: 13 }],
    });
    expect(record.result.epoching!.kept.map((k) => [k.label, k.startSeconds])).toEqual([
      ['eyes-closed', 2],
      ['eyes-open', 12],
      ['eyes-closed', 22],
      ['eyes-open', 32],
    ]);
    expect(record.result.epoching!.dropped).toEqual([expect.objectContaining({ label: 'eyes-closed', reason: 'out-of-bounds', startSeconds: 59.5 })]);
    const groups = Object.fromEntries(record.result.groups!.map((g) => [g.label, g]));
    // An on-bin tone of amplitude A has power A²/2 = 8 (common practice; docs/references.md §4).
    expect(groups['eyes-closed']!.epochs).toBe(2);
    expect(groups['eyes-closed']!.channels[0]!.bands[0]!.absolute).toBeCloseTo(8, 9);
    expect(groups['eyes-open']!.channels[0]!.bands[0]!.absolute).toBe(0);
    expect(record.result.channels[0]!.bands[0]!.absolute).toBeCloseTo(4, 9);
  });

  it('should remove the baseline mean and reject epochs over the amplitude limit with the channel and value', () => {
    const shifted = continuous(20, ['A', 'B'], (c, t) => 50 + (c === 1 && t > 10 && t < 10.1 ? 400 : Math.sin(2 * Math.PI * 5 * t)));
    const record = run(shifted, {
      method: 'periodogram',
      epoching: { mode: 'fixed', epochSeconds: 4 },
      badSpans: { peakToPeak: 100 },
    });
    expect(record.result.epoching!.kept.map((k) => k.startSeconds)).toEqual([0, 4, 12, 16]);
    expect(record.result.epoching!.dropped).toEqual([expect.objectContaining({ startSeconds: 8, reason: 'amplitude', channel: 'B' })]);
  });
});

describe('when the recipe re-references', () => {
  it('should make two channels mirror images under the common average, with equal spectra', () => {
    const two = continuous(10, ['C3', 'C4'], (c, t) => (c === 0 ? Math.sin(2 * Math.PI * 7 * t) : 0.5 * Math.sin(2 * Math.PI * 11 * t)));
    const record = run(two, { method: 'welch', reference: 'average' });
    // x − (x + y)/2 = −(y − (x + y)/2) up to round-off: equal spectra to 1e-12 of the peak.
    const [a, b] = [record.result.channels[0]!.psd, record.result.channels[1]!.psd];
    const peak = Math.max(...a);
    a.forEach((v, k) => expect(Math.abs(v - b[k]!)).toBeLessThan(1e-12 * peak));
  });

  it('should subtract a named reference channel and leave it out of the output', () => {
    const withRef = continuous(10, ['Fz', 'M1'], (c, t) => (c === 0 ? Math.sin(2 * Math.PI * 7 * t) + 2 : 2));
    const referenced = run(withRef, { method: 'welch', detrend: 'none', reference: { channel: 'M1' } });
    const plain = run({ ...withRef, channels: ['Fz'], data: withRef.data.map((v, i) => (i < 2000 ? v - 2 : v)).subarray(0, 2000) }, { method: 'welch', detrend: 'none' });
    expect(referenced.result.channels.map((c) => c.name)).toEqual(['Fz']);
    expect(referenced.resultHash).toBe(plain.resultHash);
  });
});
