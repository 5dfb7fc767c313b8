import { ByteWriter, ParquetWriter, type SchemaElement } from 'hyparquet-writer';
import type { Cell, Column, ColumnType, Row } from './columns.js';
import type { TableWriter } from './writer.js';

const PHYSICAL: Record<ColumnType, { type: 'DOUBLE' | 'INT32' | 'BYTE_ARRAY' | 'BOOLEAN'; converted_type?: 'UTF8' }> = {
  double: { type: 'DOUBLE' },
  integer: { type: 'INT32' },
  string: { type: 'BYTE_ARRAY', converted_type: 'UTF8' },
  boolean: { type: 'BOOLEAN' },
};

/** The Parquet schema of a table: every column OPTIONAL (null is an empty cell) and typed. */
export function parquetSchema(columns: readonly Column[]): SchemaElement[] {
  return [{ name: 'root', num_children: columns.length }, ...columns.map((c): SchemaElement => ({ name: c.name, repetition_type: 'OPTIONAL', ...PHYSICAL[c.type] }))];
}

// Thrift compact protocol: field 3 of FileMetaData (num_rows, i64 = 6) holding zigzag 0, then
// field 4 (row_groups, list = 9) with an empty list header. The writer types an empty list's
// elements as 0; strict readers (Arrow's) want struct (12) there and refuse the file.
const EMPTY_ROW_GROUPS = [0x16, 0x00, 0x19, 0x00];
const STRUCT_ELEMENTS = 0x0c;

/** Makes a file without rows readable everywhere: its empty row-group list gets struct elements. */
function markEmptyRowGroupList(file: Uint8Array, footer: number): void {
  for (let i = footer; i + EMPTY_ROW_GROUPS.length <= file.length; i++) {
    if (EMPTY_ROW_GROUPS.every((b, k) => file[i + k] === b)) {
      file[i + 3] = STRUCT_ELEMENTS;
      return;
    }
  }
  throw new Error('the Parquet footer of an empty table has no empty row-group list');
}

/**
 * Apache Parquet with typed columns (DOUBLE, INT32, UTF8, BOOLEAN), Snappy-compressed. Rows are
 * gathered into row groups of `rowGroupSize`; each full group is encoded and handed out at once,
 * so memory is bounded by one row group. The column list (with units and meanings) travels in the
 * file's key-value metadata under `rhythmetric.columns`.
 *
 * @param options.rowGroupSize - Rows per row group. @defaultValue 65536
 */
export function createParquetWriter(columns: readonly Column[], options: { rowGroupSize?: number } = {}): TableWriter<Uint8Array> {
  const groupSize = options.rowGroupSize ?? 65536;
  const bytes = new ByteWriter() as ByteWriter & { index: number };
  const parquet = new ParquetWriter({
    writer: bytes,
    schema: parquetSchema(columns),
    codec: 'SNAPPY',
    // Min/max statistics let query engines skip row groups, but cost about 40 % of the export time
    // (measured here), and tables are read whole by the statistics packages they are made for.
    statistics: false,
    kvMetadata: [{ key: 'rhythmetric.columns', value: JSON.stringify(columns) }],
    createdBy: 'rhythmetric',
  });
  let group: Cell[][] = columns.map(() => []);
  let rows = 0;
  let total = 0;
  // Takes what the encoder has written so far and empties its buffer (the file offset runs on).
  const drain = (): Uint8Array => {
    const out = bytes.getBytes().slice();
    bytes.index = 0;
    return out;
  };
  const flush = (): void => {
    if (rows === 0) return;
    void parquet.write({ columnData: columns.map((c, i) => ({ name: c.name, data: group[i]! })), rowGroupSize: rows });
    group = columns.map(() => []);
    rows = 0;
  };
  return {
    mediaType: 'application/vnd.apache.parquet',
    extension: 'parquet',
    write(row: Row) {
      for (let i = 0; i < row.length; i++) group[i]!.push(row[i]!);
      total++;
      if (++rows < groupSize) return null;
      flush();
      return drain();
    },
    end() {
      const empty = total === 0;
      flush();
      const footer = bytes.index;
      void parquet.finish();
      const out = drain();
      if (empty) markEmptyRowGroupList(out, footer);
      return out;
    },
  };
}
