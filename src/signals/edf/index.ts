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
  decodeEdfRecords,
  edfRecordByteRange,
  type DecodeEdfRecordsOptions,
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
