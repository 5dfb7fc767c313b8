import { SignalInputError } from './errors.js';
import type { SignalLimits } from './limits.js';
import type { Signal } from './signal.js';
import { checkSignalShape } from './validate.js';

export interface BinarySignalDescription {
  samplingRate: number;
  channels: string[];
  epochCount: number;
  unit?: string | undefined;
  nonFinite?: 'reject' | 'keep' | undefined;
}

/**
 * Decodes little-endian float32 samples laid out [epoch][channel][sample]. The sample count per
 * epoch follows from the body length, which must divide evenly.
 */
export function decodeBinarySignal(bytes: Uint8Array, description: BinarySignalDescription, limits: SignalLimits): Signal {
  const { samplingRate, channels, epochCount } = description;
  if (bytes.byteLength % 4 !== 0) {
    throw new SignalInputError('shape', `the body has ${bytes.byteLength} bytes, not a whole number of float32 samples`, '/body');
  }
  const values = bytes.byteLength / 4;
  const rows = epochCount * channels.length;
  if (rows === 0 || values % rows !== 0) {
    throw new SignalInputError('shape', `${values} float32 samples do not divide into ${epochCount} epoch(s) × ${channels.length} channel(s)`, '/body');
  }
  const samplesPerEpoch = values / rows;
  checkSignalShape({ samplingRate, channels, epochCount, samplesPerEpoch }, limits, {
    samplingRate: '/query/samplingRate',
    channels: '/query/channels',
    samples: '/body',
  });
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const data = new Float64Array(values);
  const keep = description.nonFinite === 'keep';
  for (let i = 0; i < values; i++) {
    const v = view.getFloat32(i * 4, true);
    if (!keep && !Number.isFinite(v)) {
      const row = Math.floor(i / samplesPerEpoch);
      const e = Math.floor(row / channels.length);
      const c = row % channels.length;
      throw new SignalInputError(
        'non-finite',
        `sample ${i % samplesPerEpoch} of channel "${channels[c]}" in epoch ${e} is ${v} (byte offset ${i * 4}); use nonFinite=keep to store it as a gap`,
        '/body',
      );
    }
    data[i] = v;
  }
  return { samplingRate, channels: [...channels], unit: description.unit ?? 'uV', epochCount, samplesPerEpoch, data };
}
