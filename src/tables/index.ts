/** Feature tables: a record (and its study entry) becomes typed rows, written as CSV or Parquet. */
export { TABLE_LEVELS, RESERVED_COLUMN_NAMES, type Cell, type Column, type ColumnType, type Row, type TableLevel } from './columns.js';
export { createTableLayout, metadataColumns, tableLevels, tableRows, type EntryMetadata, type TableContext, type TableLayout, type TableLayoutOptions } from './rows.js';
export { createTableWriter, encodeTable, encodeTableAsync, TABLE_FORMATS, type TableFormat, type TableWriter } from './writer.js';
export { createCsvWriter } from './csv.js';
export { createParquetWriter } from './parquet.js';
export { tableColumnsMarkdown } from './docs.js';
