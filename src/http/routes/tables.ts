import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { TABLE_LEVELS } from '../../tables/columns.js';
import { tableColumnsMarkdown } from '../../tables/docs.js';
import { createTableLayout, tableLevels, tableRows } from '../../tables/rows.js';
import { TABLE_FORMATS } from '../../tables/writer.js';
import type { AppDeps } from '../app.js';
import { tenantOf } from '../auth.js';
import { requireRecord } from '../job-access.js';
import { IdParams, problemResponse } from '../schemas.js';
import { chooseTableFormat, sendTable } from '../table-response.js';

/** Query of the table routes (the run-level table takes the same). */
export const TableQuery = z.strictObject({
  level: z.enum(TABLE_LEVELS).optional().describe('the grain of a row; default: the first level the record gives (bands for spectra, summary for time–frequency, pair-bands for connectivity)'),
  format: z.enum(TABLE_FORMATS).optional().describe('csv or parquet; default: from the Accept header, else csv'),
});

/** The 200 response of a table route, documented for both media types. */
export const TABLE_RESPONSE = {
  description: 'the table, streamed: RFC 4180 CSV with a header row, or Apache Parquet (typed columns, Snappy)',
  content: {
    'text/csv': { schema: z.string() },
    'application/vnd.apache.parquet': { schema: z.string().describe('binary') },
  },
};

export const TABLE_DESCRIPTION = [
  'A tidy table of the record: `?level=` chooses the grain of a row, `?format=` (or `Accept: text/csv` / `application/vnd.apache.parquet`) the format. Numbers are written so that they read back to the same double; an empty CSV cell (a Parquet null) means null. Rows for the mean come first, then the means per event label, then each epoch when the recipe asked for `perEpoch`.',
  '',
  tableColumnsMarkdown(),
].join('\n');

export const tableRoutes =
  (deps: AppDeps): FastifyPluginAsyncZod =>
  async (app) => {
    const { store, queue } = deps;
    app.get(
      '/v1/jobs/:id/table',
      {
        schema: {
          summary: "The job's record as a table (CSV or Parquet)",
          description: TABLE_DESCRIPTION,
          tags: ['jobs'],
          params: IdParams,
          querystring: TableQuery,
          response: {
            200: TABLE_RESPONSE,
            400: problemResponse('unknown level or format (the detail lists the allowed ones)'),
            404: problemResponse('unknown job'),
            406: problemResponse('Accept allows neither CSV nor Parquet'),
            409: problemResponse('the job has not succeeded'),
            422: problemResponse('the record cannot give this level; `levels` lists those it gives'),
          },
        },
      },
      async (request, reply) => {
        const format = chooseTableFormat(request.query.format, request.headers.accept);
        const record = await requireRecord(queue, store, request.params.id, tenantOf(request), 'its table exists');
        const level = request.query.level ?? tableLevels(record)[0] ?? 'bands';
        const layout = createTableLayout(record, level);
        request.log.info({ jobId: request.params.id, level, format }, 'table requested');
        return sendTable(reply, {
          format,
          columns: layout.columns,
          fileStem: `${request.params.id}-${level}`,
          batches: (async function* () {
            yield tableRows(layout, record);
          })(),
        });
      },
    );
  };
