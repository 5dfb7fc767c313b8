/**
 * Table export: rows per second from a record to CSV and to Parquet (target ≥ 200 000 rows/s for
 * CSV), and the peak memory of an export at two row counts (target: flat, since rows are encoded
 * as they come and handed out in chunks).
 *
 * Throughput uses an invented spectra-shaped record (64 channels × 501 bins × the mean and 30
 * epochs ≈ 10^6 rows) through tableRows and the writers into a sink that only counts bytes. Memory
 * runs each export in a child process on rows made one at a time (no record held), and reads the
 * child's peak resident set size.
 *
 * Standalone: `npx tsx bench/tables.ts`. Prints figures; never fails on time.
 */
import { spawnSync } from 'node:child_process';
import { performance } from 'node:perf_hooks';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { createRandom } from '../src/common/random.js';
import type { FeatureRecord } from '../src/engine/record.js';
import type { Row } from '../src/tables/columns.js';
import { createTableLayout, tableRows } from '../src/tables/rows.js';
import { createTableWriter, encodeTable, type TableFormat } from '../src/tables/writer.js';

const CHANNELS = 64;
const BINS = 501;
const EPOCHS = 30;

/** A record with the shape of a 64-channel Welch analysis at 500 Hz with perEpoch; the numbers are invented. */
function spectraRecord(): FeatureRecord {
  const random = createRandom(7);
  const frequencies = Array.from({ length: BINS }, (_, k) => k * 0.5);
  const channels = () => Array.from({ length: CHANNELS }, (_, c) => ({ name: `E${c + 1}`, psd: frequencies.map(() => random.uniform() * 10), bands: [], ratios: [] }));
  return {
    schema: 'rhythmetric.record/1',
    engineVersion: 'bench',
    recipe: { method: 'welch', id: 'rec_bench', confidence: null, features: {} },
    input: { signal: 'sig_bench', sha256: 'x', samplingRate: 500, channels: [], unit: 'uV', epochCount: EPOCHS, samplesPerEpoch: 1000 },
    result: { units: {}, frequencies, channels: channels(), epochs: Array.from({ length: EPOCHS }, (_, index) => ({ index, channels: channels() })), estimate: {}, warnings: [] },
    resultHash: 'f'.repeat(64),
    provenance: {},
  } as unknown as FeatureRecord;
}

function exportRows(format: TableFormat, columns: Parameters<typeof createTableWriter>[1], rows: Iterable<Row>): { rows: number; bytes: number; seconds: number } {
  let count = 0;
  let bytes = 0;
  const counted = (function* () {
    for (const row of rows) {
      count++;
      yield row;
    }
  })();
  const t0 = performance.now();
  for (const chunk of encodeTable(createTableWriter(format, columns), counted)) bytes += typeof chunk === 'string' ? Buffer.byteLength(chunk) : chunk.byteLength;
  return { rows: count, bytes, seconds: (performance.now() - t0) / 1000 };
}

/** Rows shaped like the spectra level, made one at a time. */
function* syntheticRows(count: number): Generator<Row> {
  const random = createRandom(11);
  for (let i = 0; i < count; i++) {
    const epoch = Math.floor(i / (CHANNELS * BINS));
    yield ['sig_bench', 'epoch', epoch, epoch * 2, null, `E${(Math.floor(i / BINS) % CHANNELS) + 1}`, (i % BINS) * 0.5, random.uniform() * 10, 'rec_bench', 'f'.repeat(64)];
  }
}

function child(format: TableFormat, count: number): void {
  const layout = createTableLayout(spectraRecord(), 'spectra');
  const result = exportRows(format, layout.columns, syntheticRows(count));
  process.stdout.write(JSON.stringify({ ...result, maxRssKiB: process.resourceUsage().maxRSS }));
}

export async function benchTables(): Promise<string[]> {
  const lines: string[] = [];
  const record = spectraRecord();
  const layout = createTableLayout(record, 'spectra');
  for (const format of ['csv', 'parquet'] as const) {
    exportRows(format, layout.columns, tableRows(layout, record)); // warm-up
    const best = [0, 1, 2].map(() => exportRows(format, layout.columns, tableRows(layout, record))).sort((a, b) => a.seconds - b.seconds)[0]!;
    lines.push(`${format}: ${best.rows} rows from a record in ${best.seconds.toFixed(2)} s = ${Math.round(best.rows / best.seconds)} rows/s, ${(best.bytes / 2 ** 20).toFixed(1)} MiB (best of 3)`);
  }
  const self = fileURLToPath(import.meta.url);
  for (const format of ['csv', 'parquet'] as const) {
    const peaks: string[] = [];
    for (const count of [100_000, 1_000_000, 3_000_000]) {
      const run = spawnSync(process.execPath, [...process.execArgv, self, '--memory', format, String(count)], { encoding: 'utf8' });
      if (run.status !== 0) throw new Error(`memory child failed: ${run.stderr}`);
      const r = JSON.parse(run.stdout) as { rows: number; seconds: number; maxRssKiB: number };
      peaks.push(`${r.rows} rows ${(r.maxRssKiB / 1024).toFixed(0)} MiB`);
    }
    lines.push(`${format} peak RSS of a whole process exporting made-up rows: ${peaks.join(', ')}`);
  }
  return lines;
}

const memory = process.argv.indexOf('--memory');
if (memory >= 0) {
  child(process.argv[memory + 1] as TableFormat, Number(process.argv[memory + 2]));
} else if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  for (const line of await benchTables()) console.log(line);
}
