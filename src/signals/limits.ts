/** Size limits applied while decoding, before any sample is stored. */
export interface SignalLimits {
  maxChannels: number;
  maxEpochs: number;
  /** total samples over all epochs and channels */
  maxSamples: number;
  /** Hz */
  maxSamplingRate: number;
}

export const DEFAULT_SIGNAL_LIMITS: Readonly<SignalLimits> = Object.freeze({
  maxChannels: 512,
  maxEpochs: 100_000,
  maxSamples: 64 * 1024 * 1024,
  maxSamplingRate: 100_000,
});
