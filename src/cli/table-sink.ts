import { randomBytes } from 'node:crypto';
import { open, rename, rm, type FileHandle } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { DomainError } from '../common/errors.js';
import type { FeatureRecord } from '../engine/record.js';
import type { TableLevel } from '../tables/columns.js';
import { createTableLayout, tableRows, type TableLayout } from '../tables/rows.js';
import { createTableWriter, type TableFormat, type TableWriter } from '../tables/writer.js';
import { UsageError } from './output.js';

/**
 * One table over the records of several files (one recipe, so one layout), streamed as the records
 * come: to a temporary file renamed into place at the end, or to standard output.
 */
export function createTableSink(level: TableLevel, format: TableFormat, out: string | undefined) {
  if (!out && format === 'parquet' && process.stdout.isTTY) throw new UsageError('a Parquet table is binary: give --out PATH, or redirect standard output');
  let layout: TableLayout | null = null;
  let writer: TableWriter | null = null;
  let file: FileHandle | null = null;
  const temp = out ? join(dirname(out), `.${basename(out)}.${process.pid}.${randomBytes(4).toString('hex')}.part`) : null;

  async function emit(chunk: string | Uint8Array): Promise<void> {
    if (chunk.length === 0) return;
    if (file) await (typeof chunk === 'string' ? file.write(chunk) : file.write(chunk));
    else await new Promise<void>((done) => (process.stdout.write(chunk) ? done() : process.stdout.once('drain', done)));
  }

  return {
    async add(recordText: string): Promise<void> {
      const record = JSON.parse(recordText) as FeatureRecord;
      if (!layout) {
        try {
          layout = createTableLayout(record, level);
        } catch (error) {
          if (error instanceof DomainError) throw new UsageError(`--table ${level}: ${error.detail}`);
          throw error;
        }
        writer = createTableWriter(format, layout.columns);
        if (temp) file = await open(temp, 'w');
      }
      for (const row of tableRows(layout, record)) {
        const chunk = writer!.write(row);
        if (chunk !== null) await emit(chunk);
      }
    },
    /** Writes the end of the table and puts the file in place (nothing when no record came). */
    async finish(): Promise<void> {
      if (!writer) return;
      await emit(writer.end());
      if (file && temp && out) {
        await file.close();
        file = null;
        await rename(temp, out);
      }
    },
    /** Leaves nothing behind: the partial file is removed. */
    async abandon(): Promise<void> {
      await file?.close();
      file = null;
      if (temp) await rm(temp, { force: true });
    },
  };
}
