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
    kvMetadata: [{ key: 'rhythmetric.columns', value: JSON.stringify(columns) }],
    createdBy: 'rhythmetric',
  });
  let group: Cell[][] = columns.map(() => []);
  let rows = 0;
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
      if (++rows < groupSize) return null;
      flush();
      return drain();
    },
    end() {
      flush();
      void parquet.finish();
      return drain();
    },
  };
}
