import { EdfFormatError } from './errors.js';
import {
  FIXED_FIELDS,
  FIXED_HEADER_BYTES,
  SIGNAL_FIELDS,
  SIGNAL_HEADER_BYTES,
  fail,
  parseDecimalField,
  parseIntegerField,
  readText,
  signalFieldOffset,
  type FieldRef,
  type SignalFieldKey,
} from './fields.js';

/** Label that marks an EDF+ annotations signal (Kemp & Olivan 2003, §2.2.1). */
export const ANNOTATION_LABEL = 'EDF Annotations';

/** Local date and time of the recording start, as the header states it (whole seconds). */
export interface EdfDateTime {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

export type EdfVariant = 'EDF' | 'EDF+C' | 'EDF+D';

export interface EdfSignalHeader {
  /** Position among all ns signals of the file (annotation signals included). */
  index: number;
  label: string;
  transducer: string;
  physicalDimension: string;
  physicalMinimum: number;
  physicalMaximum: number;
  digitalMinimum: number;
  digitalMaximum: number;
  prefiltering: string;
  samplesPerRecord: number;
  reserved: string;
  /** True for an EDF+ "EDF Annotations" signal; its samples are TAL bytes, not numbers. */
  isAnnotation: boolean;
  /** samplesPerRecord / recordDuration in Hz; null for annotation signals and zero-duration records. */
  samplingRate: number | null;
  /** Physical units per digital step: (physmax − physmin)/(digmax − digmin); negative gain is allowed. */
  gain: number;
  /** Where this signal's samples start inside one data record, in bytes. */
  recordByteOffset: number;
}

export interface EdfHeader {
  version: string;
  patientId: string;
  recordingId: string;
  /** The raw dd.mm.yy and hh.mm.ss fields. */
  startDateField: string;
  startTimeField: string;
  /** Parsed start; years 85–99 are 1985–1999 and 00–84 are 2000–2084 (EDF+ §2.1.3). */
  start: EdfDateTime;
  headerBytes: number;
  reserved: string;
  variant: EdfVariant;
  recordCount: number;
  /** Seconds per data record. Zero only in an EDF+ file that holds annotations alone. */
  recordDuration: number;
  signalCount: number;
  signals: EdfSignalHeader[];
  /** Bytes of one data record: 2·Σ samplesPerRecord. */
  recordBytes: number;
  /** Indexes (into `signals`) of the annotation signals, in file order. */
  annotationSignals: number[];
}

export interface ReadEdfHeaderOptions {
  /**
   * Read bytes outside printable ASCII in text fields as Latin-1 instead of refusing the file.
   * @defaultValue false
   */
  allowNonAsciiText?: boolean;
}

const MAX_INT16 = 32767;
const MIN_INT16 = -32768;

function parseStart(dateText: string, timeText: string): EdfDateTime {
  const dateField = FIXED_FIELDS.startDate;
  const timeField = FIXED_FIELDS.startTime;
  const date = /^(\d\d)\.(\d\d)\.(\d\d)$/.exec(dateText);
  if (!date) fail(dateField, `is "${dateText}", not dd.mm.yy`);
  const time = /^(\d\d)\.(\d\d)\.(\d\d)$/.exec(timeText);
  if (!time) fail(timeField, `is "${timeText}", not hh.mm.ss`);
  const day = Number(date[1]);
  const month = Number(date[2]);
  const yy = Number(date[3]);
  const year = yy >= 85 ? 1900 + yy : 2000 + yy;
  const daysInMonth = month >= 1 && month <= 12 ? new Date(Date.UTC(year, month, 0)).getUTCDate() : 0;
  if (month < 1 || month > 12) fail(dateField, `is "${dateText}": month ${month} is not 1–12`);
  if (day < 1 || day > daysInMonth) {
    fail(dateField, `is "${dateText}": day ${day} does not exist in ${year}-${String(month).padStart(2, '0')}`);
  }
  const hour = Number(time[1]);
  const minute = Number(time[2]);
  const second = Number(time[3]);
  if (hour > 23 || minute > 59 || second > 59) fail(timeField, `is "${timeText}", not a time of day`);
  return { year, month, day, hour, minute, second };
}

function parseVariant(reserved: string): EdfVariant {
  if (!reserved.startsWith('EDF+')) return 'EDF';
  if (reserved.startsWith('EDF+C')) return 'EDF+C';
  if (reserved.startsWith('EDF+D')) return 'EDF+D';
  return fail(FIXED_FIELDS.reserved, `starts "${reserved.slice(0, 5)}"; EDF+ files say EDF+C or EDF+D`);
}

function requireBytes(bytes: Uint8Array, needed: number, field: FieldRef, why: string): void {
  if (bytes.length < needed) {
    throw new EdfFormatError(field.name, Math.min(bytes.length, field.offset), `${why}: ${needed} bytes are needed but only ${bytes.length} are present`);
  }
}

/**
 * Reads and validates the header record of an EDF or EDF+ file.
 *
 * Only the first 256 + 256·ns bytes are needed, so a caller can read a large file's header first and
 * its data records piecewise with {@link decodeEdfRecords}.
 *
 * @param bytes - The file, or at least its header record.
 * @param options - See {@link ReadEdfHeaderOptions}.
 * @returns The parsed header with derived sampling rates, calibration and record layout.
 * @throws EdfFormatError When any field is missing, non-numeric, out of range or inconsistent; the
 *   error names the field and its byte offset.
 *
 * References: B. Kemp et al. (1992), "A simple format for exchange of digitized polygraphic
 * recordings", Electroencephalogr. Clin. Neurophysiol. 82:391–393; B. Kemp & J. Olivan (2003),
 * "European data format 'plus' (EDF+)", Clin. Neurophysiol. 114:1755–1761.
 */
export function readEdfHeader(bytes: Uint8Array, options: ReadEdfHeaderOptions = {}): EdfHeader {
  const lenient = options.allowNonAsciiText ?? false;
  requireBytes(bytes, FIXED_HEADER_BYTES, FIXED_FIELDS.version, 'the fixed header record is cut off');
  const f = FIXED_FIELDS;

  const versionRaw = readText(bytes, f.version, false);
  if (versionRaw !== '0') fail(f.version, `is "${versionRaw}"; EDF files say "0"`);

  const patientId = readText(bytes, f.patientId, lenient);
  const recordingId = readText(bytes, f.recordingId, lenient);
  const startDateField = readText(bytes, f.startDate, false);
  const startTimeField = readText(bytes, f.startTime, false);
  const start = parseStart(startDateField, startTimeField);
  const headerBytes = parseIntegerField(readText(bytes, f.headerBytes, false), f.headerBytes);
  const reserved = readText(bytes, f.reserved, lenient);
  const variant = parseVariant(reserved);
  const recordCount = parseIntegerField(readText(bytes, f.recordCount, false), f.recordCount);
  const recordDuration = parseDecimalField(readText(bytes, f.recordDuration, false), f.recordDuration);
  const signalCount = parseIntegerField(readText(bytes, f.signalCount, false), f.signalCount);

  if (recordCount === -1) fail(f.recordCount, 'is −1: the file was not closed after recording');
  if (recordCount < 0) fail(f.recordCount, `is ${recordCount}, below 0`);
  if (recordDuration < 0) fail(f.recordDuration, `is ${recordDuration} s, below 0`);
  if (signalCount < 1) fail(f.signalCount, `is ${signalCount}; a file needs at least one signal`);
  const expectedHeader = FIXED_HEADER_BYTES + SIGNAL_HEADER_BYTES * signalCount;
  if (headerBytes !== expectedHeader) {
    fail(f.headerBytes, `is ${headerBytes} but ${signalCount} signal${signalCount === 1 ? '' : 's'} need ${expectedHeader}`);
  }
  requireBytes(bytes, expectedHeader, f.signalCount, `the header of ${signalCount} signals is cut off`);

  const raw = (key: SignalFieldKey, index: number): { text: string; ref: FieldRef } => {
    const spec = SIGNAL_FIELDS.find((s) => s.key === key)!;
    const ref = {
      name: `${spec.name} of signal ${index + 1}`,
      offset: signalFieldOffset(key, index, signalCount),
      width: spec.width,
    };
    const numeric = key.endsWith('imum') || key === 'samplesPerRecord';
    return { text: readText(bytes, ref, lenient && !numeric), ref };
  };

  const signals: EdfSignalHeader[] = [];
  const annotationSignals: number[] = [];
  let recordBytes = 0;
  for (let i = 0; i < signalCount; i++) {
    const label = raw('label', i).text;
    const transducer = raw('transducer', i).text;
    const physicalDimension = raw('physicalDimension', i).text;
    const physMin = raw('physicalMinimum', i);
    const physMax = raw('physicalMaximum', i);
    const digMin = raw('digitalMinimum', i);
    const digMax = raw('digitalMaximum', i);
    const physicalMinimum = parseDecimalField(physMin.text, physMin.ref);
    const physicalMaximum = parseDecimalField(physMax.text, physMax.ref);
    const digitalMinimum = parseIntegerField(digMin.text, digMin.ref);
    const digitalMaximum = parseIntegerField(digMax.text, digMax.ref);
    const prefiltering = raw('prefiltering', i).text;
    const spr = raw('samplesPerRecord', i);
    const samplesPerRecord = parseIntegerField(spr.text, spr.ref);
    const signalReserved = raw('reserved', i).text;

    for (const [value, ref] of [
      [digitalMinimum, digMin.ref],
      [digitalMaximum, digMax.ref],
    ] as const) {
      if (value < MIN_INT16 || value > MAX_INT16) fail(ref, `is ${value}, outside the 16-bit range −32768..32767`);
    }
    if (digitalMaximum <= digitalMinimum) {
      fail(digMax.ref, `is ${digitalMaximum}, not above the digital minimum ${digitalMinimum}`);
    }
    if (physicalMaximum === physicalMinimum) {
      fail(physMax.ref, `equals the physical minimum ${physicalMinimum}, so the gain is undefined`);
    }
    if (samplesPerRecord <= 0) fail(spr.ref, `is ${samplesPerRecord}; it must be at least 1`);

    const isAnnotation = variant !== 'EDF' && label === ANNOTATION_LABEL;
    if (isAnnotation) annotationSignals.push(i);
    else if (recordDuration === 0) {
      fail(f.recordDuration, `is 0 s, allowed only when every signal is an annotation signal (signal ${i + 1} is "${label}")`);
    }
    signals.push({
      index: i,
      label,
      transducer,
      physicalDimension,
      physicalMinimum,
      physicalMaximum,
      digitalMinimum,
      digitalMaximum,
      prefiltering,
      samplesPerRecord,
      reserved: signalReserved,
      isAnnotation,
      samplingRate: isAnnotation || recordDuration === 0 ? null : samplesPerRecord / recordDuration,
      gain: (physicalMaximum - physicalMinimum) / (digitalMaximum - digitalMinimum),
      recordByteOffset: recordBytes,
    });
    recordBytes += 2 * samplesPerRecord;
  }
  if (variant !== 'EDF' && annotationSignals.length === 0) {
    fail(f.reserved, `says ${variant} but no signal is labelled "${ANNOTATION_LABEL}"`);
  }

  return {
    version: versionRaw,
    patientId,
    recordingId,
    startDateField,
    startTimeField,
    start,
    headerBytes,
    reserved,
    variant,
    recordCount,
    recordDuration,
    signalCount,
    signals,
    recordBytes,
    annotationSignals,
  };
}
