import { describe, expect, it } from 'vitest';
import { epochsOfChannel, fixedLengthEpochs, planEventLockedEpochs, planFixedLengthEpochs, type ChannelRows } from '../../src/signals/epoching.js';

// Hand-derived cases for epoching read a channel at a time. Data: 3 channels at 10 Hz, 40 samples
// (4 s). Channel 0 is the ramp x[k] = k; channel 1 is 0 except +30 at sample 5 and +50 at sample
// 25; channel 2 is 0 except −30 at sample 6 and +50 at sample 27. Peak-to-peak rejection dropping an
// epoch when any channel's max − min exceeds a threshold is common practice in EEG analysis.
const N = 40;
function rowsOf(): Float64Array[] {
  const rows = [new Float64Array(N), new Float64Array(N), new Float64Array(N)];
  for (let k = 0; k < N; k++) rows[0]![k] = k;
  rows[1]![5] = 30;
  rows[1]![25] = 50;
  rows[2]![6] = -30;
  rows[2]![27] = 50;
  return rows;
}

/** The rows as ChannelRows that counts its reads and hands out each row in one reused buffer. */
function counted(rows: Float64Array[]): ChannelRows & { reads: number[] } {
  const buffer = new Float64Array(N);
  const reads = rows.map(() => 0);
  return {
    channelCount: rows.length,
    sampleCount: N,
    samplingRate: 10,
    reads,
    row(c) {
      reads[c]!++;
      buffer.set(rows[c]!);
      return buffer;
    },
  };
}

describe('when epochs are screened and cut a channel at a time', () => {
  it('should read each checked channel once to screen, whatever the number of epochs', () => {
    const source = counted(rowsOf());
    planFixedLengthEpochs(source, { lengthSeconds: 1, peakToPeakThreshold: 1000 });
    expect(source.reads).toEqual([1, 1, 1]);
    const unscreened = counted(rowsOf());
    planFixedLengthEpochs(unscreened, { lengthSeconds: 1 });
    expect(unscreened.reads).toEqual([0, 0, 0]);
  });

  it('should name the channel with the largest amplitude over the threshold, and the first of equals', () => {
    // Epoch 0 (samples 0–9): ch0 p2p 9, ch1 30, ch2 30 → over 20: ch1 and ch2 tie, ch1 is named.
    // Epoch 2 (20–29): ch0 9, ch1 50, ch2 50 → tie again, ch1. Epochs 1 and 3: ch0 9 only, kept.
    const plan = planFixedLengthEpochs(counted(rowsOf()), { lengthSeconds: 1, peakToPeakThreshold: 20 });
    expect(plan.kept.map((d) => d.startSample)).toEqual([10, 30]);
    expect(plan.dropped.map((d) => [d.startSample, d.reason, d.channel, d.value])).toEqual([
      [0, 'amplitude', 1, 30],
      [20, 'amplitude', 1, 50],
    ]);
    // Only channels 2 and 0 checked, in that order: epoch 0 names ch2 (30), epoch 2 ch2 (50).
    const some = planFixedLengthEpochs(counted(rowsOf()), { lengthSeconds: 1, peakToPeakThreshold: 20, rejectionChannels: [2, 0] });
    expect(some.dropped.map((d) => [d.startSample, d.channel])).toEqual([
      [0, 2],
      [20, 2],
    ]);
  });

  it('should list drops in event order when bounds, bad spans and amplitude drop different events', () => {
    // Events at 0.1 s (starts at −0.1 s: out of bounds), 0.6 s (amplitude: ch1's +30 at 0.5 s),
    // 1.5 s (bad span [1.4, 1.45]), 3.0 s (kept); windows [e − 0.2 s, e + 0.5 s).
    const events = [0.1, 0.6, 1.5, 3.0].map((onset) => ({ onset, label: 'x' }));
    const plan = planEventLockedEpochs(counted(rowsOf()), events, { beforeSeconds: 0.2, afterSeconds: 0.5, peakToPeakThreshold: 20, badSpans: [[1.4, 1.45]] });
    expect(plan.dropped.map((d) => [d.source, d.reason])).toEqual([
      [0, 'out-of-bounds'],
      [1, 'amplitude'],
      [2, 'bad-span'],
    ]);
    expect(plan.kept.map((d) => d.source)).toEqual([3]);
  });

  it("should cut each channel's epochs with the baseline removed, as the whole-array form does", () => {
    const rows = rowsOf();
    const options = { lengthSeconds: 1, stepSeconds: 0.5, baseline: { startSeconds: 0, endSeconds: 0.2 } };
    const plan = planFixedLengthEpochs(counted(rows), options);
    // Channel 0, epoch starting at sample 5: 5…14 minus the mean of 5 and 6 (5.5).
    const ch0 = epochsOfChannel(plan, rows[0]!);
    expect(Array.from(ch0.subarray(10, 20))).toEqual(Array.from({ length: 10 }, (_, i) => i - 0.5));
    const whole = new Float64Array(3 * N);
    rows.forEach((r, c) => whole.set(r, c * N));
    const all = fixedLengthEpochs({ data: whole, channelCount: 3, samplingRate: 10 }, options);
    for (let c = 0; c < 3; c++) {
      const mine = epochsOfChannel(plan, rows[c]!);
      for (let e = 0; e < all.epochCount; e++) {
        const at = (e * 3 + c) * all.samplesPerEpoch;
        expect(Array.from(mine.subarray(e * 10, (e + 1) * 10))).toEqual(Array.from(all.data.subarray(at, at + 10)));
      }
    }
  });

  it('should refuse rows of a bad shape by name', () => {
    expect(() => planFixedLengthEpochs({ ...counted(rowsOf()), channelCount: 0 }, { lengthSeconds: 1 })).toThrow(/channelCount/);
    expect(() => planFixedLengthEpochs({ ...counted(rowsOf()), samplingRate: 0 }, { lengthSeconds: 1 })).toThrow(/samplingRate/);
    expect(() => planFixedLengthEpochs({ ...counted(rowsOf()), sampleCount: 2.5 }, { lengthSeconds: 1 })).toThrow(/sampleCount/);
  });
});
