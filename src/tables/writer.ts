import type { Column, Row } from './columns.js';
import { createCsvWriter } from './csv.js';
import { createParquetWriter } from './parquet.js';

/** The table formats; `?format=` and the CLI's `--format` take these names. */
export const TABLE_FORMATS = ['csv', 'parquet'] as const;
export type TableFormat = (typeof TABLE_FORMATS)[number];

/**
 * A streaming encoder: rows go in one at a time, and a chunk comes out whenever enough has
 * accumulated (null otherwise); `end` gives the last chunk. Memory is bounded by the chunk or row
 * group size, never by the row count.
 */
export interface TableWriter<T extends string | Uint8Array = string | Uint8Array> {
  readonly mediaType: string;
  readonly extension: string;
  write(row: Row): T | null;
  end(): T;
}

export function createTableWriter(format: TableFormat, columns: readonly Column[]): TableWriter {
  return format === 'csv' ? createCsvWriter(columns) : createParquetWriter(columns);
}

/** Encodes rows into chunks as they come (for files, pipes and HTTP responses alike). */
export function* encodeTable<T extends string | Uint8Array>(writer: TableWriter<T>, rows: Iterable<Row>): Generator<T> {
  for (const row of rows) {
    const chunk = writer.write(row);
    if (chunk !== null) yield chunk;
  }
  yield writer.end();
}

/** {@link encodeTable} over rows that arrive asynchronously (records read from a store one by one). */
export async function* encodeTableAsync<T extends string | Uint8Array>(writer: TableWriter<T>, rows: AsyncIterable<Iterable<Row>>): AsyncGenerator<T> {
  for await (const batch of rows) {
    for (const row of batch) {
      const chunk = writer.write(row);
      if (chunk !== null) yield chunk;
    }
  }
  yield writer.end();
}
