/**
 * Runs every benchmark that exists, in order, and prints its figures under a heading with the machine.
 * Each block runs in a fresh child process (this file again, with `--block <file>`), so that no block's
 * heap, JIT state or threads carry over into the next: in one shared process the Morlet kernel measured
 * 3.9 s after the blocks before it against 2.8–3.0 s on its own.
 * Timings never change the exit code; only a benchmark that crashes (or lacks its export) does.
 *
 * Run: npm run bench (BENCH_ONLY=morlet.ts,fft.ts npm run bench runs only those files' blocks)
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { arch, availableParallelism, cpus, platform, release, totalmem } from 'node:os';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';

interface Block {
  name: string;
  file: string;
  exportName: string;
}

const BLOCKS: readonly Block[] = [
  { name: 'Welch', file: 'welch.ts', exportName: 'benchWelch' },
  { name: 'multitaper', file: 'multitaper.ts', exportName: 'benchMultitaper' },
  { name: 'API latency', file: 'api-latency.ts', exportName: 'benchApiLatency' },
  { name: 'Morlet', file: 'morlet.ts', exportName: 'benchMorlet' },
  { name: 'FFT', file: 'fft.ts', exportName: 'benchFft' },
  { name: '1 GiB upload', file: 'upload.ts', exportName: 'benchUpload' },
  { name: '2-hour recording', file: 'recording.ts', exportName: 'benchRecording' },
  { name: 'load (autocannon)', file: 'load.ts', exportName: 'benchLoad' },
  { name: 'study run', file: 'study.ts', exportName: 'benchStudy' },
  { name: 'table export', file: 'tables.ts', exportName: 'benchTables' },
  { name: 'scale-out (Redis, 1 and 2 workers)', file: 'scale-out.ts', exportName: 'benchScaleOut' },
  { name: 'growth with size', file: 'growth.ts', exportName: 'benchGrowth' },
];

function machine(): string[] {
  const list = cpus();
  const model = list[0]?.model.trim() ?? 'unknown cpu';
  return [
    `machine: ${model}, ${availableParallelism()} cores available (${list.length} logical CPUs), ${(totalmem() / 2 ** 30).toFixed(1)} GiB`,
    `         node ${process.version}, ${platform()} ${release()} ${arch()}`,
  ];
}

/** Runs one block in a child process with this process's loader flags (tsx); true when it did not crash. */
function runBlockInChild(block: Block): boolean {
  console.log(`\n== ${block.name} (bench/${block.file}) ==`);
  if (!existsSync(fileURLToPath(new URL(`./${block.file}`, import.meta.url)))) {
    console.log(`note: bench/${block.file} does not exist yet; skipped`);
    return true;
  }
  const child = spawnSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), '--block', block.file], { stdio: 'inherit' });
  return child.status === 0;
}

async function runBlock(block: Block): Promise<boolean> {
  const url = new URL(`./${block.file}`, import.meta.url);
  const started = performance.now();
  try {
    const module = (await import(url.href)) as Record<string, unknown>;
    const bench = module[block.exportName];
    if (typeof bench !== 'function') {
      console.log(`crash: bench/${block.file} does not export ${block.exportName}(): Promise<string[]>`);
      return false;
    }
    const lines = (await (bench as () => Promise<unknown>)()) as unknown;
    if (!Array.isArray(lines)) {
      console.log(`crash: ${block.exportName}() resolved to ${typeof lines}, not an array of lines`);
      return false;
    }
    for (const line of lines) console.log(String(line));
    console.log(`(${block.name}: ${((performance.now() - started) / 1000).toFixed(1)} s wall)`);
    return true;
  } catch (error) {
    console.log(`crash: ${block.exportName}() threw after ${((performance.now() - started) / 1000).toFixed(1)} s`);
    console.log(error instanceof Error ? (error.stack ?? error.message) : String(error));
    return false;
  }
}

const only = process.argv.indexOf('--block');
if (only >= 0) {
  const block = BLOCKS.find((b) => b.file === process.argv[only + 1]);
  process.exitCode = block !== undefined && (await runBlock(block)) ? 0 : 1;
} else {
  const chosen = process.env.BENCH_ONLY?.split(',') ?? null;
  for (const line of machine()) console.log(line);
  let crashed = 0;
  // In order, one at a time: blocks running together would time each other.
  for (const block of BLOCKS.filter((b) => chosen === null || chosen.includes(b.file))) if (!runBlockInChild(block)) crashed++;
  console.log(crashed === 0 ? '\nall benchmarks ran' : `\n${crashed} benchmark(s) crashed`);
  process.exitCode = crashed === 0 ? 0 : 1;
}
