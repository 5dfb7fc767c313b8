/** Continuous multichannel data: `data` is [channel][sample] row-major. */
export interface ContinuousData {
  data: Float64Array;
  channelCount: number;
  /** Hz. */
  samplingRate: number;
}

/** Shared by both kinds of epoching. Seconds are converted to samples by rounding to the nearest. */
export interface EpochScreening {
  /**
   * Window whose per-channel mean is subtracted from each epoch, in seconds relative to the event
   * (event-locked) or to the epoch start (fixed-length), half-open [startSeconds, endSeconds); it must
   * lie inside the epoch.
   * @defaultValue no baseline removal
   */
  baseline?: { startSeconds: number; endSeconds: number };
  /**
   * Drop an epoch when the peak-to-peak amplitude (max − min) of any checked channel exceeds this,
   * in the data's unit.
   * @defaultValue no amplitude rejection
   */
  peakToPeakThreshold?: number;
  /** Channel indexes checked against `peakToPeakThreshold`. @defaultValue every channel */
  rejectionChannels?: readonly number[];
  /**
   * Closed spans [start, end] in seconds from the data start; an epoch holding any sample inside
   * one is dropped.
   * @defaultValue none
   */
  badSpans?: readonly (readonly [number, number])[];
}

export interface FixedLengthOptions extends EpochScreening {
  /** Epoch length in seconds. */
  lengthSeconds: number;
  /** Seconds between epoch starts. @defaultValue lengthSeconds (no overlap) */
  stepSeconds?: number;
  /** Label given to every epoch. @defaultValue '' */
  label?: string;
}

export interface EventLockedOptions extends EpochScreening {
  /** Seconds of data before the event; negative starts the epoch after the event. */
  beforeSeconds: number;
  /** Seconds of data after the event; the epoch is [event − before, event + after). */
  afterSeconds: number;
}

export interface EpochEvent {
  /** Seconds from the data start. */
  onset: number;
  label: string;
}

export interface EpochDescriptor {
  /** Index of the event (event-locked) or of the candidate epoch k (fixed-length). */
  source: number;
  label: string;
  /** First sample of the epoch in the continuous data (may be negative for a dropped epoch). */
  startSample: number;
  /** Sample the epoch is locked to: the event's sample, or startSample for fixed-length epochs. */
  lockSample: number;
  /** startSample / samplingRate. */
  startSeconds: number;
}

export type DropReason = 'out-of-bounds' | 'bad-span' | 'amplitude';

export interface DroppedEpoch extends EpochDescriptor {
  reason: DropReason;
  /** For 'amplitude': the channel with the largest peak-to-peak amplitude over the threshold. */
  channel?: number;
  /** For 'amplitude': that peak-to-peak amplitude, in the data's unit. */
  value?: number;
  /** For 'bad-span': the first bad span the epoch overlaps, in seconds. */
  span?: readonly [number, number];
}

export interface EpochingResult {
  /** [epoch][channel][sample] row-major, length epochCount·channelCount·samplesPerEpoch. */
  data: Float64Array;
  epochCount: number;
  channelCount: number;
  samplesPerEpoch: number;
  kept: EpochDescriptor[];
  dropped: DroppedEpoch[];
}

function requireFinite(value: number, name: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new TypeError(`${name} must be a finite number, got ${value}`);
}

function sampleCountOf(input: ContinuousData): number {
  const { data, channelCount, samplingRate } = input;
  if (!(data instanceof Float64Array)) throw new TypeError('data must be a Float64Array');
  if (!Number.isInteger(channelCount) || channelCount < 1) throw new RangeError(`channelCount must be an integer ≥ 1, got ${channelCount}`);
  requireFinite(samplingRate, 'samplingRate');
  if (samplingRate <= 0) throw new RangeError(`samplingRate must be > 0 Hz, got ${samplingRate}`);
  if (data.length % channelCount !== 0) {
    throw new RangeError(`data length ${data.length} is not a multiple of channelCount ${channelCount}`);
  }
  return data.length / channelCount;
}

function checkRows(input: ChannelRows): ChannelRows {
  const { channelCount, samplingRate, sampleCount } = input;
  if (!Number.isInteger(channelCount) || channelCount < 1) throw new RangeError(`channelCount must be an integer ≥ 1, got ${channelCount}`);
  requireFinite(samplingRate, 'samplingRate');
  if (samplingRate <= 0) throw new RangeError(`samplingRate must be > 0 Hz, got ${samplingRate}`);
  if (!Number.isInteger(sampleCount) || sampleCount < 0) throw new RangeError(`sampleCount must be an integer ≥ 0, got ${sampleCount}`);
  return input;
}

interface Window {
  /** Offsets relative to the lock sample. */
  first: number;
  length: number;
}

function baselineRange(screening: EpochScreening, fs: number, window: Window): [number, number] | null {
  const b = screening.baseline;
  if (b === undefined) return null;
  requireFinite(b.startSeconds, 'baseline.startSeconds');
  requireFinite(b.endSeconds, 'baseline.endSeconds');
  // Offsets within the epoch.
  const from = Math.round(b.startSeconds * fs) - window.first;
  const to = Math.round(b.endSeconds * fs) - window.first;
  if (to <= from) throw new RangeError(`baseline must cover at least one sample, got [${b.startSeconds}, ${b.endSeconds}) s`);
  if (from < 0 || to > window.length) {
    throw new RangeError(`baseline [${b.startSeconds}, ${b.endSeconds}) s must lie inside the epoch`);
  }
  return [from, to];
}

function checkScreening(screening: EpochScreening, channelCount: number): void {
  const t = screening.peakToPeakThreshold;
  if (t !== undefined) {
    requireFinite(t, 'peakToPeakThreshold');
    if (t <= 0) throw new RangeError(`peakToPeakThreshold must be > 0, got ${t}`);
  }
  screening.rejectionChannels?.forEach((c, i) => {
    if (!Number.isInteger(c) || c < 0 || c >= channelCount) {
      throw new RangeError(`rejectionChannels[${i}] must be a channel index in 0..${channelCount - 1}, got ${c}`);
    }
  });
  screening.badSpans?.forEach(([start, end], i) => {
    requireFinite(start, `badSpans[${i}][0]`);
    requireFinite(end, `badSpans[${i}][1]`);
    if (end < start) throw new RangeError(`badSpans[${i}] ends (${end} s) before it starts (${start} s)`);
  });
}

// Sample times that fall on a span edge up to rounding count as inside it.
const EDGE = 1e-9;

function overlappedSpan(spans: EpochScreening['badSpans'], fs: number, first: number, length: number): readonly [number, number] | null {
  for (const span of spans ?? []) {
    const spanFirst = Math.ceil(span[0] * fs - EDGE);
    const spanLast = Math.floor(span[1] * fs + EDGE);
    if (spanFirst <= first + length - 1 && spanLast >= first) return span;
  }
  return null;
}

/** Samples per epoch and the step in seconds of fixed-length tiling, checked. */
function tiling(options: { lengthSeconds: number; stepSeconds?: number }, fs: number): { spe: number; step: number } {
  requireFinite(options.lengthSeconds, 'lengthSeconds');
  const step = options.stepSeconds ?? options.lengthSeconds;
  requireFinite(step, 'stepSeconds');
  const spe = Math.round(options.lengthSeconds * fs);
  if (spe < 1) throw new RangeError(`lengthSeconds ${options.lengthSeconds} s is shorter than one sample at ${fs} Hz`);
  if (Math.round(step * fs) < 1) throw new RangeError(`stepSeconds ${step} s is shorter than one sample at ${fs} Hz`);
  return { spe, step };
}

interface Candidate {
  descriptor: EpochDescriptor;
}

/**
 * Continuous data read one channel at a time: `row(c)` gives channel c's samples (length
 * `sampleCount`; it may reuse one buffer, so each row is used before the next is asked for). Epoching reads each channel's row once to screen the epochs ({@link EpochPlan})
 * and once more per channel to cut them ({@link epochsOfChannel}), so a long recording never has
 * to be held whole.
 */
export interface ChannelRows {
  channelCount: number;
  sampleCount: number;
  /** Hz. */
  samplingRate: number;
  row(c: number): Float64Array;
}

/** Which epochs are kept and dropped, and how each channel's epochs are cut: plain data. */
export interface EpochPlan {
  channelCount: number;
  samplesPerEpoch: number;
  /** [from, to) offsets in the epoch of the baseline whose mean is subtracted, or null */
  baseline: [number, number] | null;
  kept: EpochDescriptor[];
  dropped: DroppedEpoch[];
}

function rowsOf(input: ContinuousData): ChannelRows {
  const sampleCount = sampleCountOf(input);
  return {
    channelCount: input.channelCount,
    sampleCount,
    samplingRate: input.samplingRate,
    row: (c) => input.data.subarray(c * sampleCount, (c + 1) * sampleCount),
  };
}

// The same copy and baseline arithmetic for the screening and for the output.
function extract(target: Float64Array, row: Float64Array, a: number, baseline: [number, number] | null): void {
  const spe = target.length;
  target.set(row.subarray(a, a + spe));
  if (baseline !== null) {
    let sum = 0;
    for (let k = baseline[0]; k < baseline[1]; k++) sum += target[k]!;
    const mean = sum / (baseline[1] - baseline[0]);
    for (let k = 0; k < spe; k++) target[k]! -= mean;
  }
}

/**
 * Decides which candidate epochs stay. Bounds and bad spans need no samples; the peak-to-peak
 * screening reads each checked channel's row once, in channel order, and keeps only the amplitude
 * of each (candidate, channel), so the same epochs are kept and the same channel is named as when
 * every channel was screened epoch by epoch.
 */
function planCut(input: ChannelRows, candidates: Candidate[], window: Window, screening: EpochScreening): EpochPlan {
  const { channelCount, sampleCount, samplingRate: fs } = input;
  const spe = window.length;
  const baseline = baselineRange(screening, fs, window);
  const threshold = screening.peakToPeakThreshold;
  const checked = screening.rejectionChannels ?? Array.from({ length: channelCount }, (_, c) => c);
  // Per candidate, why it is dropped (null: kept so far); bounds and bad spans need no samples.
  const verdicts = candidates.map(({ descriptor }): DroppedEpoch | null => {
    const a = descriptor.startSample;
    if (a < 0 || a + spe > sampleCount) return { ...descriptor, reason: 'out-of-bounds' };
    const span = overlappedSpan(screening.badSpans, fs, a, spe);
    return span === null ? null : { ...descriptor, reason: 'bad-span', span };
  });
  const open = verdicts.flatMap((v, i) => (v === null ? [i] : []));
  if (threshold !== undefined && open.length > 0) {
    // p2p[j·channelCount + c]: peak-to-peak of open candidate j in channel c.
    const p2p = new Float64Array(open.length * channelCount);
    const scratch = new Float64Array(spe);
    for (const c of [...new Set(checked)].sort((x, y) => x - y)) {
      const row = input.row(c);
      open.forEach((i, j) => {
        extract(scratch, row, candidates[i]!.descriptor.startSample, baseline);
        let low = Infinity;
        let high = -Infinity;
        for (let k = 0; k < spe; k++) {
          const x = scratch[k]!;
          if (x < low) low = x;
          if (x > high) high = x;
        }
        p2p[j * channelCount + c] = high - low;
      });
    }
    open.forEach((i, j) => {
      const at = j * channelCount;
      let worst = -1;
      for (const c of checked) if (p2p[at + c]! > threshold && (worst < 0 || p2p[at + c]! > p2p[at + worst]!)) worst = c;
      if (worst >= 0) verdicts[i] = { ...candidates[i]!.descriptor, reason: 'amplitude', channel: worst, value: p2p[at + worst]! };
    });
  }
  return {
    channelCount,
    samplesPerEpoch: spe,
    baseline,
    kept: candidates.filter((_, i) => verdicts[i] === null).map((c) => c.descriptor),
    dropped: verdicts.filter((v): v is DroppedEpoch => v !== null),
  };
}

/**
 * One channel's kept epochs, [epoch][sample] (length kept·samplesPerEpoch), cut from its continuous
 * row with the plan's baseline removal.
 */
export function epochsOfChannel(plan: EpochPlan, row: Float64Array): Float64Array {
  const spe = plan.samplesPerEpoch;
  const out = new Float64Array(plan.kept.length * spe);
  plan.kept.forEach((descriptor, e) => extract(out.subarray(e * spe, (e + 1) * spe), row, descriptor.startSample, plan.baseline));
  return out;
}

/** Every channel's epochs in one [epoch][channel][sample] array: allocated once, at its final size. */
function assemble(plan: EpochPlan, rows: ChannelRows): EpochingResult {
  const { channelCount, samplesPerEpoch: spe } = plan;
  const out = new Float64Array(plan.kept.length * channelCount * spe);
  for (let c = 0; c < channelCount; c++) {
    const row = rows.row(c);
    plan.kept.forEach((descriptor, e) => {
      const base = e * channelCount * spe;
      extract(out.subarray(base + c * spe, base + (c + 1) * spe), row, descriptor.startSample, plan.baseline);
    });
  }
  return { data: out, epochCount: plan.kept.length, channelCount, samplesPerEpoch: spe, kept: plan.kept, dropped: plan.dropped };
}

/**
 * Cuts continuous data into fixed-length epochs starting at sample round(k·step·fs), k = 0, 1, …
 *
 * Candidate epochs that start inside the data but run past its end are reported as dropped
 * ('out-of-bounds'); then bad spans ('bad-span') and the peak-to-peak threshold ('amplitude') are
 * applied, in that order, after baseline removal.
 *
 * @param input - Continuous [channel][sample] data and its sampling rate in Hz.
 * @param options - lengthSeconds (s), stepSeconds (s, @defaultValue lengthSeconds) and the
 *   screening options of {@link EpochScreening}.
 * @returns The epoched data [epoch][channel][sample] with kept and dropped epoch descriptors.
 * @throws RangeError / TypeError Naming the parameter: a non-positive length or step, an epoch
 *   shorter than one sample, a baseline outside the epoch, a bad span that ends before it starts.
 *
 * Reference: fixed-length segmentation and peak-to-peak rejection are common practice in EEG
 * analysis.
 */
export function fixedLengthEpochs(input: ContinuousData, options: FixedLengthOptions): EpochingResult {
  const rows = rowsOf(input);
  return assemble(planFixedLengthEpochs(rows, options), rows);
}

/** {@link fixedLengthEpochs} on data read a channel at a time: which epochs stay, for {@link epochsOfChannel}. */
export function planFixedLengthEpochs(input: ChannelRows, options: FixedLengthOptions): EpochPlan {
  const { sampleCount, samplingRate: fs } = checkRows(input);
  const { spe, step } = tiling(options, fs);
  checkScreening(options, input.channelCount);
  const label = options.label ?? '';
  const candidates: Candidate[] = [];
  for (let k = 0; ; k++) {
    const start = Math.round(k * step * fs);
    if (start >= sampleCount) break;
    candidates.push({ descriptor: { source: k, label, startSample: start, lockSample: start, startSeconds: start / fs } });
  }
  return planCut(input, candidates, { first: 0, length: spe }, options);
}

/**
 * Cuts epochs around events: epoch = samples [e − round(before·fs), e + round(after·fs)) with
 * e = round(onset·fs).
 *
 * Epochs running off either end of the data are dropped ('out-of-bounds'), then bad spans
 * ('bad-span'), then the peak-to-peak threshold ('amplitude'), after baseline removal.
 *
 * @param input - Continuous [channel][sample] data and its sampling rate in Hz.
 * @param events - Onsets in seconds from the data start, with labels.
 * @param options - beforeSeconds, afterSeconds (s) and the screening options of {@link EpochScreening}.
 * @returns The epoched data [epoch][channel][sample] with kept and dropped epoch descriptors,
 *   in event order.
 * @throws RangeError / TypeError Naming the parameter: a window shorter than one sample, a
 *   non-finite onset, a baseline outside the epoch, a bad span that ends before it starts.
 *
 * Reference: event-locked epoching with pre-stimulus baseline correction is common practice in
 * evoked-potential analysis.
 */
export function eventLockedEpochs(input: ContinuousData, events: readonly EpochEvent[], options: EventLockedOptions): EpochingResult {
  const rows = rowsOf(input);
  return assemble(planEventLockedEpochs(rows, events, options), rows);
}

/** {@link eventLockedEpochs} on data read a channel at a time: which epochs stay, for {@link epochsOfChannel}. */
export function planEventLockedEpochs(input: ChannelRows, events: readonly EpochEvent[], options: EventLockedOptions): EpochPlan {
  const fs = checkRows(input).samplingRate;
  requireFinite(options.beforeSeconds, 'beforeSeconds');
  requireFinite(options.afterSeconds, 'afterSeconds');
  const before = Math.round(options.beforeSeconds * fs);
  const spe = before + Math.round(options.afterSeconds * fs);
  if (spe < 1) throw new RangeError(`beforeSeconds + afterSeconds must span at least one sample at ${fs} Hz`);
  checkScreening(options, input.channelCount);
  const candidates = events.map((event, i): Candidate => {
    requireFinite(event.onset, `events[${i}].onset`);
    if (typeof event.label !== 'string') throw new TypeError(`events[${i}].label must be a string`);
    const lock = Math.round(event.onset * fs);
    const start = lock - before;
    return { descriptor: { source: i, label: event.label, startSample: start, lockSample: lock, startSeconds: start / fs } };
  });
  return planCut(input, candidates, { first: -before, length: spe }, options);
}

export interface EpochBlock {
  /** Seconds from the data start. */
  onset: number;
  /** Seconds; the block is [onset, onset + duration). */
  duration: number;
  label: string;
}

export interface BlockOptions extends EpochScreening {
  /** Epoch length in seconds. */
  lengthSeconds: number;
  /** Seconds between epoch starts within a block. @defaultValue lengthSeconds (no overlap) */
  stepSeconds?: number;
}

/**
 * Tiles labelled blocks with fixed-length epochs: in a block [b0, b1) with b0 = round(onset·fs) and
 * b1 = round((onset + duration)·fs), epoch k starts at sample b0 + round(k·step·fs) and is cut when
 * it ends by b1. Each epoch carries its block's label; `source` is the block's index. Epochs never
 * straddle two blocks. Epochs of a block that runs past the data are dropped ('out-of-bounds'),
 * then bad spans ('bad-span') and the peak-to-peak threshold ('amplitude') apply, after baseline
 * removal (baseline times relative to the epoch start).
 *
 * @param input - Continuous [channel][sample] data and its sampling rate in Hz.
 * @param blocks - Labelled blocks in seconds, e.g. events with a duration.
 * @param options - lengthSeconds, stepSeconds (s) and the screening options of {@link EpochScreening}.
 * @returns The epoched data [epoch][channel][sample], blocks in the given order, epochs in time
 *   order within each block.
 * @throws RangeError / TypeError Naming the parameter: a non-positive length or step, an epoch
 *   shorter than one sample, a block with a non-finite onset or a negative duration.
 *
 * Reference: cutting fixed-length epochs within condition blocks (e.g. eyes-open and eyes-closed
 * rest) is common practice in resting-state EEG analysis.
 */
export function blockEpochs(input: ContinuousData, blocks: readonly EpochBlock[], options: BlockOptions): EpochingResult {
  const rows = rowsOf(input);
  return assemble(planBlockEpochs(rows, blocks, options), rows);
}

/** {@link blockEpochs} on data read a channel at a time: which epochs stay, for {@link epochsOfChannel}. */
export function planBlockEpochs(input: ChannelRows, blocks: readonly EpochBlock[], options: BlockOptions): EpochPlan {
  const fs = checkRows(input).samplingRate;
  const { spe, step } = tiling(options, fs);
  checkScreening(options, input.channelCount);
  const candidates: Candidate[] = [];
  blocks.forEach((block, i) => {
    requireFinite(block.onset, `blocks[${i}].onset`);
    requireFinite(block.duration, `blocks[${i}].duration`);
    if (block.duration < 0) throw new RangeError(`blocks[${i}].duration must be ≥ 0 s, got ${block.duration}`);
    if (typeof block.label !== 'string') throw new TypeError(`blocks[${i}].label must be a string`);
    const first = Math.round(block.onset * fs);
    const end = Math.round((block.onset + block.duration) * fs);
    for (let k = 0; ; k++) {
      const start = first + Math.round(k * step * fs);
      if (start + spe > end) break;
      candidates.push({ descriptor: { source: i, label: block.label, startSample: start, lockSample: start, startSeconds: start / fs } });
    }
  });
  return planCut(input, candidates, { first: 0, length: spe }, options);
}
