/**
 * The one in-memory shape every input format decodes into.
 *
 * Samples are stored as float64 in [epoch][channel][sample] row-major order, so epoch `e`, channel `c`
 * starts at `(e * channels.length + c) * samplesPerEpoch`. A continuous recording is one epoch.
 */
export interface SignalEvent {
  /** seconds from the start of the recording */
  onset: number;
  /** seconds, or null for an instantaneous marker */
  duration: number | null;
  label: string;
}

/** Everything about a signal but its samples. */
export interface SignalDescription {
  /** Hz */
  samplingRate: number;
  channels: string[];
  /** physical unit of the samples, e.g. `uV` */
  unit: string;
  epochCount: number;
  samplesPerEpoch: number;
}

export interface Signal extends SignalDescription {
  data: Float64Array;
  events?: SignalEvent[];
}

/** A view of one channel of one epoch, sharing memory with `signal.data`. */
export function channelView(signal: Signal, epoch: number, channel: number): Float64Array {
  const start = (epoch * signal.channels.length + channel) * signal.samplesPerEpoch;
  return signal.data.subarray(start, start + signal.samplesPerEpoch);
}

/** Counts samples that are NaN or ±Infinity and reports the first one's position. */
export function findNonFinite(signal: Signal): { count: number; first: { epoch: number; channel: number; sample: number } | null } {
  let count = 0;
  let first: { epoch: number; channel: number; sample: number } | null = null;
  const { data, samplesPerEpoch } = signal;
  const channelCount = signal.channels.length;
  for (let i = 0; i < data.length; i++) {
    if (!Number.isFinite(data[i]!)) {
      if (first === null) {
        const row = Math.floor(i / samplesPerEpoch);
        first = { epoch: Math.floor(row / channelCount), channel: row % channelCount, sample: i % samplesPerEpoch };
      }
      count++;
    }
  }
  return { count, first };
}
