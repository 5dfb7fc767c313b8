import { mkdir, readFile, stat } from 'node:fs/promises';
import { basename, extname, join } from 'node:path';
import { ApiProblemError, type RhythmetricClient } from '../client/index.js';
import type { SignalView } from '../signals/view.js';
import { createLocalEngine, formatOf, LocalInputError, type LocalEngine, type LocalInput } from './local-engine.js';
import type { TableLevel } from '../tables/columns.js';
import type { TableFormat } from '../tables/writer.js';
import { EXIT, UsageError, writeFileAtomic, type Terminal } from './output.js';
import { createTableSink } from './table-sink.js';
import { clientFor, loadRecipe, type RecipeSource, type ServerOptions } from './sources.js';

export interface InputOptions {
  inputFormat?: string | undefined;
  samplingRate?: number | undefined;
  channels?: string | undefined;
  epochs?: number | undefined;
  unit?: string | undefined;
}

export interface AnalyzeOptions extends InputOptions, ServerOptions {
  recipe: string;
  out?: string | undefined;
  threads?: number | undefined;
  /** write one table over every record instead of the records */
  table?: TableLevel | undefined;
  format?: TableFormat | undefined;
}

export function inputOf(path: string, options: InputOptions): LocalInput {
  return {
    path,
    format: formatOf(path, options.inputFormat),
    samplingRate: options.samplingRate,
    channels: options.channels
      ?.split(',')
      .map((c) => c.trim())
      .filter((c) => c !== ''),
    epochCount: options.epochs,
    unit: options.unit,
  };
}

/** Where the work runs: in this process on worker threads, or on a server through the typed client. */
export interface Analyzer {
  /** the record as JSON text, exactly as it was stored */
  analyze(input: LocalInput, onProgress: (fraction: number) => void, view?: SignalView | null): Promise<string>;
  close(): Promise<void>;
}

export async function createAnalyzer(recipe: RecipeSource, options: ServerOptions & { threads?: number | undefined }, abort: AbortSignal): Promise<Analyzer> {
  const client = clientFor(options);
  if (client) return remoteAnalyzer(client, recipe, abort);
  if (recipe.kind === 'id') throw new UsageError(`a pinned recipe id (${recipe.id}) is kept by a server: give --server, or the recipe (or a record made with it) as a file`);
  const engine: LocalEngine = await createLocalEngine(options.threads ? { threads: options.threads } : {});
  return {
    async analyze(input, onProgress, view) {
      return (await engine.analyze(input, recipe.recipe, { onProgress, signal: abort, view: view ?? null })).text;
    },
    close: () => engine.close(),
  };
}

/** Uploads a signal file as `POST /v1/signals` takes it: a JSON body, or float32/EDF bytes described by the query. */
export async function uploadInput(client: RhythmetricClient, input: LocalInput) {
  if (input.format === 'json') return client.uploadSignal(JSON.parse(await readFile(input.path, 'utf8')));
  return client.uploadSignalBytes(await readFile(input.path), {
    format: input.format,
    ...(input.samplingRate !== undefined ? { samplingRate: input.samplingRate } : {}),
    ...(input.channels ? { channels: input.channels.join(',') } : {}),
    ...(input.epochCount !== undefined ? { epochCount: input.epochCount } : {}),
  });
}

function remoteAnalyzer(client: RhythmetricClient, recipe: RecipeSource, abort: AbortSignal): Analyzer {
  return {
    async analyze(input, onProgress, view) {
      const signal = await uploadInput(client, input);
      const job = await client.submitJob({ signal: view ? { ...view, signal: signal.id } : signal.id, recipe: recipe.kind === 'id' ? recipe.id : recipe.recipe });
      const done = await client.waitForJob(job.id, { onProgress: (p) => onProgress(p), signal: abort });
      if (done.state !== 'succeeded') {
        const problem = done.problem ?? { status: 500, title: `job ${done.state}`, detail: `job ${done.id} ${done.state}` };
        throw new ApiProblemError(problem.status, problem as never);
      }
      return client.getRecordText(job.id);
    },
    close: async () => {},
  };
}

/** `rhythmetric analyze FILE… --recipe R`: records on standard output (one per line) or under --out. */
export async function runAnalyze(files: string[], options: AnalyzeOptions, term: Terminal, abort: AbortSignal): Promise<number> {
  const recipe = await loadRecipe(options.recipe);
  const inputs = files.map((f) => inputOf(f, options));
  const table = options.table ? createTableSink(options.table, options.format ?? 'csv', options.out) : null;
  if (!table && options.format) throw new UsageError('--format chooses the format of a table: give --table LEVEL too');
  const outDir = !table && files.length > 1 && options.out ? options.out : null;
  if (outDir) {
    await mkdir(outDir, { recursive: true });
    if (!(await stat(outDir)).isDirectory()) throw new UsageError(`--out ${outDir}: with several files, --out names a directory`);
  }
  const analyzer = await createAnalyzer(recipe, options, abort);
  const progress = term.progress(inputs.length, 'analyze');
  let failures = 0;
  try {
    for (const [i, input] of inputs.entries()) {
      if (abort.aborted) break;
      if (!term.fancy) term.note(`analyzing ${input.path}`, { file: input.path });
      let text: string;
      try {
        text = await analyzer.analyze(input, (f) => progress.update(i + Math.min(f, 0.999), basename(input.path)));
      } catch (error) {
        if (abort.aborted) break;
        if (!(error instanceof LocalInputError || error instanceof ApiProblemError)) throw error;
        failures++;
        term.warn(`${input.path}: ${error.message}`, { file: input.path });
        continue;
      }
      const target = outDir ? join(outDir, `${basename(input.path, extname(input.path))}.record.json`) : options.out;
      if (table) await table.add(text);
      else if (target) await writeFileAtomic(target, text + '\n');
      else process.stdout.write(text + '\n');
      progress.update(i + 1, basename(input.path));
    }
    if (table && !abort.aborted) await table.finish();
  } finally {
    progress.stop();
    await table?.abandon();
    await analyzer.close();
  }
  if (abort.aborted) return EXIT.interrupted;
  return failures === 0 ? EXIT.ok : EXIT.usage;
}
