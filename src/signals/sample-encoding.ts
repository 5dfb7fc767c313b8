import { endianness } from 'node:os';
import { calibrate, type EdfCalibration } from './edf/index.js';
import { scaleFloat32 } from './units.js';

/**
 * How a signal's samples are kept at rest. Whatever the encoding, reading them back gives the
 * float64 values the content hash is taken over; the encoding itself is not part of that hash.
 *
 * - `float64`: the values themselves (JSON uploads, and every signal stored before encodings).
 * - `float32`: the uploaded float32 values; the reader takes them to the stored unit with
 *   {@link scaleFloat32} and `exponent`, as ingest did.
 * - `int16`: an EDF file's 16-bit digital codes; the reader calibrates them with the channel's
 *   {@link EdfCalibration} and {@link calibrate}, as decoding the upload did.
 */
export type SampleEncoding = { kind: 'float64' } | { kind: 'float32'; exponent: number } | { kind: 'int16'; calibration: EdfCalibration[] };

export const FLOAT64: SampleEncoding = Object.freeze({ kind: 'float64' });

/** Bytes one sample takes at rest. */
export function bytesPerSample(encoding: SampleEncoding): 2 | 4 | 8 {
  return encoding.kind === 'int16' ? 2 : encoding.kind === 'float32' ? 4 : 8;
}

const LITTLE_ENDIAN = endianness() === 'LE';

/**
 * Decodes `count` stored samples of `channel` (little-endian, in the encoding) from `bytes` into
 * `into[0 … count)` as float64. `bytes` must start at a multiple of the sample's width in its buffer.
 */
export function decodeSamples(encoding: SampleEncoding, channel: number, bytes: Uint8Array, count: number, into: Float64Array): void {
  if (bytes.byteOffset % bytesPerSample(encoding) !== 0) throw new RangeError(`stored ${encoding.kind} samples must be read into a buffer aligned to ${bytesPerSample(encoding)} bytes`);
  switch (encoding.kind) {
    case 'float64':
      if (LITTLE_ENDIAN) into.set(new Float64Array(bytes.buffer, bytes.byteOffset, count));
      else for (let i = 0, view = viewOf(bytes); i < count; i++) into[i] = view.getFloat64(i * 8, true);
      return;
    case 'float32':
      scaleFloat32(LITTLE_ENDIAN ? new Float32Array(bytes.buffer, bytes.byteOffset, count) : swapped(bytes, count, Float32Array), encoding.exponent, into, count);
      return;
    case 'int16': {
      const calibration = encoding.calibration[channel];
      if (calibration === undefined) throw new RangeError(`no calibration for channel ${channel}`);
      calibrate(LITTLE_ENDIAN ? new Int16Array(bytes.buffer, bytes.byteOffset, count) : swapped(bytes, count, Int16Array), calibration, into, count);
      return;
    }
  }
}

/**
 * Little-endian bytes of `values` in the encoding (what ingest writes; a copy on big-endian hosts).
 */
export function encodedBytes(values: Int16Array | Float32Array): Uint8Array {
  const bytes = new Uint8Array(values.buffer, values.byteOffset, values.byteLength);
  return LITTLE_ENDIAN ? bytes : swapBytes(bytes, values.BYTES_PER_ELEMENT);
}

function viewOf(bytes: Uint8Array): DataView {
  return new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

function swapped<T extends Int16Array | Float32Array>(bytes: Uint8Array, count: number, type: { new (buffer: ArrayBuffer): T; BYTES_PER_ELEMENT: number }): T {
  return new type(swapBytes(bytes.subarray(0, count * type.BYTES_PER_ELEMENT), type.BYTES_PER_ELEMENT).buffer as ArrayBuffer);
}

function swapBytes(bytes: Uint8Array, width: number): Uint8Array {
  const out = new Uint8Array(bytes.length);
  for (let i = 0; i < bytes.length; i += width) for (let k = 0; k < width; k++) out[i + k] = bytes[i + width - 1 - k]!;
  return out;
}

/** What a stored signal's meta says about its encoding; absent (signals stored before encodings) is float64. */
export interface EncodingFields {
  encoding?: 'float64' | 'float32' | 'int16';
  /** float32: the decimal exponent that takes the uploaded values to the stored unit */
  unitExponent?: number;
  /** int16: per channel, the map from digital codes to the stored unit */
  calibration?: EdfCalibration[];
}

/** The encoding a meta describes, checked; a meta that names an encoding without its parameters is refused. */
export function encodingOf(meta: EncodingFields & { id?: string; channels: readonly string[] }): SampleEncoding {
  const what = `stored signal ${meta.id ?? ''}`.trim();
  switch (meta.encoding ?? 'float64') {
    case 'float64':
      return FLOAT64;
    case 'float32':
      if (!Number.isInteger(meta.unitExponent)) throw new Error(`${what} is stored as float32 without its unit exponent`);
      return { kind: 'float32', exponent: meta.unitExponent! };
    case 'int16':
      if (meta.calibration?.length !== meta.channels.length) throw new Error(`${what} is stored as int16 without a calibration for each channel`);
      return { kind: 'int16', calibration: meta.calibration };
    default:
      throw new Error(`${what} names an unknown sample encoding "${meta.encoding}"`);
  }
}

/** The meta fields that record `encoding`. */
export function encodingFields(encoding: SampleEncoding): EncodingFields {
  if (encoding.kind === 'float32') return { encoding: 'float32', unitExponent: encoding.exponent };
  if (encoding.kind === 'int16') return { encoding: 'int16', calibration: encoding.calibration.map(({ digitalMinimum, gain, physicalMinimum }) => ({ digitalMinimum, gain, physicalMinimum })) };
  return { encoding: 'float64' };
}

/**
 * Whether `calibration` survives the JSON of a meta unchanged (−0 becomes 0, which can change a
 * calibrated −0 into +0); a channel whose calibration does not is stored as float64 instead.
 */
export function survivesJson(calibration: EdfCalibration): boolean {
  return [calibration.digitalMinimum, calibration.gain, calibration.physicalMinimum].every((v) => Number.isFinite(v) && Object.is(JSON.parse(JSON.stringify(v)), v));
}
