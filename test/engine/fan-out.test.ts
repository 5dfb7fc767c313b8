import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { analyze } from '../../src/engine/analyze.js';
import { SPREAD_MIN_WORK_PER_CHANNEL, spreadsChannels } from '../../src/engine/spectra.js';
import type { FeatureRecord } from '../../src/engine/record.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { type ResolvedRecipe, resolveRecipe } from '../../src/recipes/resolve.js';
import type { SpectrumRecipe } from '../../src/recipes/schema.js';
import type { Signal } from '../../src/signals/signal.js';
import { createThreadBudget, takeJobSlot } from '../../src/threads/budget.js';
import { createChannelRunner } from '../../src/threads/channel-runner.js';

// Invented study: 5 channels × 12 trials of white noise at 250 Hz, with a 10 Hz tone in channel 2,
// so the channels differ and a channel written to the wrong slot would show.
const FS = 250;
const CHANNELS = ['Fz', 'Cz', 'Pz', 'O1', 'O2'];
const TRIALS = 12;
const SAMPLES = 250;

function study(): Signal {
  const random = createRandom(42);
  const data = new Float64Array(TRIALS * CHANNELS.length * SAMPLES);
  for (let e = 0; e < TRIALS; e++) {
    for (let c = 0; c < CHANNELS.length; c++) {
      for (let i = 0; i < SAMPLES; i++) {
        const tone = c === 2 ? 3 * Math.cos((2 * Math.PI * 10 * i) / FS + e) : 0;
        data[(e * CHANNELS.length + c) * SAMPLES + i] = random.normal() + tone;
      }
    }
  }
  return { samplingRate: FS, channels: CHANNELS, unit: 'uV', epochCount: TRIALS, samplesPerEpoch: SAMPLES, data };
}

/**
 * Invented recording: 4 channels × `seconds` of white noise at 250 Hz in `epochs` epochs, with a
 * 10 Hz tone in channel 1. At 60 s a Welch or periodogram channel holds more work than
 * SPREAD_MIN_WORK_PER_CHANNEL and goes to a helper.
 */
function longRecording(epochs = 1, seconds = 60): Signal {
  const random = createRandom(7);
  const channels = ['F3', 'F4', 'P3', 'P4'];
  const samples = (seconds * FS) / epochs;
  const data = new Float64Array(epochs * channels.length * samples);
  for (let e = 0; e < epochs; e++) {
    for (let c = 0; c < channels.length; c++) {
      for (let i = 0; i < samples; i++) {
        const tone = c === 1 ? 2 * Math.cos((2 * Math.PI * 10 * (e * samples + i)) / FS) : 0;
        data[(e * channels.length + c) * samples + i] = random.normal() + tone;
      }
    }
  }
  return { samplingRate: FS, channels, unit: 'uV', epochCount: epochs, samplesPerEpoch: samples, data };
}

/** A spectrum recipe resolved on `signal`. */
function resolve(recipe: unknown, signal: Signal) {
  const pinned = normalizeRecipe(recipe);
  return { id: pinned.id, resolved: resolveRecipe(pinned.recipe, pinned.hash, signal) as ResolvedRecipe<SpectrumRecipe> };
}

function run(recipe: unknown, threads: number, extra: { checkpoint?: () => void; onProgress?: (f: number) => void } = {}, signal: Signal = study()) {
  const pinned = normalizeRecipe(recipe);
  return analyze(signal, resolveRecipe(pinned.recipe, pinned.hash, signal), {
    signalId: 'sig_test',
    sha256: 'x',
    recipeId: pinned.id,
    mode: 'local',
    channels: createChannelRunner({ threads }),
    ...extra,
  }) as FeatureRecord;
}

const morlet = {
  method: 'morlet',
  frequencies: { low: 4, high: 30, count: 6 },
  cycles: 5,
  phaseConsistency: true,
  perEpoch: true,
  baseline: { start: 0, end: 0.2, mode: 'zscore' },
  summary: [{ name: 'alpha', low: 8, high: 13, start: 0.3, end: 0.7 }],
};
const spectrogram = { method: 'spectrogram', segmentSeconds: 0.25, stepSeconds: 0.125, frequencyRange: [0, 40] };

const welch = { method: 'welch', segmentSeconds: 0.5, perEpoch: true, features: { peakFrequency: {} } };
const multitaper = { method: 'multitaper', timeBandwidth: 3 };
const periodogram = { method: 'periodogram', window: 'hann' };
const longWelch = { method: 'welch', segmentSeconds: 2, features: { peakFrequency: {} } };
const epochedPeriodogram = { method: 'periodogram', window: 'hann', perEpoch: true };

/**
 * Threads that computed a job on a budget of 2. A helper starts on first use and may miss a short
 * job while it loads; once it runs it takes its share. Bounded retries keep a slow machine from
 * failing this, not a broken helper.
 */
async function threadsOnceWarm(recipe: unknown, signal: Signal = study()): Promise<number> {
  let threads = 0;
  for (let attempt = 0; attempt < 40 && threads < 2; attempt++) {
    threads = run(recipe, 2, {}, signal).provenance.threads ?? 0;
    if (threads < 2) await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return threads;
}

function attachmentBytes(record: FeatureRecord): string[] {
  return (record.attachments ?? []).map((a) => `${a.name}:${a.sha256}:${Buffer.from(a.data!.buffer, a.data!.byteOffset, a.data!.byteLength).toString('base64')}`);
}

describe('when a time–frequency job spreads its channels over helper threads', () => {
  // The record is defined by the recipe and the samples alone (DESIGN.md: same recipe, same numbers,
  // bit for bit); the thread count is an execution detail and must not show in it.
  it.each([
    ['morlet with phase consistency, per-trial power and a z-score baseline', morlet],
    ['a spectrogram', spectrogram],
  ])('should give %s the same result hash and attachment bytes on 1, 2 and 4 threads', (_name, recipe) => {
    const one = run(recipe, 1);
    for (const threads of [2, 4]) {
      const many = run(recipe, threads);
      expect(many.resultHash).toBe(one.resultHash);
      expect(many.result).toEqual(one.result);
      expect(attachmentBytes(many)).toEqual(attachmentBytes(one));
    }
  });

  it('should write every NaN of a matrix as the one pattern 0x7FF8000000000000, whichever code made it', () => {
    // Edge cells of a z-scored matrix are NaN. IEEE 754 leaves a NaN's sign and payload to the
    // implementation, and V8's interpreter and optimized code differ in the sign they leave.
    const record = run(morlet, 1);
    let nans = 0;
    for (const a of record.attachments ?? []) {
      if (a.dtype !== 'float64-le') continue;
      const values = a.data as Float64Array;
      const view = new DataView(values.buffer, values.byteOffset, values.byteLength);
      for (let i = 0; i < values.length; i++) {
        if (!Number.isNaN(values[i])) continue;
        nans++;
        expect(view.getBigUint64(8 * i, true)).toBe(0x7ff8000000000000n);
      }
    }
    expect(nans).toBeGreaterThan(0);
  });

  it('should take channels on a helper thread once one is running, and say how many threads computed', async () => {
    expect(run(morlet, 1).provenance.threads).toBe(1);
    expect(await threadsOnceWarm(morlet)).toBe(2);
  });

  it('should report progress that never goes back and ends at 1', () => {
    const seen: number[] = [];
    run(morlet, 3, { onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(0);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThanOrEqual(seen[i - 1]!);
    expect(seen.at(-1)).toBe(1);
  });

  it('should stop when the checkpoint throws, and compute the next job in full', () => {
    let calls = 0;
    const cancel = () => {
      if (++calls === 5) throw new Error('canceled by test');
    };
    expect(() => run(morlet, 2, { checkpoint: cancel })).toThrow('canceled by test');
    expect(run(morlet, 2).resultHash).toBe(run(morlet, 1).resultHash);
  });
});

describe('when a spectrum job spreads its channels over helper threads', () => {
  // Issue 15 "every core for one job": Welch, multitaper and periodogram records are defined by the
  // recipe and the samples alone (DESIGN.md), so the thread count must not show in them.
  it.each([
    ['Welch with per-epoch spectra and a feature', welch],
    ['multitaper', multitaper],
    ['periodogram', periodogram],
  ])('should give %s the same result hash on 1, 2 and 4 threads', (_name, recipe) => {
    const one = run(recipe, 1);
    expect(one.provenance.threads).toBe(1);
    for (const threads of [2, 4]) {
      const many = run(recipe, threads);
      expect(many.resultHash).toBe(one.resultHash);
      expect(many.result).toEqual(one.result);
    }
  });

  it.each([
    ['a 60-s Welch job', longWelch, 1],
    ['a periodogram of 60 epochs with per-epoch spectra', epochedPeriodogram, 60],
  ])('should give %s whose channels go to helpers the same result hash on 1, 2 and 4 threads', async (_name, recipe, epochs) => {
    const signal = longRecording(epochs);
    // The premise: each channel holds enough work to be spread (engine/spectra.ts).
    expect(spreadsChannels(resolve(recipe, signal).resolved, signal.channels.length)).toBe(true);
    expect(await threadsOnceWarm(recipe, signal)).toBe(2);
    const one = run(recipe, 1, {}, signal);
    expect(one.provenance.threads).toBe(1);
    for (const threads of [2, 4]) {
      const many = run(recipe, threads, {}, signal);
      expect(many.resultHash).toBe(one.resultHash);
      expect(many.result).toEqual(one.result);
    }
  });

  it('should take multitaper channels on a helper thread once one is running', async () => {
    expect(await threadsOnceWarm(multitaper)).toBe(2);
  });

  it('should keep channels with little work on the job thread, where posting them would cost more than a helper saves', () => {
    // SPREAD_MIN_WORK_PER_CHANNEL, measured with analyze() on 1 and 2 threads (engine/spectra.ts).
    const signal = study();
    for (const recipe of [welch, periodogram]) {
      expect(spreadsChannels(resolve(recipe, signal).resolved, signal.channels.length)).toBe(false);
      expect(run(recipe, 2).provenance.threads ?? 1).toBe(1);
    }
  });

  it('should decide from the work per channel, not the method alone', () => {
    // The same Welch recipe on one short and one long recording: only the long one spreads.
    const recipe = { method: 'welch', segmentSeconds: 2 };
    const short = longRecording(1, 4); // 4 s: three segments
    const long = longRecording(1);
    const perChannel = (signal: Signal) => resolve(recipe, signal).resolved.cost.work / signal.channels.length;
    expect(perChannel(short)).toBeLessThan(SPREAD_MIN_WORK_PER_CHANNEL);
    expect(perChannel(long)).toBeGreaterThanOrEqual(SPREAD_MIN_WORK_PER_CHANNEL);
    expect(spreadsChannels(resolve(recipe, short).resolved, short.channels.length)).toBe(false);
    expect(spreadsChannels(resolve(recipe, long).resolved, long.channels.length)).toBe(true);
    expect(run(recipe, 2, {}, short).provenance.threads ?? 1).toBe(1);
  });

  it('should use no helper when the thread budget has no free slot', () => {
    const budget = createThreadBudget(2);
    const release = takeJobSlot(budget);
    const other = takeJobSlot(budget);
    try {
      const signal = study();
      const pinned = normalizeRecipe(multitaper);
      const record = analyze(signal, resolveRecipe(pinned.recipe, pinned.hash, signal), {
        signalId: 'sig_test',
        sha256: 'x',
        recipeId: pinned.id,
        mode: 'local',
        channels: createChannelRunner({ threads: 2, budget }),
      });
      expect(record.provenance.threads).toBe(1);
      expect(budget.free[0]).toBe(0);
    } finally {
      other();
      release();
    }
    expect(budget.free[0]).toBe(2);
  });
});
