import type { Signal, SignalDescription, SignalEvent } from './signal.js';

/**
 * A signal's samples read on demand, one channel row (or part of one) at a time, so that analysis
 * holds a few rows of one channel instead of the whole recording. Reads are synchronous because
 * the engine is; it runs on worker threads, where a blocking read holds up nothing else.
 *
 * Whatever the stored encoding (float64, float32, 16-bit integers with a scale), a row reads as the
 * float64 values the signal's content hash is taken over, so the engine cannot tell one from another.
 */
export interface SampleSource extends SignalDescription {
  readonly events?: SignalEvent[];
  /**
   * Writes samples [from, to) of `channel` in `epoch` to `into[0 … to − from)`, as float64 in the
   * signal's unit. Throws a RangeError for a row or span outside the signal.
   */
  readRow(epoch: number, channel: number, from: number, to: number, into: Float64Array): void;
  /** Releases what the source holds open (a file descriptor); reading afterwards throws. */
  close(): void;
}

/** Checks a read against the signal's shape; every source calls it before it reads. */
export function checkRead(source: SignalDescription, epoch: number, channel: number, from: number, to: number, into: Float64Array): void {
  const ok =
    Number.isInteger(epoch) &&
    epoch >= 0 &&
    epoch < source.epochCount &&
    Number.isInteger(channel) &&
    channel >= 0 &&
    channel < source.channels.length &&
    Number.isInteger(from) &&
    Number.isInteger(to) &&
    from >= 0 &&
    from <= to &&
    to <= source.samplesPerEpoch;
  if (!ok)
    throw new RangeError(
      `no samples [${from}, ${to}) of channel ${channel} in epoch ${epoch} in a signal of ${source.epochCount} epoch(s) × ${source.channels.length} channel(s) × ${source.samplesPerEpoch} samples`,
    );
  if (into.length < to - from) throw new RangeError(`a buffer of ${into.length} samples cannot take ${to - from}`);
}

/** A source over samples already in memory (JSON uploads, tests, the command line). */
export function arraySource(signal: Signal): SampleSource {
  let open = true;
  const { data, samplesPerEpoch } = signal;
  const channelCount = signal.channels.length;
  return {
    samplingRate: signal.samplingRate,
    channels: signal.channels,
    unit: signal.unit,
    epochCount: signal.epochCount,
    samplesPerEpoch,
    ...(signal.events ? { events: signal.events } : {}),
    readRow(epoch, channel, from, to, into) {
      if (!open) throw new Error('the sample source is closed');
      checkRead(signal, epoch, channel, from, to, into);
      const start = (epoch * channelCount + channel) * samplesPerEpoch;
      into.set(data.subarray(start + from, start + to));
    },
    close() {
      open = false;
    },
  };
}

/** Reads every sample into one array: for methods that need all channels at once, and small signals. */
export function materialize(source: SampleSource): Signal {
  const { samplesPerEpoch } = source;
  const channelCount = source.channels.length;
  const data = new Float64Array(source.epochCount * channelCount * samplesPerEpoch);
  for (let e = 0; e < source.epochCount; e++) {
    for (let c = 0; c < channelCount; c++) {
      const start = (e * channelCount + c) * samplesPerEpoch;
      source.readRow(e, c, 0, samplesPerEpoch, data.subarray(start, start + samplesPerEpoch));
    }
  }
  const signal: Signal = {
    samplingRate: source.samplingRate,
    channels: source.channels,
    unit: source.unit,
    epochCount: source.epochCount,
    samplesPerEpoch,
    data,
  };
  if (source.events && source.events.length > 0) signal.events = source.events;
  return signal;
}
