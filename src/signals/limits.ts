/** Size limits applied while decoding, before any sample is stored. */
export interface SignalLimits {
  maxChannels: number;
  maxEpochs: number;
  /** total samples over all epochs and channels */
  maxSamples: number;
  /** Hz */
  maxSamplingRate: number;
  /**
   * Hz; lower rates are refused at upload. A rate near zero makes every derived length (samples per
   * second of a window, wavelet or segment) overflow to Infinity in a worker.
   */
  minSamplingRate: number;
}

export const DEFAULT_SIGNAL_LIMITS: Readonly<SignalLimits> = Object.freeze({
  maxChannels: 512,
  maxEpochs: 100_000,
  maxSamples: 64 * 1024 * 1024,
  maxSamplingRate: 100_000,
  minSamplingRate: 0.01,
});
