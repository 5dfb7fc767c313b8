/**
 * The one place that finds and loads a thread's entry file, from the TypeScript sources (tsx,
 * vitest) and from compiled `dist/` alike. The entry is the sibling `.ts` or `.js` file of the
 * module that names it. From the sources, the thread registers tsx's loader before it imports the
 * entry: a pool thread through `--import tsx`, a raw worker through tsx's `register()` in a one-line
 * bootstrap, because Node runs no `--import` preload in a worker started from code (`eval`), and a
 * `.ts` file given as a worker's main module is read before any loader is in place (both seen).
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';

export interface ThreadEntry {
  /** file URL of the entry module */
  url: string;
  /** true when the entry is a TypeScript source, loaded through tsx */
  fromSource: boolean;
}

/** The entry `name` (without extension) beside the module at `base` (its `import.meta.url`). */
export function threadEntry(base: string, name: string): ThreadEntry {
  const fromSource = base.endsWith('.ts');
  return { url: new URL(`./${name}.${fromSource ? 'ts' : 'js'}`, base).href, fromSource };
}

/** Node options of a pool thread running `entry`. */
export function poolThreadArgv(entry: ThreadEntry): string[] {
  // tsx by its resolved URL: a bare 'tsx' is looked up from the working directory, which for the
  // command line is wherever the user's files are.
  return entry.fromSource ? ['--import', import.meta.resolve('tsx')] : [];
}

/** A worker thread running `entry`. */
export function startThread(entry: ThreadEntry): Worker {
  const url = JSON.stringify(entry.url);
  const code = entry.fromSource ? `import(${JSON.stringify(tsxApi())}).then(({ register }) => { register(); return import(${url}); });` : `import(${url});`;
  return new Worker(code, { eval: true });
}

/** The URL of tsx's ESM API, from its package manifest (sources only: tsx is a dev dependency). */
function tsxApi(): string {
  const manifest = createRequire(import.meta.url).resolve('tsx/package.json');
  const { exports } = JSON.parse(readFileSync(manifest, 'utf8')) as { exports: Record<string, { import: { default: string } }> };
  return pathToFileURL(join(dirname(manifest), exports['./esm/api']!.import.default)).href;
}
