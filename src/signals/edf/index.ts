export { EdfFormatError } from './errors.js';
export {
  ANNOTATION_LABEL,
  readEdfHeader,
  type EdfDateTime,
  type EdfHeader,
  type EdfSignalHeader,
  type EdfVariant,
  type ReadEdfHeaderOptions,
} from './header.js';
export {
  calibrate,
  copyDigital,
  decodeEdfRecords,
  edfRecordByteRange,
  type DecodeEdfRecordsOptions,
  type EdfCalibration,
  type EdfGap,
  type EdfRecords,
  type EdfSignalData,
} from './records.js';
export { parseEdf, type EdfFile, type ParseEdfOptions } from './parse.js';
export { encodeTal, parseTals, type EdfAnnotation, type ParsedTals } from './tal.js';
export {
  formatEdfNumber,
  writeEdf,
  type EdfWriteAnnotation,
  type EdfWriteSignal,
  type WriteEdfInput,
} from './write.js';
