import { Readable } from 'node:stream';
import type { FastifyReply } from 'fastify';
import type { Column, Row } from '../tables/columns.js';
import { createTableWriter, encodeTableAsync, TABLE_FORMATS, type TableFormat } from '../tables/writer.js';
import { ProblemError } from './problem.js';

const MEDIA_TYPES: Record<TableFormat, string> = { csv: 'text/csv', parquet: 'application/vnd.apache.parquet' };

/**
 * The table format: `?format=` when given, else the best of the Accept header (RFC 9110 §12.5.1,
 * quality values included), else CSV.
 * @throws ProblemError `not-acceptable` when Accept allows neither format.
 */
export function chooseTableFormat(format: TableFormat | undefined, accept: string | undefined): TableFormat {
  if (format) return format;
  if (!accept || accept.trim() === '') return 'csv';
  let best: { format: TableFormat; q: number } | null = null;
  for (const part of accept.split(',')) {
    const [range = '', ...params] = part.split(';').map((s) => s.trim().toLowerCase());
    const qParam = params.find((p) => p.startsWith('q='));
    const q = qParam ? Number(qParam.slice(2)) : 1;
    if (!(q > 0)) continue;
    for (const candidate of TABLE_FORMATS) {
      const [type, subtype] = MEDIA_TYPES[candidate].split('/');
      if (range === '*/*' || range === `${type}/*` || range === `${type}/${subtype}`) {
        // An exact media range outranks a wildcard of equal quality; CSV wins ties between wildcards.
        const score = q + (range.includes('*') ? 0 : 0.0001);
        if (!best || score > best.q) best = { format: candidate, q: score };
      }
    }
  }
  if (!best) {
    throw new ProblemError(
      'not-acceptable',
      `Accept "${accept}" allows no table format; ask for ${Object.values(MEDIA_TYPES).join(' or ')}, or give ?format=${TABLE_FORMATS.join('|')}`,
      '/headers/accept',
      {},
      { formats: Object.values(MEDIA_TYPES) },
    );
  }
  return best.format;
}

/**
 * Streams a table: rows are encoded as they come and sent in chunks, so the response never holds
 * the whole table. `batches` yields one batch of rows per record.
 */
export function sendTable(reply: FastifyReply, options: { format: TableFormat; columns: readonly Column[]; fileStem: string; batches: AsyncIterable<Iterable<Row>> }): FastifyReply {
  const writer = createTableWriter(options.format, options.columns);
  async function* bytes() {
    for await (const chunk of encodeTableAsync(writer, options.batches)) {
      yield typeof chunk === 'string' ? Buffer.from(chunk, 'utf8') : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    }
  }
  return reply
    .type(writer.mediaType)
    .header('content-disposition', `attachment; filename="${options.fileStem}.${writer.extension}"`)
    .header('vary', 'accept')
    .send(Readable.from(bytes(), { objectMode: false }));
}
