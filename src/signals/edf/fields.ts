import { EdfFormatError } from './errors.js';

/** Fixed part of the header: name, offset, width (Kemp et al. 1992). */
export const FIXED_FIELDS = {
  version: { name: 'version', offset: 0, width: 8 },
  patientId: { name: 'local patient identification', offset: 8, width: 80 },
  recordingId: { name: 'local recording identification', offset: 88, width: 80 },
  startDate: { name: 'start date', offset: 168, width: 8 },
  startTime: { name: 'start time', offset: 176, width: 8 },
  headerBytes: { name: 'header byte count', offset: 184, width: 8 },
  reserved: { name: 'reserved', offset: 192, width: 44 },
  recordCount: { name: 'data record count', offset: 236, width: 8 },
  recordDuration: { name: 'data record duration', offset: 244, width: 8 },
  signalCount: { name: 'signal count', offset: 252, width: 4 },
} as const;

export const FIXED_HEADER_BYTES = 256;
export const SIGNAL_HEADER_BYTES = 256;

/** Per-signal fields, in file order; each is repeated ns times before the next starts. */
export const SIGNAL_FIELDS = [
  { key: 'label', name: 'label', width: 16 },
  { key: 'transducer', name: 'transducer type', width: 80 },
  { key: 'physicalDimension', name: 'physical dimension', width: 8 },
  { key: 'physicalMinimum', name: 'physical minimum', width: 8 },
  { key: 'physicalMaximum', name: 'physical maximum', width: 8 },
  { key: 'digitalMinimum', name: 'digital minimum', width: 8 },
  { key: 'digitalMaximum', name: 'digital maximum', width: 8 },
  { key: 'prefiltering', name: 'prefiltering', width: 80 },
  { key: 'samplesPerRecord', name: 'samples per data record', width: 8 },
  { key: 'reserved', name: 'signal reserved', width: 32 },
] as const;

export type SignalFieldKey = (typeof SIGNAL_FIELDS)[number]['key'];

/** Byte offset of signal `index`'s copy of a per-signal field, for a header with `signalCount` signals. */
export function signalFieldOffset(key: SignalFieldKey, index: number, signalCount: number): number {
  let offset = FIXED_HEADER_BYTES;
  for (const field of SIGNAL_FIELDS) {
    if (field.key === key) return offset + index * field.width;
    offset += field.width * signalCount;
  }
  throw new RangeError(`unknown signal field ${key}`);
}

export interface FieldRef {
  name: string;
  offset: number;
  width: number;
}

/**
 * Reads an ASCII header field without its padding. The spec allows only printable ASCII (32..126);
 * `allowNonAscii` reads other bytes as Latin-1 for files from writers that ignore this.
 */
export function readText(bytes: Uint8Array, field: FieldRef, allowNonAscii: boolean): string {
  let text = '';
  for (let i = 0; i < field.width; i++) {
    const byte = bytes[field.offset + i];
    if (byte === undefined) {
      throw new EdfFormatError(field.name, field.offset, `${field.name} at offset ${field.offset} is cut off: the file ends at byte ${bytes.length}`);
    }
    if ((byte < 32 || byte > 126) && !allowNonAscii) {
      throw new EdfFormatError(
        field.name,
        field.offset,
        `${field.name} at offset ${field.offset} holds byte 0x${byte.toString(16).padStart(2, '0')} at offset ` + `${field.offset + i}; header fields are printable ASCII`,
      );
    }
    text += String.fromCharCode(byte);
  }
  return text.trimEnd();
}

const INTEGER = /^[+-]?\d+$/;
// Plain decimal notation only: the spec's numbers are ASCII digits with an optional sign and point.
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)$/;

function parseNumberField(text: string, field: FieldRef, pattern: RegExp, what: string): number {
  const trimmed = text.trim();
  if (!pattern.test(trimmed)) {
    const shown = trimmed === '' ? 'empty' : `"${trimmed}"`;
    throw new EdfFormatError(field.name, field.offset, `${field.name} at offset ${field.offset} is ${shown}, not ${what}`);
  }
  return Number(trimmed);
}

export function parseIntegerField(text: string, field: FieldRef): number {
  return parseNumberField(text, field, INTEGER, 'an integer');
}

export function parseDecimalField(text: string, field: FieldRef): number {
  return parseNumberField(text, field, DECIMAL, 'a decimal number');
}

export function fail(field: FieldRef, detail: string): never {
  throw new EdfFormatError(field.name, field.offset, `${field.name} at offset ${field.offset} ${detail}`);
}
