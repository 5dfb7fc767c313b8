import { createHash } from 'node:crypto';
import { mkdir, readFile } from 'node:fs/promises';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { ApiProblemError, type RhythmetricClient } from '../client/index.js';
import { DomainError } from '../common/errors.js';
import { hashCanonical } from '../common/hash.js';
import { ENGINE_VERSION } from '../engine/version.js';
import { isRecipeRefusal } from '../recipes/errors.js';
import { normalizeRecipe } from '../recipes/normalize.js';
import { parseCsv, readCsvManifest, type EntryInput } from '../studies/entries.js';
import type { TableLevel } from '../tables/columns.js';
import { createTableLayout, metadataColumns, tableRows, type TableLayout } from '../tables/rows.js';
import { createTableWriter, type TableFormat } from '../tables/writer.js';
import type { FeatureRecord } from '../engine/record.js';
import { createAnalyzer, inputOf, uploadInput, type InputOptions } from './analyze.js';
import { LocalInputError } from './local-engine.js';
import { EXIT, UsageError, writeFileAtomic, type Terminal } from './output.js';
import { clientFor, loadRecipe, type ServerOptions } from './sources.js';

export interface StudyRunOptions extends InputOptions, ServerOptions {
  recipe: string;
  out?: string | undefined;
  threads?: number | undefined;
  table?: TableLevel | undefined;
  format?: TableFormat | undefined;
}

/** A manifest row: the file it names and the entry the studies manifest format reads from it. */
interface FileEntry {
  /** the file's path, resolved against the manifest's directory */
  file: string;
  /** the path as the manifest writes it: the `entry` of the run table */
  name: string;
  entry: EntryInput;
}

const PLACEHOLDER = 'sig_00000000000000000000000000000000';

/**
 * Reads a manifest of files: the studies manifest format (RFC 4180 CSV, header row, `subject`
 * required, optional `start`, `end`, `channels`, other columns metadata, `name:number` for numbers)
 * with a `file` column, relative to the manifest, in place of `signal`. It is checked whole, by the
 * same reader the server uses, before any work starts.
 */
export async function readFileManifest(path: string): Promise<{ rows: FileEntry[]; text: string }> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch {
    throw new UsageError(`${path}: cannot read the manifest`);
  }
  const { rows } = parseCsv(text);
  const header = rows[0] ?? [];
  const fileColumn = header.findIndex((h) => h.trim() === 'file');
  if (fileColumn < 0) throw new UsageError(`${path}: the manifest's header names no "file" column (the signal files, relative to the manifest)`);
  if (header.some((h) => h.trim().split(':')[0] === 'signal' || h.trim().split(':')[0] === 'upload')) {
    throw new UsageError(`${path}: a manifest of files names its signals in the "file" column, not "signal" or "upload"`);
  }
  // The server's reader checks keys, types and the required columns; it sees a placeholder id.
  const asServerManifest = rows.map((cells, r) => cells.map((cell, c) => (c === fileColumn ? (r === 0 ? 'signal' : PLACEHOLDER) : quote(cell))).join(',')).join('\r\n');
  let entries: EntryInput[];
  try {
    entries = readCsvManifest(asServerManifest);
  } catch (error) {
    if (error instanceof DomainError) throw new UsageError(`${path}: ${error.detail}${error.pointer ? ` (at ${error.pointer.replace('/header', '/header').replace(/\/signal$/, '/file')})` : ''}`);
    throw error;
  }
  const base = dirname(resolve(path));
  return {
    text,
    rows: entries.map((entry) => {
      const name = rows[entry.row]![fileColumn]!.trim();
      return { file: resolve(base, name), name, entry };
    }),
  };
}

function quote(cell: string): string {
  return /[",\r\n]/.test(cell) ? `"${cell.replaceAll('"', '""')}"` : cell;
}

/** The record file of one entry: by file, view and recipe hash, so a re-run finds what is done. */
function recordPath(dir: string, row: FileEntry, recipeHash: string): string {
  const view = Object.keys(row.entry.view).length > 0 ? `.${hashCanonical(row.entry.view).slice(0, 8)}` : '';
  return join(dir, `${basename(row.file, extname(row.file))}${view}.${recipeHash.slice(0, 12)}.record.json`);
}

async function doneAlready(path: string): Promise<string | null> {
  try {
    const text = await readFile(path, 'utf8');
    return (JSON.parse(text) as { engineVersion?: string }).engineVersion === ENGINE_VERSION ? text : null;
  } catch {
    return null;
  }
}

/** `rhythmetric study run MANIFEST --recipe R`: every entry's record, and (with --table) the run's table. */
export async function runStudy(manifestPath: string, options: StudyRunOptions, term: Terminal, abort: AbortSignal): Promise<number> {
  const recipe = await loadRecipe(options.recipe);
  const { rows, text } = await readFileManifest(manifestPath);
  const out = resolve(options.out ?? `${basename(manifestPath, extname(manifestPath))}-run`);
  await mkdir(out, { recursive: true });
  if (options.format && !options.table) throw new UsageError('--format chooses the format of the run table: give --table LEVEL too');
  const client = clientFor(options);
  if (client) return runRemote(client, rows, text, manifestPath, recipe.kind === 'id' ? recipe.id : recipe.recipe, out, options, term, abort);
  if (recipe.kind === 'id') throw new UsageError(`a pinned recipe id (${recipe.id}) is kept by a server: give --server, or the recipe as a file`);
  let hash: string;
  try {
    hash = normalizeRecipe(recipe.recipe).hash;
  } catch (error) {
    if (isRecipeRefusal(error)) throw new UsageError(`recipe: ${error.detail} (at ${error.pointer ?? '/'})`);
    throw error;
  }
  const analyzer = await createAnalyzer(recipe, options, abort);
  const progress = term.progress(rows.length, 'study');
  const records: { row: FileEntry; text: string }[] = [];
  let computed = 0;
  let reused = 0;
  let failed = 0;
  try {
    for (const [i, row] of rows.entries()) {
      if (abort.aborted) break;
      const target = recordPath(out, row, hash);
      let recordText = await doneAlready(target);
      if (recordText) {
        reused++;
      } else {
        try {
          recordText = await analyzer.analyze(inputOf(row.file, options), (f) => progress.update(i + Math.min(f, 0.999), basename(row.file)), row.entry.view);
        } catch (error) {
          if (abort.aborted) break;
          if (!(error instanceof LocalInputError)) throw error;
          failed++;
          term.warn(`row ${row.entry.row} (${row.file}): ${error.message}`, { row: row.entry.row, file: row.file });
          progress.update(i + 1, basename(row.file));
          continue;
        }
        await writeFileAtomic(target, recordText + '\n');
        computed++;
      }
      records.push({ row, text: recordText });
      progress.update(i + 1, basename(row.file));
    }
  } finally {
    progress.stop();
    await analyzer.close();
  }
  if (abort.aborted) return EXIT.interrupted;
  if (options.table && records.length > 0) await writeRunTable(records, options.table, options.format ?? 'csv', out);
  term.note(`study: ${rows.length} entries, ${computed} computed, ${reused} already done, ${failed} failed; records in ${out}`, { entries: rows.length, computed, reused, failed, out });
  return failed === 0 ? EXIT.ok : EXIT.differ;
}

/** The run-level table: every record's rows, led by the entry (its file) and its metadata. */
async function writeRunTable(records: { row: FileEntry; text: string }[], level: TableLevel, format: TableFormat, out: string): Promise<void> {
  const parsed = records.map(({ row, text }) => ({ row, record: JSON.parse(text) as FeatureRecord }));
  let layout: TableLayout;
  try {
    layout = createTableLayout(parsed[0]!.record, level, { entry: true, metadata: metadataColumns(parsed.map((p) => p.row.entry.metadata)) });
  } catch (error) {
    if (error instanceof DomainError) throw new UsageError(`--table ${level}: ${error.detail}`);
    throw error;
  }
  const writer = createTableWriter(format, layout.columns);
  const chunks: (string | Uint8Array)[] = [];
  for (const { row, record } of parsed) {
    for (const cells of tableRows(layout, record, { entryId: row.name, metadata: row.entry.metadata })) {
      const chunk = writer.write(cells);
      if (chunk !== null) chunks.push(chunk);
    }
  }
  chunks.push(writer.end());
  const bytes = Buffer.concat(chunks.map((c) => (typeof c === 'string' ? Buffer.from(c) : c)));
  await writeFileAtomic(join(out, `${level}.${writer.extension}`), bytes);
}

interface StudyState {
  server: string;
  study: string;
  manifestSha256: string;
}

async function runRemote(
  client: RhythmetricClient,
  rows: FileEntry[],
  manifestText: string,
  manifestPath: string,
  recipe: unknown,
  out: string,
  options: StudyRunOptions,
  term: Terminal,
  abort: AbortSignal,
): Promise<number> {
  const statePath = join(out, 'study.json');
  const manifestSha256 = createHash('sha256').update(manifestText).digest('hex');
  const state = await readFile(statePath, 'utf8').then(
    (t) => JSON.parse(t) as StudyState,
    () => null,
  );
  let studyId: string;
  if (state && state.server === client.baseUrl && state.manifestSha256 === manifestSha256) {
    studyId = state.study;
    term.note(`study ${studyId} already holds this manifest's entries`, { study: studyId });
  } else {
    const uploads = term.progress(rows.length, 'upload');
    const entries: unknown[] = [];
    try {
      for (const [i, row] of rows.entries()) {
        abort.throwIfAborted();
        const signal = await uploadInput(client, inputOf(row.file, options));
        entries.push({ signal: signal.id, ...row.entry.view, metadata: row.entry.metadata });
        uploads.update(i + 1, basename(row.file));
      }
    } finally {
      uploads.stop();
    }
    const study = await client.createStudy({ name: basename(manifestPath, extname(manifestPath)) });
    studyId = study.id;
    await client.addStudyEntries(studyId, entries);
    await writeFileAtomic(statePath, JSON.stringify({ server: client.baseUrl, study: studyId, manifestSha256 } satisfies StudyState) + '\n');
  }
  let run = await client.startStudyRun(studyId, { recipe });
  const progress = term.progress(run.counts.total, 'study');
  try {
    while (run.state === 'running') {
      progress.update(run.counts.succeeded + run.counts.failed + run.counts.canceled, `${run.counts.running} running, ${run.counts.reused} already done`);
      await new Promise<void>((done, fail) => {
        const timer = setTimeout(done, 500);
        abort.addEventListener('abort', () => (clearTimeout(timer), fail(abort.reason)), { once: true });
      });
      run = await client.getStudyRun(studyId, run.id);
    }
    progress.update(run.counts.total);
  } catch (error) {
    if (abort.aborted) {
      term.note(`stopped waiting; run ${run.id} of study ${studyId} goes on on the server`, { study: studyId, run: run.id });
      return EXIT.interrupted;
    }
    throw error;
  } finally {
    progress.stop();
  }
  for (const f of run.failed) term.warn(`entry ${f.entryId} (${f.signal}): ${f.problem?.detail ?? 'failed'}`, { entry: f.entryId });
  if (options.table) {
    const format = options.format ?? 'csv';
    try {
      await writeFileAtomic(join(out, `${options.table}.${format}`), await client.getStudyRunTable(studyId, run.id, { level: options.table, format }));
    } catch (error) {
      if (error instanceof ApiProblemError) throw new UsageError(`--table ${options.table}: ${error.message}`);
      throw error;
    }
  }
  term.note(`study ${studyId}, run ${run.id}: ${run.state}; ${run.counts.succeeded} succeeded (${run.counts.reused} already done), ${run.counts.failed} failed`, {
    study: studyId,
    run: run.id,
    state: run.state,
    counts: run.counts,
  });
  return run.state === 'succeeded' ? EXIT.ok : EXIT.differ;
}
