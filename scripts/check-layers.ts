/**
 * Guards the layering of DESIGN.md: every import inside src/ must point to an allowed layer, and
 * src/dsp/ imports nothing of ours but itself (no I/O, no zod, no logging reach the numerical core).
 * Exits non-zero with one line per violation.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';

const SRC = resolve(import.meta.dirname, '..', 'src');

const ALLOWED: Record<string, string[]> = {
  common: [],
  dsp: [],
  features: ['dsp', 'common'],
  signals: ['common'],
  // one module per method: settings, checks, fit, cost and estimator; below the recipe union built from them
  methods: ['dsp', 'features', 'signals', 'common'],
  recipes: ['methods', 'dsp', 'common'],
  engine: ['methods', 'dsp', 'features', 'signals', 'recipes', 'common'],
  stores: ['signals', 'common'],
  tables: ['engine', 'common'],
  // every thread of the process: the job pool, channel helpers, the thread budget and entry loading
  threads: ['engine', 'signals', 'common'],
  jobs: ['threads', 'engine', 'stores', 'recipes', 'methods', 'signals', 'common'],
  plots: ['engine', 'recipes', 'methods', 'common'],
  studies: ['tables', 'jobs', 'stores', 'recipes', 'methods', 'signals', 'common'],
  http: ['studies', 'tables', 'plots', 'jobs', 'stores', 'recipes', 'methods', 'signals', 'engine', 'common', 'config'],
  client: [],
  cli: ['client', 'threads', 'tables', 'plots', 'http', 'studies', 'jobs', 'stores', 'recipes', 'methods', 'signals', 'engine', 'features', 'dsp', 'common', 'config'],
  config: ['recipes', 'signals', 'stores', 'common'],
};
/** Packages the numerical core may use. */
const DSP_PACKAGES = new Set<string>();

function layerOf(file: string): string {
  const rel = relative(SRC, file).split(sep);
  return rel.length === 1 ? rel[0]!.replace(/\.(ts|js)$/, '') : rel[0]!;
}

function* walk(dir: string): Generator<string> {
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) yield* walk(path);
    else if (path.endsWith('.ts')) yield path;
  }
}

// `import … from '…'`, `export … from '…'`, `import('…')`, and side-effect `import '…'`.
const IMPORT = /(?:^|\n)\s*(?:import|export)\s[^'"]*?from\s+['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)|(?:^|\n)\s*import\s+['"]([^'"]+)['"]/g;
const problems: string[] = [];
for (const file of walk(SRC)) {
  const layer = layerOf(file);
  const allowed = ALLOWED[layer];
  if (!allowed) {
    problems.push(`${relative(SRC, file)}: layer "${layer}" is not in the layer table of scripts/check-layers.ts`);
    continue;
  }
  const text = readFileSync(file, 'utf8');
  for (const match of text.matchAll(IMPORT)) {
    const spec = match[1] ?? match[2] ?? match[3]!;
    if (!spec.startsWith('.')) {
      if (layer === 'dsp' && !DSP_PACKAGES.has(spec)) problems.push(`${relative(SRC, file)}: the numerical core imports "${spec}"`);
      continue;
    }
    const target = layerOf(resolve(dirname(file), spec));
    if (target !== layer && !allowed.includes(target)) problems.push(`${relative(SRC, file)}: ${layer} must not import ${target} ("${spec}")`);
  }
}
if (problems.length > 0) {
  process.stderr.write(`layer check failed:\n${problems.map((p) => `  ${p}`).join('\n')}\n`);
  process.exit(1);
}
process.stdout.write('layer check passed\n');
