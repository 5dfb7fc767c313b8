import { endianness } from 'node:os';
import { EdfFormatError } from './errors.js';
import type { EdfHeader, EdfSignalHeader } from './header.js';
import { parseTals, type EdfAnnotation } from './tal.js';

export interface DecodeEdfRecordsOptions {
  /**
   * Ordinary signals to decode, by index into `header.signals` or by label, in the order wanted.
   * @defaultValue every ordinary (non-annotation) signal, in file order
   */
  channels?: readonly (number | string)[];
  /** First data record to decode. @defaultValue 0 */
  startRecord?: number;
  /** One past the last data record to decode. @defaultValue header.recordCount */
  endRecord?: number;
  /**
   * File offset of `bytes[0]`. 0 means `bytes` is the whole file; a caller reading piecewise passes
   * the offset it read from (see {@link edfRecordByteRange}).
   * @defaultValue 0
   */
  bytesOrigin?: number;
  /** Decode the annotation signals' TALs. @defaultValue true */
  annotations?: boolean;
  /**
   * Start (s) of the record before `startRecord`, when a caller decodes a file in batches: the first
   * record of this batch is then checked against it as every later record is against its predecessor.
   * @defaultValue none (the batch's first record is checked only when it is the file's first)
   */
  previousRecordStart?: number;
}

export interface EdfSignalData extends EdfSignalHeader {
  samplingRate: number;
  /** Calibrated physical samples of the decoded records, in `physicalDimension` units. */
  samples: Float64Array;
}

/** A discontinuity between two decoded data records (EDF+D). */
export interface EdfGap {
  /** Index of the record after which the gap starts. */
  afterRecord: number;
  /** End of that record, seconds from the file start. */
  start: number;
  /** Start of the next record, seconds from the file start. */
  end: number;
}

export interface EdfRecords {
  startRecord: number;
  endRecord: number;
  signals: EdfSignalData[];
  /** Annotations found in the decoded records (time-keeping TALs excluded), in file order. */
  annotations: EdfAnnotation[];
  /** Start of each decoded record in seconds from the file start (from time-keeping TALs in EDF+). */
  recordStarts: Float64Array;
  /** Gaps between consecutive decoded records; always empty for EDF and EDF+C. */
  gaps: EdfGap[];
}

/** File byte range [start, end) that holds data records [startRecord, endRecord). */
export function edfRecordByteRange(header: EdfHeader, startRecord: number, endRecord: number): { start: number; end: number } {
  checkRecordRange(header, startRecord, endRecord);
  return {
    start: header.headerBytes + startRecord * header.recordBytes,
    end: header.headerBytes + endRecord * header.recordBytes,
  };
}

function checkRecordRange(header: EdfHeader, startRecord: number, endRecord: number): void {
  if (!Number.isInteger(startRecord) || startRecord < 0 || startRecord > header.recordCount) {
    throw new RangeError(`startRecord must be an integer in 0..${header.recordCount}, got ${startRecord}`);
  }
  if (!Number.isInteger(endRecord) || endRecord < startRecord || endRecord > header.recordCount) {
    throw new RangeError(`endRecord must be an integer in ${startRecord}..${header.recordCount}, got ${endRecord}`);
  }
}

function selectChannels(header: EdfHeader, channels: readonly (number | string)[] | undefined): EdfSignalHeader[] {
  if (channels === undefined) return header.signals.filter((s) => !s.isAnnotation);
  return channels.map((wanted, i) => {
    const found = typeof wanted === 'number' ? header.signals[wanted] : header.signals.find((s) => s.label === wanted && !s.isAnnotation);
    if (found === undefined || found.isAnnotation) {
      throw new RangeError(`channels[${i}] (${JSON.stringify(wanted)}) is not an ordinary signal of this file`);
    }
    return found;
  });
}

/**
 * Decodes a range of data records into calibrated physical samples and annotations.
 *
 * physical = (digital − digmin)·(physmax − physmin)/(digmax − digmin) + physmin, with 16-bit
 * little-endian two's-complement digital samples (Kemp et al. 1992; EDF+ §2.1.3).
 *
 * @param header - From {@link readEdfHeader}.
 * @param bytes - The whole file, or the part of it starting at file offset `options.bytesOrigin`.
 * @param options - See {@link DecodeEdfRecordsOptions}.
 * @returns Samples per selected signal, annotations, record start times (s) and gaps.
 * @throws EdfFormatError When the bytes end before the requested records do, a TAL is malformed,
 *   the time-keeping TALs of an EDF+C file are not contiguous, or EDF+D records overlap.
 * @throws RangeError When an option is out of range or names a signal the file does not have.
 */
export function decodeEdfRecords(header: EdfHeader, bytes: Uint8Array, options: DecodeEdfRecordsOptions = {}): EdfRecords {
  const startRecord = options.startRecord ?? 0;
  const endRecord = options.endRecord ?? header.recordCount;
  checkRecordRange(header, startRecord, endRecord);
  const origin = options.bytesOrigin ?? 0;
  if (!Number.isInteger(origin) || origin < 0) throw new RangeError(`bytesOrigin must be an integer ≥ 0, got ${origin}`);
  const range = edfRecordByteRange(header, startRecord, endRecord);
  if (origin > range.start) {
    throw new RangeError(`bytesOrigin ${origin} is past the first requested record at file offset ${range.start}`);
  }
  if (origin + bytes.length < range.end) {
    const firstMissing = Math.max(startRecord, Math.floor((origin + bytes.length - header.headerBytes) / header.recordBytes));
    const at = header.headerBytes + firstMissing * header.recordBytes;
    throw new EdfFormatError(
      'data records',
      at,
      `data record ${firstMissing + 1} at offset ${at} is cut off: the bytes end at file offset ${origin + bytes.length}, ` + `${endRecord - startRecord} records need up to ${range.end}`,
    );
  }

  const count = endRecord - startRecord;
  const selected = selectChannels(header, options.channels);
  const signals: EdfSignalData[] = selected.map((s) => {
    const digital = new Int16Array(count * s.samplesPerRecord);
    copyDigital(header, s, bytes, range.start - origin, count, digital);
    const samples = new Float64Array(digital.length);
    calibrate(digital, s, samples);
    return { ...s, samplingRate: s.samplingRate!, samples };
  });

  const recordStarts = new Float64Array(count);
  const annotations: EdfAnnotation[] = [];
  const wantAnnotations = options.annotations ?? true;
  if (header.variant === 'EDF') {
    for (let r = 0; r < count; r++) recordStarts[r] = (startRecord + r) * header.recordDuration;
  } else {
    for (let r = 0; r < count; r++) {
      const recordOffset = range.start + r * header.recordBytes;
      header.annotationSignals.forEach((index, nth) => {
        if (nth > 0 && !wantAnnotations) return;
        const s = header.signals[index]!;
        const from = recordOffset - origin + s.recordByteOffset;
        const where = ` (data record ${startRecord + r + 1}, signal ${index + 1})`;
        const parsed = parseTals(bytes.subarray(from, from + 2 * s.samplesPerRecord), recordOffset + s.recordByteOffset, nth === 0, where);
        if (nth === 0) recordStarts[r] = parsed.recordStart!;
        // Not push(...): one record can hold more TALs than a call takes arguments.
        if (wantAnnotations) for (const a of parsed.annotations) annotations.push(a);
      });
    }
  }
  return { startRecord, endRecord, signals, annotations, recordStarts, gaps: checkTimekeeping(header, startRecord, recordStarts, options.previousRecordStart) };
}

/** The linear map from a signal's digital codes to physical values (EDF §2.1.3; Kemp et al. 1992). */
export interface EdfCalibration {
  digitalMinimum: number;
  /** (physmax − physmin)/(digmax − digmin) */
  gain: number;
  physicalMinimum: number;
}

/**
 * physical = (digital − digmin)·gain + physmin for `digital[0 … count)` into `out[0 … count)`. The
 * one place this expression is written: decoding an upload and reading back samples stored as
 * 16-bit codes both call it, so both give the same float64 bits.
 */
export function calibrate(digital: Int16Array, calibration: EdfCalibration, out: Float64Array, count = digital.length): void {
  const { digitalMinimum, gain, physicalMinimum } = calibration;
  for (let i = 0; i < count; i++) out[i] = (digital[i]! - digitalMinimum) * gain + physicalMinimum;
}

const LITTLE_ENDIAN = endianness() === 'LE';

/**
 * Copies the 16-bit little-endian digital codes of signal `s` in `count` consecutive data records
 * into `into`, record after record. `first` is the offset in `bytes` of the first record.
 */
export function copyDigital(header: EdfHeader, s: EdfSignalHeader, bytes: Uint8Array, first: number, count: number, into: Int16Array): void {
  const perRecord = s.samplesPerRecord;
  if (count === 0) return;
  if (LITTLE_ENDIAN && (bytes.byteOffset + first) % 2 === 0) {
    // Record and signal offsets are even (every field is a whole number of 2-byte samples), so
    // one Int16Array view from the first record to this signal's last code in the last one serves.
    const codes = new Int16Array(bytes.buffer, bytes.byteOffset + first, ((count - 1) * header.recordBytes + s.recordByteOffset) / 2 + perRecord);
    // A plain loop: a subarray per record cost more in allocations than the copy itself.
    const stride = header.recordBytes / 2;
    for (let r = 0, out = 0; r < count; r++) {
      for (let at = r * stride + s.recordByteOffset / 2, end = at + perRecord; at < end; at++, out++) into[out] = codes[at]!;
    }
    return;
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  for (let r = 0; r < count; r++) {
    let at = first + r * header.recordBytes + s.recordByteOffset;
    for (let k = 0; k < perRecord; k++, at += 2) into[r * perRecord + k] = view.getInt16(at, true);
  }
}

function checkTimekeeping(header: EdfHeader, startRecord: number, recordStarts: Float64Array, previousRecordStart?: number): EdfGap[] {
  const gaps: EdfGap[] = [];
  if (header.variant === 'EDF') return gaps;
  // The time-keeping TAL is the first TAL of the first annotation signal in each record.
  const talOffset = header.signals[header.annotationSignals[0]!]!.recordByteOffset;
  const fail = (r: number, detail: string): never => {
    const at = header.headerBytes + (startRecord + r) * header.recordBytes + talOffset;
    throw new EdfFormatError('annotation TAL', at, `time-keeping TAL of data record ${startRecord + r + 1} at offset ${at} ${detail}`);
  };
  if (startRecord === 0 && recordStarts.length > 0 && !(recordStarts[0]! >= 0 && recordStarts[0]! < 1)) {
    fail(0, `says +${recordStarts[0]} s; the first record starts within the first second (+0.X)`);
  }
  const duration = header.recordDuration;
  // Zero-duration records (annotation-only files) occupy no time, so continuity has no meaning.
  if (duration === 0) return gaps;
  // A gap shorter than half a sample is not a gap: it is rounding in the written onsets.
  const maxSamples = Math.max(...header.signals.filter((s) => !s.isAnnotation).map((s) => s.samplesPerRecord), 1);
  const tolerance = duration / maxSamples / 2;
  for (let r = previousRecordStart === undefined ? 1 : 0; r < recordStarts.length; r++) {
    const expected = (r === 0 ? previousRecordStart! : recordStarts[r - 1]!) + duration;
    const actual = recordStarts[r]!;
    if (actual < expected - tolerance) {
      fail(r, `says ${actual} s, before the previous record ends at ${expected} s`);
    }
    if (actual > expected + tolerance) {
      if (header.variant === 'EDF+C') fail(r, `says ${actual} s but an EDF+C record must start at ${expected} s`);
      gaps.push({ afterRecord: startRecord + r - 1, start: expected, end: actual });
    }
  }
  return gaps;
}
