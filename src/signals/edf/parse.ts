import { EdfFormatError } from './errors.js';
import { readEdfHeader, type EdfHeader, type ReadEdfHeaderOptions } from './header.js';
import { decodeEdfRecords, type EdfGap, type EdfSignalData } from './records.js';
import type { EdfAnnotation } from './tal.js';

export interface ParseEdfOptions extends ReadEdfHeaderOptions {
  /**
   * Ordinary signals to decode, by index into `header.signals` or by label.
   * @defaultValue every ordinary signal
   */
  channels?: readonly (number | string)[];
}

export interface EdfFile {
  header: EdfHeader;
  /** Ordinary signals with their calibrated physical samples. */
  signals: EdfSignalData[];
  /** EDF+ annotations (time-keeping TALs excluded); empty for plain EDF. */
  annotations: EdfAnnotation[];
  /** Start of each data record in seconds from the file start. */
  recordStarts: Float64Array;
  /** False only for an EDF+D file whose records have gaps between them. */
  contiguous: boolean;
  /** The gaps of an EDF+D file, so a caller can refuse or handle them. */
  gaps: EdfGap[];
}

/**
 * Parses a whole EDF or EDF+ file held in memory.
 *
 * @param bytes - The complete file.
 * @param options - See {@link ParseEdfOptions}.
 * @returns Header, calibrated ordinary signals, annotations and data-record timing.
 * @throws EdfFormatError For any malformed field, a file length that does not match the header's
 *   record count and size, or malformed annotations; the message names the field and byte offset.
 * @throws RangeError When `options.channels` names a signal the file does not have.
 *
 * References: Kemp et al. (1992); Kemp & Olivan (2003), EDF+ §2.
 */
export function parseEdf(bytes: Uint8Array, options: ParseEdfOptions = {}): EdfFile {
  const header = readEdfHeader(bytes, options);
  const expected = header.headerBytes + header.recordCount * header.recordBytes;
  if (bytes.length !== expected) {
    const short = bytes.length < expected;
    throw new EdfFormatError(
      'data record count',
      236,
      `data record count at offset 236 is ${header.recordCount} with ${header.recordBytes} bytes per record, so the ` +
        `file should be ${expected} bytes, but it is ${bytes.length} (${short ? 'truncated' : 'trailing bytes'})`,
    );
  }
  const records = decodeEdfRecords(header, bytes, options.channels === undefined ? {} : { channels: options.channels });
  return {
    header,
    signals: records.signals,
    annotations: records.annotations,
    recordStarts: records.recordStarts,
    contiguous: records.gaps.length === 0,
    gaps: records.gaps,
  };
}
