import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { analyze } from '../../src/engine/analyze.js';
import type { FeatureRecord } from '../../src/engine/record.js';
import { normalizeRecipe } from '../../src/recipes/normalize.js';
import { resolveRecipe } from '../../src/recipes/resolve.js';
import { checkRead, materialize, type SampleSource } from '../../src/signals/sample-source.js';
import type { Signal } from '../../src/signals/signal.js';
import type { SignalView } from '../../src/signals/view.js';
import { createChannelRunner } from '../../src/threads/channel-runner.js';

// An invented continuous recording made row by row on demand (nothing holds it whole): 6 channels
// × 60 s at 128 Hz of seeded noise, channel c also carrying a (6 + c) Hz tone, so a channel read in
// the wrong place would show. NaNs can be put at chosen (channel, sample) places.
const FS = 128;
const CHANNELS = ['F3', 'F4', 'C3', 'C4', 'O1', 'O2'];
const SAMPLES = 60 * FS;

interface CountingSource extends SampleSource {
  /** samples read per channel */
  readSamples: number[];
}

function recording(gaps: [number, number][] = []): CountingSource {
  const shape = { samplingRate: FS, channels: CHANNELS, unit: 'uV', epochCount: 1, samplesPerEpoch: SAMPLES };
  const readSamples = CHANNELS.map(() => 0);
  return {
    ...shape,
    readSamples,
    readRow(epoch, channel, from, to, into) {
      checkRead(shape, epoch, channel, from, to, into);
      readSamples[channel]! += to - from;
      // The generator restarts per row, so a row reads the same whatever was read before.
      const random = createRandom(100 + channel);
      for (let i = 0; i < to; i++) {
        const x = random.normal() + 2 * Math.sin((2 * Math.PI * (6 + channel) * i) / FS);
        if (i >= from) into[i - from] = x;
      }
      for (const [c, i] of gaps) if (c === channel && i >= from && i < to) into[i - from] = Number.NaN;
    },
    close() {},
  };
}

function run(source: SampleSource | Signal, recipe: unknown, options: { view?: SignalView; threads?: number } = {}): FeatureRecord {
  const { recipe: normalized, hash, id } = normalizeRecipe(recipe);
  const context = { signalId: 'sig_rows', sha256: 'x', recipeId: id, mode: 'local' as const, view: options.view ?? null };
  return analyze(source, resolveRecipe(normalized, hash, source), options.threads ? { ...context, channels: createChannelRunner({ threads: options.threads }) } : context);
}

const fixed = { method: 'welch', segmentSeconds: 1, epoching: { mode: 'fixed', epochSeconds: 4 } };

describe('when the engine reads a recording a row at a time', () => {
  // Bounded memory (issue 15): each channel's row is read a fixed, small number of times whatever
  // the length, never per epoch. Counts follow from the passes the design names.
  it('should read each channel once for fixed epochs under reject, and once more for each pass that needs all channels', () => {
    const plain = recording();
    run(plain, fixed);
    expect(plain.readSamples).toEqual(CHANNELS.map(() => SAMPLES));

    // The average reference's mean row reads every channel once more.
    const average = recording();
    run(average, { ...fixed, reference: 'average' });
    expect(average.readSamples).toEqual(CHANNELS.map(() => 2 * SAMPLES));

    // Peak-to-peak screening of the epochs reads every channel once more, after the mean row.
    const screened = recording();
    run(screened, { ...fixed, reference: 'average', badSpans: { peakToPeak: 1000 } });
    expect(screened.readSamples).toEqual(CHANNELS.map(() => 3 * SAMPLES));

    // A view reads only its window, and only its channels' rows (no reference).
    const viewed = recording();
    run(viewed, fixed, { view: { start: 10, end: 30, channels: ['O2', 'C3'] } });
    expect(viewed.readSamples).toEqual([0, 0, 20 * FS, 0, 0, 20 * FS]);
  });

  it('should give the record it gives for the same samples held in memory', () => {
    // The in-memory path is the one whose numbers test/methods check against scipy; reading rows on
    // demand must not change a bit of them.
    const cases: [unknown, SignalView | undefined, [number, number][]][] = [
      [{ ...fixed, reference: 'average', badSpans: { peakToPeak: 9 } }, undefined, []],
      [{ method: 'multitaper', timeBandwidth: 2, reference: { channel: 'C4' }, epoching: { mode: 'fixed', epochSeconds: 2 } }, { start: 5, end: 45, channels: ['O1', 'F3'] }, []],
      // The gap is spread to every channel by the average reference, then goes round as a bad span.
      [{ method: 'welch', segmentSeconds: 2, nonFinite: 'bad-span', reference: 'average' }, { badSpans: [[20, 21]] }, [[3, 700]]],
    ];
    for (const [recipe, view, gaps] of cases) {
      const streamed = run(recording(gaps), recipe, view ? { view } : {});
      const held = run(materialize(recording(gaps)), recipe, view ? { view } : {});
      expect(streamed.resultHash).toBe(held.resultHash);
    }
  });

  it('should name the first gap by epoch, then channel, on any number of threads', () => {
    // Gaps: O1 at 9.0 s (epoch 2 of 4-s epochs), C3 at 10.0 s (epoch 2), F4 at 13.0 s (epoch 3).
    // Epoch 2 is the first with a gap, and C3 (channel 2) comes before O1 there; 10 s is sample 256
    // of the epoch starting at 8 s.
    const gaps: [number, number][] = [
      [4, 9 * FS],
      [2, 10 * FS],
      [1, 13 * FS],
    ];
    for (const threads of [1, 2]) {
      for (const method of [
        { method: 'multitaper', timeBandwidth: 2 },
        { method: 'welch', segmentSeconds: 1 },
      ]) {
        expect(() => run(recording(gaps), { ...method, epoching: { mode: 'fixed', epochSeconds: 4 } }, { threads })).toThrow(/^epoch 2 holds a non-finite sample \(channel "C3", sample 256\)/);
      }
    }
  });

  it('should leave out only the epochs with gaps under skip-epoch, reading each row twice', () => {
    const source = recording([
      [4, 9 * FS],
      [1, 13 * FS],
    ]);
    const record = run(source, { ...fixed, nonFinite: 'skip-epoch' }) as FeatureRecord & { result: { estimate: { epochsSkipped: { index: number; detail: string }[] } } };
    expect(record.result.estimate.epochsSkipped.map((s) => [s.index, s.detail])).toEqual([
      [2, 'first non-finite sample at channel "O1", sample 128'],
      [3, 'first non-finite sample at channel "F4", sample 128'],
    ]);
    expect(source.readSamples).toEqual(CHANNELS.map(() => 2 * SAMPLES));
  });
});
