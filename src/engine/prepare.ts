import type { Recipe } from '../recipes/schema.js';
import { epochsOfChannel, planBlockEpochs, planEventLockedEpochs, planFixedLengthEpochs, type ChannelRows, type DroppedEpoch, type EpochDescriptor, type EpochPlan } from '../signals/epoching.js';
import type { SampleSource } from '../signals/sample-source.js';
import type { SignalDescription } from '../signals/signal.js';
import { resolveView, type ResolvedView, type SignalView } from '../signals/view.js';
import type { ChannelSource } from './channel-runner.js';
import { EngineInputError } from './errors.js';
import { gapSpans } from './gaps.js';

export interface EpochingSummary {
  mode: 'fixed' | 'events' | 'blocks';
  kept: { index: number; source: number; label: string; startSeconds: number }[];
  dropped: { source: number; label: string; startSeconds: number; reason: DroppedEpoch['reason']; channel?: string; value?: number; span?: [number, number] }[];
}

/** The signal the estimators see, after the view, the re-reference and the epoching, read a channel at a time. */
export interface PreparedInput {
  signal: ChannelSource;
  epoching: EpochingSummary | null;
  /** per epoch, its event or block label (events and blocks modes) for grouping */
  labels: string[] | null;
  /** closed [start, end] s spans of a continuous signal that Welch segments must avoid */
  badSpans: [number, number][];
  warnings: string[];
}

/**
 * Re-references over all channels first (so the common average does not depend on a channel
 * selection), then applies the view, then cuts epochs. Each step is deterministic, and each works
 * on one channel's row at a time: what needs every channel (the average reference's mean row, the
 * gap spans, the peak-to-peak screening of epochs) is a pass over the channels in channel order
 * that keeps one row-sized sum or a number per epoch and channel. The samples the estimators see are
 * read again, channel by channel, when they ask ({@link ChannelSource.channel}).
 */
export function prepareInput(original: SampleSource, recipe: Recipe, view: SignalView | null): PreparedInput {
  const warnings: string[] = [];
  const referencedChannels = referenceChannels(original, recipe.reference);
  const referenced = { ...original, channels: referencedChannels };
  const window: ResolvedView = view ? resolveView(referenced, view) : { startSample: 0, endSample: original.samplesPerEpoch, channels: referencedChannels.map((_, c) => c), badSpans: [] };
  const viewSpans = window.badSpans;
  const read = referencedReader(original, recipe.reference, window);
  const length = window.endSample - window.startSample;
  const offset = window.startSample / original.samplingRate;
  const signal = {
    samplingRate: original.samplingRate,
    channels: window.channels.map((c) => referencedChannels[c]!),
    unit: original.unit,
    epochCount: original.epochCount,
    samplesPerEpoch: length,
    ...(original.events ? { events: view ? original.events.map((ev) => ({ ...ev, onset: ev.onset - offset })) : original.events } : {}),
  };
  // Rows read only to be screened or cut share one buffer: a fresh row-sized array per read cost
  // more in page faults than the reading itself.
  let scratch: Float64Array | null = null;
  /** Channel c of the viewed, re-referenced signal in epoch 0 (a continuous signal's row), valid until the next call. */
  const row = (c: number): Float64Array => {
    scratch ??= new Float64Array(length);
    read(0, c, scratch);
    return scratch;
  };
  const labelled = new Set(recipe.badSpans.labels);
  const eventSpans = (signal.events ?? []).filter((ev) => labelled.has(ev.label)).map((ev): [number, number] => [ev.onset, ev.onset + (ev.duration ?? 0)]);
  if (recipe.badSpans.labels.length > 0 && eventSpans.length === 0) warnings.push(`no event carries a bad-span label (${recipe.badSpans.labels.join(', ')})`);
  const gaps = recipe.nonFinite === 'bad-span' ? gapSpans(signal, row) : [];
  if (gaps.length > 0) {
    const seconds = gaps.reduce((sum, [a, b]) => sum + (b - a) + 1 / signal.samplingRate, 0);
    warnings.push(`${gaps.length} run(s) of non-finite samples (${Number(seconds.toPrecision(6))} s in all) treated as bad spans`);
  }
  const badSpans = [...viewSpans, ...eventSpans, ...gaps].sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  if (!recipe.epoching) {
    const rows: ChannelSource = {
      ...signal,
      channel(c) {
        const out = new Float64Array(signal.epochCount * length);
        for (let e = 0; e < signal.epochCount; e++) read(e, c, out.subarray(e * length, (e + 1) * length));
        return out;
      },
    };
    return { signal: rows, epoching: null, labels: null, badSpans, warnings };
  }

  const continuous: ChannelRows = { channelCount: signal.channels.length, sampleCount: length, samplingRate: signal.samplingRate, row };
  const screening = {
    ...(recipe.badSpans.peakToPeak !== null ? { peakToPeakThreshold: recipe.badSpans.peakToPeak } : {}),
    ...(badSpans.length > 0 ? { badSpans } : {}),
  };
  let cut: EpochPlan;
  const e = recipe.epoching;
  if (e.mode === 'fixed') {
    cut = planFixedLengthEpochs(continuous, { lengthSeconds: e.epochSeconds, ...(e.stepSeconds !== null ? { stepSeconds: e.stepSeconds } : {}), ...screening });
  } else if (e.mode === 'blocks') {
    const wanted = new Set(e.labels);
    const blocks = (signal.events ?? []).filter((ev) => wanted.has(ev.label) && (ev.duration ?? 0) > 0).map((ev) => ({ onset: ev.onset, duration: ev.duration!, label: ev.label }));
    if (blocks.length === 0) {
      throw new EngineInputError('no-usable-epochs', `the signal has no event with a duration labelled ${e.labels.map((l) => `"${l}"`).join(', ')} to cut epochs in`, '/recipe/epoching/labels');
    }
    cut = planBlockEpochs(continuous, blocks, { lengthSeconds: e.epochSeconds, ...(e.stepSeconds !== null ? { stepSeconds: e.stepSeconds } : {}), ...screening });
  } else {
    const wanted = e.labels ? new Set(e.labels) : null;
    const events = (signal.events ?? []).filter((ev) => !labelled.has(ev.label) && (wanted === null || wanted.has(ev.label))).map((ev) => ({ onset: ev.onset, label: ev.label }));
    if (events.length === 0) {
      throw new EngineInputError(
        'no-usable-epochs',
        `the signal has no event${e.labels ? ` labelled ${e.labels.map((l) => `"${l}"`).join(', ')}` : ''} to cut epochs around`,
        '/recipe/epoching/labels',
      );
    }
    cut = planEventLockedEpochs(continuous, events, {
      beforeSeconds: e.beforeSeconds,
      afterSeconds: e.afterSeconds,
      ...(e.baseline ? { baseline: { startSeconds: e.baseline[0], endSeconds: e.baseline[1] } } : {}),
      ...screening,
    });
  }
  if (cut.kept.length === 0) {
    const reasons = [...new Set(cut.dropped.map((d) => d.reason))].join(', ');
    throw new EngineInputError('no-usable-epochs', `epoching left no epoch (${cut.dropped.length} dropped: ${reasons || 'none found'})`, '/recipe/epoching');
  }
  const describe = (d: EpochDescriptor) => ({ source: d.source, label: d.label, startSeconds: d.startSeconds });
  const epoching: EpochingSummary = {
    mode: e.mode,
    kept: cut.kept.map((d, index) => ({ index, ...describe(d) })),
    dropped: cut.dropped.map((d) => ({
      ...describe(d),
      reason: d.reason,
      ...(d.channel !== undefined ? { channel: signal.channels[d.channel]! } : {}),
      ...(d.value !== undefined ? { value: d.value } : {}),
      ...(d.span ? { span: [d.span[0], d.span[1]] as [number, number] } : {}),
    })),
  };
  const plan = cut;
  const epoched: ChannelSource = {
    samplingRate: signal.samplingRate,
    channels: signal.channels,
    unit: signal.unit,
    epochCount: plan.kept.length,
    samplesPerEpoch: plan.samplesPerEpoch,
    channel: (c) => epochsOfChannel(plan, row(c)),
  };
  return { signal: epoched, epoching, labels: e.mode === 'fixed' ? null : cut.kept.map((d) => d.label), badSpans: [], warnings };
}

/** The channels after the re-reference: a reference channel is left out (and must exist). */
function referenceChannels(signal: SignalDescription, reference: Recipe['reference']): string[] {
  if (reference === 'none' || reference === 'average') return signal.channels;
  const ref = signal.channels.indexOf(reference.channel);
  if (ref < 0) throw new EngineInputError('no-usable-epochs', `reference channel "${reference.channel}" is not in the signal`, '/recipe/reference/channel');
  return signal.channels.filter((_, c) => c !== ref);
}

/**
 * Reads row (epoch e, viewed channel j) of the re-referenced signal within the view's window into
 * `into`. The average reference's mean row (per sample, the sum over channels 0…C−1 from 0, divided
 * by C) is accumulated row by row in channel order on the first read: the same additions in the same
 * order as per sample, so the same bits. It and a reference channel's rows are kept for the job
 * (one channel's worth of samples).
 */
function referencedReader(source: SampleSource, reference: Recipe['reference'], window: ResolvedView): (e: number, j: number, into: Float64Array) => void {
  const { startSample: from, endSample: to } = window;
  const n = to - from;
  const C = source.channels.length;
  if (reference === 'none') return (e, j, into) => source.readRow(e, window.channels[j]!, from, to, into);
  let subtrahend: Float64Array | null = null;
  const rows = (): Float64Array => {
    if (subtrahend) return subtrahend;
    const out = new Float64Array(source.epochCount * n);
    if (reference === 'average') {
      const x = new Float64Array(n);
      for (let e = 0; e < source.epochCount; e++) {
        const sum = out.subarray(e * n, (e + 1) * n);
        for (let c = 0; c < C; c++) {
          source.readRow(e, c, from, to, x);
          for (let i = 0; i < n; i++) sum[i]! += x[i]!;
        }
        for (let i = 0; i < n; i++) sum[i] = sum[i]! / C;
      }
    } else {
      const ref = source.channels.indexOf(reference.channel);
      for (let e = 0; e < source.epochCount; e++) source.readRow(e, ref, from, to, out.subarray(e * n, (e + 1) * n));
    }
    subtrahend = out;
    return out;
  };
  // Index in the source of each re-referenced channel (a reference channel is left out).
  const original = reference === 'average' ? source.channels.map((_, c) => c) : source.channels.map((_, c) => c).filter((c) => source.channels[c] !== reference.channel);
  return (e, j, into) => {
    const minus = rows().subarray(e * n, (e + 1) * n);
    source.readRow(e, original[window.channels[j]!]!, from, to, into);
    for (let i = 0; i < n; i++) into[i] = into[i]! - minus[i]!;
  };
}
