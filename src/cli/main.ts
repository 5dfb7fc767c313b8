#!/usr/bin/env node
import { CommanderError } from 'commander';
import { ApiProblemError } from '../client/index.js';
import { ConfigError } from '../config.js';
import { EXIT, UsageError } from './output.js';
import { buildProgram } from './program.js';

/**
 * Runs one command's work: Ctrl-C aborts it (running computations stop, no output file is left half
 * written) and a second Ctrl-C exits at once. Usage and input errors exit with 2.
 */
async function runWork(work: (abort: AbortSignal) => Promise<number>): Promise<number> {
  const controller = new AbortController();
  const onInterrupt = () => {
    if (controller.signal.aborted) process.exit(EXIT.interrupted);
    process.stderr.write('interrupted: stopping (Ctrl-C again to quit at once)\n');
    controller.abort(new Error('interrupted'));
  };
  process.on('SIGINT', onInterrupt);
  try {
    const code = await work(controller.signal);
    return controller.signal.aborted ? EXIT.interrupted : code;
  } catch (error) {
    if (controller.signal.aborted) return EXIT.interrupted;
    if (error instanceof UsageError || error instanceof ConfigError) {
      process.stderr.write(`${error.message}\n`);
      return EXIT.usage;
    }
    if (error instanceof ApiProblemError) {
      process.stderr.write(`the server answered ${error.message}\n`);
      return error.status >= 400 && error.status < 500 ? EXIT.usage : EXIT.differ;
    }
    throw error;
  } finally {
    process.off('SIGINT', onInterrupt);
  }
}

async function main(argv: string[]): Promise<number> {
  const program = buildProgram(runWork);
  if (argv.length === 0) {
    program.outputHelp();
    return EXIT.ok;
  }
  try {
    await program.parseAsync(argv, { from: 'user' });
  } catch (error) {
    if (error instanceof CommanderError) return error.exitCode === 0 ? EXIT.ok : EXIT.usage;
    throw error;
  }
  const code = program.getOptionValue('exitCode') as number | undefined;
  // serve and worker keep running until a signal; the other commands end with their exit code.
  return code ?? -1;
}

main(process.argv.slice(2)).then(
  (code) => {
    if (code >= 0) process.exitCode = code;
  },
  (error: unknown) => {
    process.stderr.write(`${error instanceof ConfigError ? 'configuration error: ' : ''}${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 1;
  },
);
