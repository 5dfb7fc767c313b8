import { SignalInputError } from './errors.js';
import type { SignalLimits } from './limits.js';

/** Checks the description of a signal (everything but the samples) and the size limits. */
export function checkSignalShape(
  shape: { samplingRate: number; channels: readonly string[]; epochCount: number; samplesPerEpoch: number },
  limits: SignalLimits,
  where: { samplingRate: string; channels: string; samples: string },
): void {
  const { samplingRate, channels, epochCount, samplesPerEpoch } = shape;
  checkSamplingRate(samplingRate, limits, where.samplingRate);
  if (channels.length === 0) throw new SignalInputError('channels', 'at least one channel name is required', where.channels);
  if (channels.length > limits.maxChannels) {
    throw new SignalInputError('limit', `${channels.length} channels exceed this server's limit of ${limits.maxChannels}`, where.channels);
  }
  const seen = new Map<string, number>();
  channels.forEach((name, i) => {
    if (name.trim() === '') throw new SignalInputError('channels', `channel name ${i} is empty`, `${where.channels}/${i}`);
    const before = seen.get(name);
    if (before !== undefined) {
      throw new SignalInputError('channels', `channel name "${name}" appears twice (positions ${before} and ${i})`, `${where.channels}/${i}`);
    }
    seen.set(name, i);
  });
  if (epochCount < 1) throw new SignalInputError('shape', 'at least one epoch is required', where.samples);
  if (epochCount > limits.maxEpochs) {
    throw new SignalInputError('limit', `${epochCount} epochs exceed this server's limit of ${limits.maxEpochs}`, where.samples);
  }
  if (samplesPerEpoch < 2) throw new SignalInputError('shape', `each channel needs at least 2 samples, got ${samplesPerEpoch}`, where.samples);
  const total = epochCount * channels.length * samplesPerEpoch;
  if (total > limits.maxSamples) {
    throw new SignalInputError('limit', `${total} samples exceed this server's limit of ${limits.maxSamples}`, where.samples);
  }
}

/** Refuses a sampling rate that is not a positive number of Hz within the server's limits. */
export function checkSamplingRate(samplingRate: number, limits: Pick<SignalLimits, 'minSamplingRate' | 'maxSamplingRate'>, pointer: string): void {
  if (!Number.isFinite(samplingRate) || samplingRate <= 0) {
    throw new SignalInputError('sampling-rate', `samplingRate must be a positive number of Hz, got ${samplingRate}`, pointer);
  }
  if (samplingRate > limits.maxSamplingRate) {
    throw new SignalInputError('sampling-rate', `samplingRate ${samplingRate} Hz is above this server's limit of ${limits.maxSamplingRate} Hz`, pointer);
  }
  if (samplingRate < limits.minSamplingRate) {
    throw new SignalInputError(
      'sampling-rate',
      `samplingRate ${samplingRate} Hz is below this server's minimum of ${limits.minSamplingRate} Hz (MIN_SAMPLING_RATE); give the rate in Hz (samples per second)`,
      pointer,
    );
  }
}
