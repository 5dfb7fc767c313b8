import { Command, InvalidArgumentError, Option } from 'commander';
import { loadConfig } from '../config.js';
import { ENGINE_VERSION } from '../engine/version.js';
import { TABLE_LEVELS } from '../tables/columns.js';
import { TABLE_FORMATS } from '../tables/writer.js';
import { createTerminal } from './output.js';
import { createLogger, startApi, startWorker } from './runtime.js';

function positiveNumber(value: string): number {
  const n = Number(value);
  if (!Number.isFinite(n) || n <= 0) throw new InvalidArgumentError('give a positive number');
  return n;
}

function positiveInteger(value: string): number {
  const n = positiveNumber(value);
  if (!Number.isInteger(n)) throw new InvalidArgumentError('give a whole number');
  return n;
}

const serverOption = () => new Option('--server <url>', 'the rhythmetric server to use (default: $RHYTHMETRIC_SERVER)');
const keyOption = () => new Option('--key <key>', 'API key for the server; prefer $RHYTHMETRIC_KEY, which stays out of your shell history');
const jsonOption = () => new Option('--json', 'machine-readable output: JSON lines, no progress bar, no colour');

/** Options that say how to read a signal file (JSON needs none). */
function inputOptions(command: Command): Command {
  return command
    .addOption(new Option('--input-format <format>', 'how to read the files (default: by extension: .edf → edf, .f32/.bin → float32, else json)').choices(['json', 'float32', 'edf']))
    .option('--sampling-rate <hz>', 'float32 files: samples per second; EDF files: choose the channels recorded at this rate', positiveNumber)
    .option('--channels <names>', 'float32 files: comma-separated channel names, in file order; EDF files: the channels to read')
    .option('--epochs <count>', 'float32 files: epochs in the file, laid out [epoch][channel][sample] (default 1)', positiveInteger)
    .option('--unit <unit>', 'float32 files: physical unit of the samples (default uV)')
    .option('--threads <count>', 'worker threads for local work (default: the CPU count)', positiveInteger);
}

/**
 * The `rhythmetric` commands. `run` executes a command's work (Ctrl-C and error handling); a
 * command's exit code is left in the program's `exitCode` option value.
 */
export function buildProgram(run: (work: (abort: AbortSignal) => Promise<number>) => Promise<number>): Command {
  const program = new Command('rhythmetric')
    .description('Spectral features of EEG and other electrophysiology: run the engine here or on a server, fetch results, and check records.')
    .version(ENGINE_VERSION, '-V, --version', 'print the engine version')
    .showHelpAfterError('(run with --help for the options)')
    .exitOverride()
    .configureHelp({ sortSubcommands: false });

  program
    .command('serve')
    .description('run the HTTP API (embedded mode; distributed when REDIS_URL is set). Configured by environment variables, see README.md')
    .action(async () => {
      const config = loadConfig();
      const logger = createLogger(config);
      const api = await startApi(config, logger);
      await api.app.listen({ port: config.port, host: config.host });
      logger.info({ mode: api.queue.mode, store: config.store.kind, dataDir: config.store.kind === 'filesystem' ? config.dataDir : undefined }, 'rhythmetric serving');
      onShutdown(logger, () => api.close());
    });

  program
    .command('worker')
    .description('consume jobs from the Redis queue (needs REDIS_URL); start as many as you like')
    .action(() => {
      const config = loadConfig();
      const logger = createLogger(config);
      const worker = startWorker(config, logger);
      logger.info({ queue: config.queueName, threads: config.workerThreads, store: config.store.kind }, 'rhythmetric worker started');
      onShutdown(logger, () => worker.close());
    });

  program
    .command('demo')
    .description('write the invented night-shift alertness study (demo data, no real person) as upload-ready JSON')
    .option('--out <dir>', 'directory to write into', 'demo-data')
    .option('--tenant <name>', 'write the study manifest with the signal ids this tenant gets (default: public, the open-mode tenant)', 'public')
    .action(async (options: { out: string; tenant: string }) => {
      const { runDemoCommand } = await import('./demo.js');
      program.setOptionValue('exitCode', await runDemoCommand(['--out', options.out, '--tenant', options.tenant]));
    });

  inputOptions(
    program
      .command('analyze')
      .description('compute a feature record for each file with one recipe: here, on worker threads, or on a server with --server')
      .argument('<files...>', 'signal files: JSON uploads, little-endian float32, or EDF/EDF+')
      .requiredOption('--recipe <recipe>', 'a recipe file, inline JSON, a record file (its recipe is used), or a pinned id rcp_… (with --server)')
      .option('--out <path>', 'write the record to this file (several files: a directory, one <name>.record.json each); default: standard output, one record per line')
      .addOption(new Option('--table <level>', 'write one table over every record instead of the records: one row per band, feature, spectrum bin, …').choices([...TABLE_LEVELS]))
      .addOption(new Option('--format <format>', "the table's format: CSV (RFC 4180) or Parquet (default csv)").choices([...TABLE_FORMATS])),
  )
    .addOption(serverOption())
    .addOption(keyOption())
    .addOption(jsonOption())
    .addHelpText(
      'after',
      "\nThe record made here carries the same result and resultHash as a server's for the same input and recipe.\nExit status: 0 done, 2 an input or the recipe was refused, 130 interrupted.",
    )
    .action(async (files: string[], options: Record<string, unknown>) => {
      const { runAnalyze } = await import('./analyze.js');
      program.setOptionValue('exitCode', await run((abort) => runAnalyze(files, options as never, createTerminal({ json: options.json === true }), abort)));
    });

  inputOptions(
    program
      .command('verify')
      .description("recompute a record from its input file with the record's own recipe, here, and compare the input hash, the engine version and resultHash")
      .argument('<record>', 'a feature record (JSON), e.g. from `rhythmetric record` or GET /v1/jobs/{id}/record')
      .argument('<file>', 'the signal file the record was made from'),
  )
    .addOption(jsonOption())
    .addHelpText(
      'after',
      '\nExit status: 0 they match; 1 they differ (the first differing JSON path and both values are printed; a record of another engine version is reported as such); 2 usage or input errors.',
    )
    .action(async (recordPath: string, file: string, options: Record<string, unknown>) => {
      const { runVerify } = await import('./verify.js');
      program.setOptionValue('exitCode', await run((abort) => runVerify(recordPath, file, options as never, createTerminal({ json: options.json === true }), abort)));
    });

  const study = program.command('study').description('studies: many files with their metadata, one recipe, one table');
  inputOptions(
    study
      .command('run')
      .description('analyze every file of a manifest with one recipe, here or on a server with --server; running it again skips what is done')
      .argument(
        '<manifest>',
        'CSV manifest (RFC 4180, header row): a "file" column (relative to the manifest), "subject", optional start, end and channels, and metadata columns ("age:number" for numbers)',
      )
      .requiredOption('--recipe <recipe>', 'a recipe file, inline JSON, a record file (its recipe is used), or a pinned id rcp_… (with --server)')
      .option('--out <dir>', 'directory for the records (here), the run table and the study state (default: <manifest name>-run)')
      .addOption(new Option('--table <level>', "also write the run table: every entry's rows led by the entry and its metadata").choices([...TABLE_LEVELS]))
      .addOption(new Option('--format <format>', "the table's format (default csv)").choices([...TABLE_FORMATS])),
  )
    .addOption(serverOption())
    .addOption(keyOption())
    .addOption(jsonOption())
    .addHelpText('after', '\nExit status: 0 every entry done, 1 some entries failed (each is listed), 2 a bad manifest, recipe or option, 130 interrupted.')
    .action(async (manifest: string, options: Record<string, unknown>) => {
      const { runStudy } = await import('./study.js');
      program.setOptionValue('exitCode', await run((abort) => runStudy(manifest, options as never, createTerminal({ json: options.json === true }), abort)));
    });

  program
    .command('record')
    .description('fetch the feature record of a finished job from a server')
    .argument('<job>', 'job id (job_…)')
    .option('--out <path>', 'file to write (default: standard output)')
    .addOption(serverOption())
    .addOption(keyOption())
    .action(async (job: string, options: Record<string, unknown>) => {
      const { runRecord } = await import('./fetch.js');
      program.setOptionValue('exitCode', await run(() => runRecord(job, options as never)));
    });

  program
    .command('plot')
    .description("fetch a picture (SVG) of a finished job's record from a server")
    .argument('<job>', 'job id (job_…)')
    .argument('<kind>', 'what to draw, e.g. psd; the server lists the kinds it knows when it refuses one')
    .option('--channels <names>', 'comma-separated channel names to draw')
    .option('--width <pixels>', 'picture width', positiveInteger)
    .option('--height <pixels>', 'picture height', positiveInteger)
    .option('--out <path>', 'file to write (default: standard output)')
    .addOption(serverOption())
    .addOption(keyOption())
    .action(async (job: string, kind: string, options: Record<string, unknown>) => {
      const { runPlot } = await import('./fetch.js');
      program.setOptionValue('exitCode', await run(() => runPlot(job, kind, options as never)));
    });

  program
    .command('table')
    .description("fetch a finished job's record as a table from a server")
    .argument('<job>', 'job id (job_…)')
    .addOption(new Option('--level <level>', 'the grain of a row: a band, a feature set, a spectrum bin, … (default: the first the record gives)').choices([...TABLE_LEVELS]))
    .addOption(new Option('--format <format>', 'CSV (RFC 4180) or Parquet').choices([...TABLE_FORMATS]).default('csv'))
    .option('--out <path>', 'file to write (default: standard output)')
    .addOption(serverOption())
    .addOption(keyOption())
    .action(async (job: string, options: Record<string, unknown>) => {
      const { runTable } = await import('./fetch.js');
      program.setOptionValue('exitCode', await run(() => runTable(job, options as never)));
    });

  return program;
}

/** Stop accepting, let running work finish or go back to the queue, then exit. */
function onShutdown(logger: ReturnType<typeof createLogger>, close: () => Promise<void>): void {
  let closing = false;
  for (const signal of ['SIGTERM', 'SIGINT'] as const) {
    process.on(signal, () => {
      if (closing) return;
      closing = true;
      logger.info({ signal }, 'shutting down');
      close().then(
        () => process.exit(0),
        (error: unknown) => {
          logger.error({ err: error }, 'shutdown failed');
          process.exit(1);
        },
      );
    });
  }
}
