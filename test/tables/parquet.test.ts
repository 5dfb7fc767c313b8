import { tableFromIPC, type Table } from 'apache-arrow';
import { Compression, ParquetFile, readParquet } from 'parquet-wasm/node';
import { describe, expect, it } from 'vitest';
import type { Cell, Column, TableLevel } from '../../src/tables/columns.js';
import { createParquetWriter } from '../../src/tables/parquet.js';
import { createTableLayout, tableRows } from '../../src/tables/rows.js';
import { encodeTable } from '../../src/tables/writer.js';
import { connectivityRecord, fullWelchRecord } from './records.js';
import type { FeatureRecord } from '../../src/engine/record.js';

// The files are written with hyparquet-writer and read back with parquet-wasm, the Rust Apache
// Parquet implementation compiled to WebAssembly: an independent reader, sharing no code with the
// writer. Its Arrow output is decoded with apache-arrow.
function writeAndRead(record: FeatureRecord, level: TableLevel, rowGroupSize: number) {
  const layout = createTableLayout(record, level, {
    entry: true,
    metadata: [
      { name: 'subject', type: 'string' },
      { name: 'age', type: 'double' },
    ],
  });
  const context = { entryId: 'ent_7', metadata: { subject: 'p07', age: 29.5 } };
  const rows = [...tableRows(layout, record, context)];
  const chunks = [...encodeTable(createParquetWriter(layout.columns, { rowGroupSize }), rows)];
  const bytes = new Uint8Array(Buffer.concat(chunks));
  const table: Table = tableFromIPC(readParquet(bytes).intoIPCStream());
  return { layout, rows, chunks, bytes, table };
}

const ARROW_TYPES: Record<Column['type'], string> = { double: 'Float64', integer: 'Int32', string: 'Utf8', boolean: 'Bool' };

function expectSameTable(columns: readonly Column[], rows: Cell[][], table: Table): void {
  expect(table.numRows).toBe(rows.length);
  expect(table.schema.fields.map((f) => [f.name, String(f.type)])).toEqual(columns.map((c) => [c.name, ARROW_TYPES[c.type]]));
  columns.forEach((column, j) => {
    const vector = table.getChildAt(j)!;
    for (let i = 0; i < rows.length; i++) {
      const expected = rows[i]![j]!;
      const actual = vector.get(i) as Cell;
      if (!Object.is(actual, expected)) expect(actual, `row ${i}, column ${column.name}`).toBe(expected);
    }
  });
}

describe('when a table is written as Parquet', () => {
  const welch = fullWelchRecord();

  it('should be read back by an independent reader with the same typed values, nulls included, across row groups', () => {
    const { layout, rows, chunks, table } = writeAndRead(welch, 'spectra', 1000);
    expect(rows.length).toBeGreaterThan(5000);
    // One chunk per full row group, then the last group and the footer.
    expect(chunks.length).toBe(Math.floor(rows.length / 1000) + 1);
    expectSameTable(layout.columns, rows, table);
  });

  it('should keep features, booleans and integers typed', () => {
    const { layout, rows, table } = writeAndRead(welch, 'features', 64);
    expectSameTable(layout.columns, rows, table);
  });

  it('should write pair rows of a connectivity record', () => {
    const { layout, rows, table } = writeAndRead(connectivityRecord(), 'pair-spectra', 100);
    expectSameTable(layout.columns, rows, table);
  });

  it('should compress every column chunk with Snappy and say so in the file metadata', async () => {
    const { bytes } = writeAndRead(welch, 'bands', 100);
    const file = await ParquetFile.fromFile(new Blob([bytes]));
    const groups = file.metadata().rowGroups();
    expect(groups.length).toBe(Math.ceil((7 * 8 * 5) / 100));
    for (const g of groups) for (const c of g.columns()) expect(c.compression()).toBe(Compression.SNAPPY);
  });

  it('should give a valid file with the schema and no rows for an empty table', () => {
    const layout = createTableLayout(welch, 'bands');
    const bytes = new Uint8Array(Buffer.concat([...encodeTable(createParquetWriter(layout.columns), [])]));
    const table = tableFromIPC(readParquet(bytes).intoIPCStream());
    expect(table.numRows).toBe(0);
    expect(table.schema.fields.map((f) => f.name)).toEqual(layout.columns.map((c) => c.name));
  });
});
