import type { Recipe } from '../recipes/schema.js';
import { blockEpochs, eventLockedEpochs, fixedLengthEpochs, type DroppedEpoch, type EpochDescriptor, type EpochingResult } from '../signals/epoching.js';
import type { Signal } from '../signals/signal.js';
import { applyView, resolveView, type SignalView } from '../signals/view.js';
import { EngineInputError } from './errors.js';
import { gapSpans } from './gaps.js';

export interface EpochingSummary {
  mode: 'fixed' | 'events' | 'blocks';
  kept: { index: number; source: number; label: string; startSeconds: number }[];
  dropped: { source: number; label: string; startSeconds: number; reason: DroppedEpoch['reason']; channel?: string; value?: number; span?: [number, number] }[];
}

/** The signal the estimators see, after the view, the re-reference and the epoching. */
export interface PreparedInput {
  signal: Signal;
  epoching: EpochingSummary | null;
  /** per epoch, its event or block label (events and blocks modes) for grouping */
  labels: string[] | null;
  /** closed [start, end] s spans of a continuous signal that Welch segments must avoid */
  badSpans: [number, number][];
  warnings: string[];
}

/**
 * Re-references over all channels first (so the common average does not depend on a channel
 * selection), then applies the view, then cuts epochs. Each step is deterministic.
 */
export function prepareInput(original: Signal, recipe: Recipe, view: SignalView | null): PreparedInput {
  const warnings: string[] = [];
  let signal = rereference(original, recipe.reference);
  let viewSpans: [number, number][] = [];
  if (view) {
    const resolved = resolveView(signal, view);
    signal = applyView(signal, resolved);
    viewSpans = resolved.badSpans;
  }
  const labelled = new Set(recipe.badSpans.labels);
  const eventSpans = (signal.events ?? []).filter((ev) => labelled.has(ev.label)).map((ev): [number, number] => [ev.onset, ev.onset + (ev.duration ?? 0)]);
  if (recipe.badSpans.labels.length > 0 && eventSpans.length === 0) warnings.push(`no event carries a bad-span label (${recipe.badSpans.labels.join(', ')})`);
  const gaps = recipe.nonFinite === 'bad-span' ? gapSpans(signal) : [];
  if (gaps.length > 0) {
    const seconds = gaps.reduce((sum, [a, b]) => sum + (b - a) + 1 / signal.samplingRate, 0);
    warnings.push(`${gaps.length} run(s) of non-finite samples (${Number(seconds.toPrecision(6))} s in all) treated as bad spans`);
  }
  const badSpans = [...viewSpans, ...eventSpans, ...gaps].sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  if (!recipe.epoching) return { signal, epoching: null, labels: null, badSpans, warnings };

  const continuous = { data: signal.data, channelCount: signal.channels.length, samplingRate: signal.samplingRate };
  const screening = {
    ...(recipe.badSpans.peakToPeak !== null ? { peakToPeakThreshold: recipe.badSpans.peakToPeak } : {}),
    ...(badSpans.length > 0 ? { badSpans } : {}),
  };
  let cut: EpochingResult;
  const e = recipe.epoching;
  if (e.mode === 'fixed') {
    cut = fixedLengthEpochs(continuous, { lengthSeconds: e.epochSeconds, ...(e.stepSeconds !== null ? { stepSeconds: e.stepSeconds } : {}), ...screening });
  } else if (e.mode === 'blocks') {
    const wanted = new Set(e.labels);
    const blocks = (signal.events ?? []).filter((ev) => wanted.has(ev.label) && (ev.duration ?? 0) > 0).map((ev) => ({ onset: ev.onset, duration: ev.duration!, label: ev.label }));
    if (blocks.length === 0) {
      throw new EngineInputError('no-usable-epochs', `the signal has no event with a duration labelled ${e.labels.map((l) => `"${l}"`).join(', ')} to cut epochs in`, '/recipe/epoching/labels');
    }
    cut = blockEpochs(continuous, blocks, { lengthSeconds: e.epochSeconds, ...(e.stepSeconds !== null ? { stepSeconds: e.stepSeconds } : {}), ...screening });
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
    cut = eventLockedEpochs(continuous, events, {
      beforeSeconds: e.beforeSeconds,
      afterSeconds: e.afterSeconds,
      ...(e.baseline ? { baseline: { startSeconds: e.baseline[0], endSeconds: e.baseline[1] } } : {}),
      ...screening,
    });
  }
  if (cut.epochCount === 0) {
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
  const epoched: Signal = {
    samplingRate: signal.samplingRate,
    channels: signal.channels,
    unit: signal.unit,
    epochCount: cut.epochCount,
    samplesPerEpoch: cut.samplesPerEpoch,
    data: cut.data,
  };
  return { signal: epoched, epoching, labels: e.mode === 'fixed' ? null : cut.kept.map((d) => d.label), badSpans: [], warnings };
}

function rereference(signal: Signal, reference: Recipe['reference']): Signal {
  if (reference === 'none') return signal;
  const n = signal.samplesPerEpoch;
  const channels = signal.channels.length;
  if (reference === 'average') {
    const data = new Float64Array(signal.data.length);
    for (let e = 0; e < signal.epochCount; e++) {
      const base = e * channels * n;
      for (let i = 0; i < n; i++) {
        let sum = 0;
        for (let c = 0; c < channels; c++) sum += signal.data[base + c * n + i]!;
        const mean = sum / channels;
        for (let c = 0; c < channels; c++) data[base + c * n + i] = signal.data[base + c * n + i]! - mean;
      }
    }
    return { ...signal, data };
  }
  const ref = signal.channels.indexOf(reference.channel);
  if (ref < 0) throw new EngineInputError('no-usable-epochs', `reference channel "${reference.channel}" is not in the signal`, '/recipe/reference/channel');
  const kept = signal.channels.map((_, c) => c).filter((c) => c !== ref);
  const data = new Float64Array(signal.epochCount * kept.length * n);
  for (let e = 0; e < signal.epochCount; e++) {
    const refRow = signal.data.subarray((e * channels + ref) * n, (e * channels + ref + 1) * n);
    kept.forEach((c, k) => {
      const from = (e * channels + c) * n;
      const to = (e * kept.length + k) * n;
      for (let i = 0; i < n; i++) data[to + i] = signal.data[from + i]! - refRow[i]!;
    });
  }
  return { ...signal, channels: kept.map((c) => signal.channels[c]!), data };
}
