import type { Cell, Column, Row } from './columns.js';
import type { TableWriter } from './writer.js';

// RFC 4180 §2 rule 6 (docs/references.md §9): fields holding a comma, a double quote or a line break are enclosed in quotes.
const NEEDS_QUOTES = /[",\r\n]/;

/** One CSV field: RFC 4180 §2 rules 6–7 for text, shortest round-trip digits for numbers. */
export function csvField(cell: Cell): string {
  if (cell === null) return '';
  if (typeof cell === 'number') {
    // String(n) is the shortest text that reads back to the same double (ECMA-262 Number::toString),
    // except that it writes −0 as "0".
    if (!Number.isFinite(cell)) return '';
    return Object.is(cell, -0) ? '-0' : String(cell);
  }
  if (typeof cell === 'boolean') return cell ? 'true' : 'false';
  return NEEDS_QUOTES.test(cell) ? `"${cell.replaceAll('"', '""')}"` : cell;
}

/** One CSV record with its CRLF line break (RFC 4180 §2 rule 1). */
export function csvLine(cells: readonly Cell[]): string {
  let line = '';
  for (let i = 0; i < cells.length; i++) line += (i === 0 ? '' : ',') + csvField(cells[i]!);
  return `${line}\r\n`;
}

/**
 * RFC 4180 CSV: a header row of the column names, `.` as the decimal point, an empty field for
 * null, CRLF line breaks. Text is buffered up to `chunkChars` characters and handed out in chunks,
 * so memory does not grow with the row count.
 *
 * @param columns - The table's columns (their names make the header).
 * @param options.chunkChars - Characters per chunk. @defaultValue 65536
 */
export function createCsvWriter(columns: readonly Column[], options: { chunkChars?: number } = {}): TableWriter<string> {
  const limit = options.chunkChars ?? 65536;
  let buffer = csvLine(columns.map((c) => c.name));
  return {
    mediaType: 'text/csv; charset=utf-8; header=present',
    extension: 'csv',
    write(row: Row) {
      buffer += csvLine(row);
      if (buffer.length < limit) return null;
      const chunk = buffer;
      buffer = '';
      return chunk;
    },
    end() {
      const chunk = buffer;
      buffer = '';
      return chunk;
    },
  };
}
