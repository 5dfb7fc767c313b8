import { SignalInputError } from './errors.js';
import type { Signal, SignalDescription } from './signal.js';

/** A part of a stored signal, named in a job instead of uploading it again. */
export interface SignalView {
  /** seconds from the start of a continuous signal; default 0 */
  start?: number | undefined;
  /** seconds, excluded; default the end */
  end?: number | undefined;
  /** channel names to keep, in this order; default all */
  channels?: string[] | undefined;
  /** [start, end] seconds (closed, from the signal start) to leave out of the analysis */
  badSpans?: [number, number][] | undefined;
}

export interface ResolvedView {
  startSample: number;
  endSample: number;
  channels: number[];
  badSpans: [number, number][];
}

/**
 * Checks a view against the signal it names and turns it into sample and channel indices.
 * Errors carry pointers relative to the view object (the caller prefixes where it sat).
 */
export function resolveView(shape: SignalDescription, view: SignalView): ResolvedView {
  const duration = shape.samplesPerEpoch / shape.samplingRate;
  const timed = view.start !== undefined || view.end !== undefined;
  if (timed && shape.epochCount !== 1) {
    throw new SignalInputError('shape', `start/end select a time window of a continuous signal; this signal has ${shape.epochCount} epochs`, view.start !== undefined ? '/start' : '/end');
  }
  const start = view.start ?? 0;
  const end = view.end ?? duration;
  if (!(start >= 0) || start >= duration) throw new SignalInputError('shape', `start ${start} s is outside the signal (0 to ${duration} s)`, '/start');
  if (!(end > start) || end > duration + 1e-9) throw new SignalInputError('shape', `end ${end} s must lie after start (${start} s) and within the signal (${duration} s)`, '/end');
  const startSample = Math.round(start * shape.samplingRate);
  const endSample = Math.min(shape.samplesPerEpoch, Math.round(end * shape.samplingRate));
  if (endSample - startSample < 2) throw new SignalInputError('shape', `the window ${start}–${end} s holds fewer than 2 samples`, '/end');
  const byName = new Map(shape.channels.map((name, i) => [name, i]));
  const channels = (view.channels ?? shape.channels).map((name, i) => {
    const index = byName.get(name);
    if (index === undefined) throw new SignalInputError('channels', `channel "${name}" is not in the signal (it has ${shape.channels.join(', ')})`, `/channels/${i}`);
    return index;
  });
  if (new Set(channels).size !== channels.length) throw new SignalInputError('channels', 'a channel is selected twice', '/channels');
  if (channels.length === 0) throw new SignalInputError('channels', 'select at least one channel', '/channels');
  const badSpans = (view.badSpans ?? []).map(([a, b], i): [number, number] => {
    if (!(b >= a)) throw new SignalInputError('shape', `bad span ${i} [${a}, ${b}] s ends before it starts`, `/badSpans/${i}`);
    return [a - start, b - start];
  });
  return { startSample, endSample, channels, badSpans };
}

/** The selected window and channels as a new signal; events are shifted to the window's start. */
export function applyView(signal: Signal, view: ResolvedView): Signal {
  const length = view.endSample - view.startSample;
  const data = new Float64Array(signal.epochCount * view.channels.length * length);
  for (let e = 0; e < signal.epochCount; e++) {
    view.channels.forEach((c, k) => {
      const from = (e * signal.channels.length + c) * signal.samplesPerEpoch + view.startSample;
      data.set(signal.data.subarray(from, from + length), (e * view.channels.length + k) * length);
    });
  }
  const offset = view.startSample / signal.samplingRate;
  const out: Signal = {
    samplingRate: signal.samplingRate,
    channels: view.channels.map((c) => signal.channels[c]!),
    unit: signal.unit,
    epochCount: signal.epochCount,
    samplesPerEpoch: length,
    data,
  };
  if (signal.events) out.events = signal.events.map((ev) => ({ ...ev, onset: ev.onset - offset }));
  return out;
}
