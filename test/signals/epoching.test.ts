import { describe, expect, it } from 'vitest';
import { blockEpochs, eventLockedEpochs, fixedLengthEpochs, type ContinuousData } from '../../src/signals/epoching.js';

// Hand-derived cases. Data: 2 channels at 10 Hz, 50 samples (5 s). Channel 0 is the ramp x[k] = k;
// channel 1 is 0 except a 500-unit spike at sample 31. Every expected value below follows from
// these definitions by hand.
function input(): ContinuousData {
  const n = 50;
  const data = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) data[k] = k;
  data[n + 31] = 500;
  return { data, channelCount: 2, samplingRate: 10 };
}

function epoch(result: ReturnType<typeof fixedLengthEpochs>, e: number, c: number): number[] {
  const spe = result.samplesPerEpoch;
  const at = (e * result.channelCount + c) * spe;
  return Array.from(result.data.subarray(at, at + spe));
}

const ramp = (from: number, length: number): number[] => Array.from({ length }, (_, i) => from + i);

describe('when cutting fixed-length epochs', () => {
  it('should cut 1-s epochs at samples 0, 10, …, 40 with no overlap by default', () => {
    const r = fixedLengthEpochs(input(), { lengthSeconds: 1 });
    expect(r.epochCount).toBe(5);
    expect(r.samplesPerEpoch).toBe(10);
    expect(r.kept.map((d) => d.startSample)).toEqual([0, 10, 20, 30, 40]);
    expect(r.dropped).toEqual([]);
    expect(r.data.length).toBe(5 * 2 * 10);
    expect(epoch(r, 1, 0)).toEqual(ramp(10, 10));
    // Layout [epoch][channel][sample]: epoch 3, channel 1 holds the spike at offset 31 − 30 = 1.
    expect(epoch(r, 3, 1)).toEqual([0, 500, 0, 0, 0, 0, 0, 0, 0, 0]);
  });

  it('should step 0.8 s (8 samples) and drop the epoch at sample 48 that runs past sample 49', () => {
    const r = fixedLengthEpochs(input(), { lengthSeconds: 1, stepSeconds: 0.8, label: 'rest' });
    expect(r.kept.map((d) => d.startSample)).toEqual([0, 8, 16, 24, 32, 40]);
    expect(r.kept[1]).toEqual({ source: 1, label: 'rest', startSample: 8, lockSample: 8, startSeconds: 0.8 });
    expect(r.dropped).toEqual([{ source: 6, label: 'rest', startSample: 48, lockSample: 48, startSeconds: 4.8, reason: 'out-of-bounds' }]);
    expect(epoch(r, 1, 0)).toEqual(ramp(8, 10));
  });

  it('should subtract the baseline mean: samples 0–1 of the ramp average 0.5', () => {
    const r = fixedLengthEpochs(input(), { lengthSeconds: 1, baseline: { startSeconds: 0, endSeconds: 0.2 } });
    expect(epoch(r, 0, 0)).toEqual(ramp(-0.5, 10));
    // Epoch 2 starts at 20: baseline mean (20 + 21)/2 = 20.5.
    expect(epoch(r, 2, 0)).toEqual(ramp(-0.5, 10));
  });

  it('should drop the epoch holding the spike by peak-to-peak amplitude, naming channel 1 and 500', () => {
    const r = fixedLengthEpochs(input(), { lengthSeconds: 1, peakToPeakThreshold: 100 });
    expect(r.kept.map((d) => d.startSample)).toEqual([0, 10, 20, 40]);
    expect(r.dropped).toEqual([{ source: 3, label: '', startSample: 30, lockSample: 30, startSeconds: 3, reason: 'amplitude', channel: 1, value: 500 }]);
    expect(epoch(r, 3, 0)).toEqual(ramp(40, 10));
  });

  it('should keep an epoch whose peak-to-peak equals the threshold (the rule is strictly greater)', () => {
    // Channel 0 of each 1-s epoch spans 9 units (k … k + 9).
    const r = fixedLengthEpochs(input(), { lengthSeconds: 1, peakToPeakThreshold: 9, rejectionChannels: [0] });
    expect(r.epochCount).toBe(5);
    expect(fixedLengthEpochs(input(), { lengthSeconds: 1, peakToPeakThreshold: 8.99, rejectionChannels: [0] }).epochCount).toBe(0);
  });
});

describe('when cutting event-locked epochs', () => {
  // before 0.2 s = 2 samples, after 0.5 s = 5 samples: 7 samples per epoch.
  const events = [
    { onset: 1.0, label: 'tone' }, // lock 10 → samples 8..14
    { onset: 0.1, label: 'tone' }, // lock 1 → starts at −1: out of bounds
    { onset: 4.75, label: 'probe' }, // lock round(47.5) = 48 → ends at 54 > 49: out of bounds
    { onset: 3.0, label: 'probe' }, // lock 30 → samples 28..34, holds the spike at 31
  ];

  it('should cut [event − 2, event + 5) samples and drop epochs off either end', () => {
    const r = eventLockedEpochs(input(), events, { beforeSeconds: 0.2, afterSeconds: 0.5 });
    expect(r.samplesPerEpoch).toBe(7);
    expect(r.kept).toEqual([
      { source: 0, label: 'tone', startSample: 8, lockSample: 10, startSeconds: 0.8 },
      { source: 3, label: 'probe', startSample: 28, lockSample: 30, startSeconds: 2.8 },
    ]);
    expect(r.dropped.map((d) => [d.source, d.reason, d.startSample])).toEqual([
      [1, 'out-of-bounds', -1],
      [2, 'out-of-bounds', 46],
    ]);
    expect(epoch(r, 0, 0)).toEqual(ramp(8, 7));
    expect(epoch(r, 1, 1)).toEqual([0, 0, 0, 500, 0, 0, 0]);
  });

  it('should subtract the pre-event baseline [−0.2, 0) s: mean of samples 8 and 9 is 8.5', () => {
    const r = eventLockedEpochs(input(), events, { beforeSeconds: 0.2, afterSeconds: 0.5, baseline: { startSeconds: -0.2, endSeconds: 0 } });
    expect(epoch(r, 0, 0)).toEqual(ramp(-0.5, 7));
    // Channel 1 around event 3: baseline samples 28, 29 are 0, so nothing changes.
    expect(epoch(r, 1, 1)).toEqual([0, 0, 0, 500, 0, 0, 0]);
  });

  it('should reject by amplitude only on the channels asked for', () => {
    const all = eventLockedEpochs(input(), events, { beforeSeconds: 0.2, afterSeconds: 0.5, peakToPeakThreshold: 100 });
    expect(all.dropped.filter((d) => d.reason === 'amplitude')).toEqual([
      { source: 3, label: 'probe', startSample: 28, lockSample: 30, startSeconds: 2.8, reason: 'amplitude', channel: 1, value: 500 },
    ]);
    const ch0 = eventLockedEpochs(input(), events, { beforeSeconds: 0.2, afterSeconds: 0.5, peakToPeakThreshold: 100, rejectionChannels: [0] });
    expect(ch0.epochCount).toBe(2);
  });

  it('should drop epochs that hold a sample inside a bad span, and keep those that do not', () => {
    // [1.35, 1.4] s holds sample 14 (t = 1.4 s), the last of the first epoch.
    const hit = eventLockedEpochs(input(), events, { beforeSeconds: 0.2, afterSeconds: 0.5, badSpans: [[1.35, 1.4]] });
    expect(hit.dropped.find((d) => d.source === 0)).toMatchObject({ reason: 'bad-span', span: [1.35, 1.4] });
    // [1.45, 1.6] s holds samples 15 and 16 only: outside 8..14.
    const miss = eventLockedEpochs(input(), events, { beforeSeconds: 0.2, afterSeconds: 0.5, badSpans: [[1.45, 1.6]] });
    expect(miss.kept.map((d) => d.source)).toEqual([0, 3]);
  });

  it('should report out-of-bounds before bad-span and bad-span before amplitude', () => {
    const r = eventLockedEpochs(input(), events, { beforeSeconds: 0.2, afterSeconds: 0.5, peakToPeakThreshold: 100, badSpans: [[0, 5]] });
    expect(r.dropped.map((d) => d.reason)).toEqual(['bad-span', 'out-of-bounds', 'out-of-bounds', 'bad-span']);
    expect(r.epochCount).toBe(0);
    expect(r.data.length).toBe(0);
  });

  it('should allow a window that starts after the event (negative before)', () => {
    const r = eventLockedEpochs(input(), [{ onset: 1, label: 'x' }], { beforeSeconds: -0.1, afterSeconds: 0.3 });
    expect(r.kept[0]!.startSample).toBe(11);
    expect(epoch(r, 0, 0)).toEqual([11, 12]);
  });
});

describe('when cutting fixed-length epochs inside labelled blocks', () => {
  // Block [0.5, 2.7) s = samples [5, 27): 1-s epochs every 0.5 s start at 5, 10, 15; one at 20 would end at 30 > 27.
  // Block [3.0, 4.9) s = samples [30, 49): epochs at 30 and 35; one at 40 would end at 50 > 49.
  const blocks = [
    { onset: 0.5, duration: 2.2, label: 'eyes-open' },
    { onset: 3.0, duration: 1.9, label: 'eyes-closed' },
  ];

  it('should tile each block from its onset, never past its end, each epoch with its block label', () => {
    const r = blockEpochs(input(), blocks, { lengthSeconds: 1, stepSeconds: 0.5 });
    expect(r.kept.map((d) => [d.startSample, d.label, d.source])).toEqual([
      [5, 'eyes-open', 0],
      [10, 'eyes-open', 0],
      [15, 'eyes-open', 0],
      [30, 'eyes-closed', 1],
      [35, 'eyes-closed', 1],
    ]);
    expect(r.kept.map((d) => d.startSeconds)).toEqual([0.5, 1, 1.5, 3, 3.5]);
    expect(r.dropped).toEqual([]);
    expect(epoch(r, 3, 0)).toEqual(ramp(30, 10));
  });

  it('should not overlap epochs by default (step = length)', () => {
    const r = blockEpochs(input(), blocks, { lengthSeconds: 1 });
    expect(r.kept.map((d) => d.startSample)).toEqual([5, 15, 30]);
  });

  it('should drop by amplitude inside a block: the spike at sample 31 falls in the epoch at 30, not in the one at 35', () => {
    const r = blockEpochs(input(), blocks, { lengthSeconds: 1, stepSeconds: 0.5, peakToPeakThreshold: 100 });
    expect(r.kept.map((d) => d.startSample)).toEqual([5, 10, 15, 35]);
    expect(r.dropped).toMatchObject([{ startSample: 30, label: 'eyes-closed', reason: 'amplitude', channel: 1, value: 500 }]);
  });

  it('should drop epochs of a block that runs past the data as out of bounds', () => {
    // Block [4, 6) s = samples [40, 60) of 50: epochs at 40, 45 and 50 tile the block; only the one at 40 fits the data.
    const r = blockEpochs(input(), [{ onset: 4, duration: 2, label: 'late' }], { lengthSeconds: 1, stepSeconds: 0.5 });
    expect(r.kept.map((d) => d.startSample)).toEqual([40]);
    expect(r.dropped).toMatchObject([
      { startSample: 45, label: 'late', reason: 'out-of-bounds' },
      { startSample: 50, label: 'late', reason: 'out-of-bounds' },
    ]);
  });

  it('should cut nothing in a block shorter than one epoch', () => {
    const r = blockEpochs(input(), [{ onset: 1, duration: 0.9, label: 'short' }], { lengthSeconds: 1 });
    expect([r.epochCount, r.dropped.length]).toEqual([0, 0]);
  });
});

describe('when the epoching input is wrong', () => {
  it.each([
    ['a zero length', () => fixedLengthEpochs(input(), { lengthSeconds: 0 }), /lengthSeconds/],
    ['a zero step', () => fixedLengthEpochs(input(), { lengthSeconds: 1, stepSeconds: 0 }), /stepSeconds/],
    ['a baseline outside the epoch', () => fixedLengthEpochs(input(), { lengthSeconds: 1, baseline: { startSeconds: -0.1, endSeconds: 0.1 } }), /inside the epoch/],
    ['an empty baseline', () => fixedLengthEpochs(input(), { lengthSeconds: 1, baseline: { startSeconds: 0.2, endSeconds: 0.2 } }), /at least one sample/],
    ['a reversed bad span', () => fixedLengthEpochs(input(), { lengthSeconds: 1, badSpans: [[2, 1]] }), /badSpans\[0\]/],
    ['a rejection channel out of range', () => fixedLengthEpochs(input(), { lengthSeconds: 1, peakToPeakThreshold: 1, rejectionChannels: [2] }), /rejectionChannels\[0\]/],
    ['a non-positive threshold', () => fixedLengthEpochs(input(), { lengthSeconds: 1, peakToPeakThreshold: 0 }), /peakToPeakThreshold/],
    ['a data length that is not channels × samples', () => fixedLengthEpochs({ ...input(), data: new Float64Array(5) }, { lengthSeconds: 1 }), /multiple of channelCount/],
    ['a zero sampling rate', () => fixedLengthEpochs({ ...input(), samplingRate: 0 }, { lengthSeconds: 1 }), /samplingRate/],
    ['a NaN onset', () => eventLockedEpochs(input(), [{ onset: Number.NaN, label: 'x' }], { beforeSeconds: 0, afterSeconds: 1 }), /events\[0\]\.onset/],
    ['an empty window', () => eventLockedEpochs(input(), [], { beforeSeconds: 0.2, afterSeconds: -0.2 }), /at least one sample/],
    ['a block with a negative duration', () => blockEpochs(input(), [{ onset: 1, duration: -1, label: 'x' }], { lengthSeconds: 1 }), /blocks\[0\]\.duration/],
    ['a block with a NaN onset', () => blockEpochs(input(), [{ onset: Number.NaN, duration: 1, label: 'x' }], { lengthSeconds: 1 }), /blocks\[0\]\.onset/],
    ['a zero block epoch length', () => blockEpochs(input(), [], { lengthSeconds: 0 }), /lengthSeconds/],
  ])('should refuse %s, naming the parameter', (_, run, message) => {
    expect(run).toThrow(message);
  });
});
