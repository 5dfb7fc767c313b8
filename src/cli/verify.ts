import { readFile } from 'node:fs/promises';
import { canonicalJson } from '../common/canonical-json.js';
import { sha256Hex } from '../common/hash.js';
import { ENGINE_VERSION, RECORD_SCHEMA } from '../engine/version.js';
import type { SignalView } from '../signals/view.js';
import { createAnalyzer, inputOf, type InputOptions } from './analyze.js';
import { LocalInputError } from './local-engine.js';
import { EXIT, UsageError, type Terminal } from './output.js';

interface RecordShape {
  schema: string;
  engineVersion: string;
  recipe: Record<string, unknown>;
  input: { sha256: string; view?: SignalView };
  result: unknown;
  resultHash: string;
}

export interface Difference {
  /** RFC 6901 JSON pointer into the record */
  path: string;
  record: unknown;
  recomputed: unknown;
}

/** The first place two JSON values differ, walking objects in canonical (sorted) key order. */
export function firstDifference(a: unknown, b: unknown, path = ''): Difference | null {
  if (Array.isArray(a) && Array.isArray(b)) {
    for (let i = 0; i < Math.max(a.length, b.length); i++) {
      if (i >= a.length || i >= b.length) return { path: `${path}/${i}`, record: a[i] ?? '(absent)', recomputed: b[i] ?? '(absent)' };
      const d = firstDifference(a[i], b[i], `${path}/${i}`);
      if (d) return d;
    }
    return null;
  }
  if (a && b && typeof a === 'object' && typeof b === 'object' && !Array.isArray(a) && !Array.isArray(b)) {
    const x = a as Record<string, unknown>;
    const y = b as Record<string, unknown>;
    for (const key of [...new Set([...Object.keys(x), ...Object.keys(y)])].sort()) {
      const at = `${path}/${key.replaceAll('~', '~0').replaceAll('/', '~1')}`;
      if (!(key in x) || !(key in y)) return { path: at, record: key in x ? x[key] : '(absent)', recomputed: key in y ? y[key] : '(absent)' };
      const d = firstDifference(x[key], y[key], at);
      if (d) return d;
    }
    return null;
  }
  return Object.is(a, b) || (a === 0 && b === 0) ? null : { path, record: a, recomputed: b };
}

async function readRecord(path: string): Promise<RecordShape> {
  let value: unknown;
  try {
    value = JSON.parse(await readFile(path, 'utf8'));
  } catch (error) {
    throw new UsageError(`${path}: not a readable JSON record (${(error as Error).message})`);
  }
  const r = value as Partial<RecordShape> | null;
  if (!r || typeof r !== 'object' || typeof r.schema !== 'string' || typeof r.resultHash !== 'string' || !r.recipe || !r.input || typeof r.input.sha256 !== 'string' || r.result === undefined) {
    throw new UsageError(`${path}: not a feature record (it needs schema, engineVersion, recipe, input.sha256, result and resultHash)`);
  }
  if (r.schema !== RECORD_SCHEMA) throw new UsageError(`${path}: record format "${r.schema}" is not one this program reads (${RECORD_SCHEMA})`);
  return r as RecordShape;
}

/**
 * `rhythmetric verify RECORD FILE`: recomputes the record from the file with the record's own recipe
 * and compares the input hash, the engine version and resultHash. Exit 0 match, 1 differ, 2 usage.
 */
export async function runVerify(recordPath: string, file: string, options: InputOptions & { threads?: number | undefined }, term: Terminal, abort: AbortSignal): Promise<number> {
  const record = await readRecord(recordPath);
  const report = (verdict: Record<string, unknown>, lines: string[]) => {
    if (term.json) process.stdout.write(JSON.stringify(verdict) + '\n');
    else process.stdout.write(lines.join('\n') + '\n');
  };
  if (record.engineVersion !== ENGINE_VERSION) {
    report({ match: false, reason: 'engine-version', recordEngineVersion: record.engineVersion, engineVersion: ENGINE_VERSION }, [
      term.colour('bad', `not compared: the record was made by engine ${record.engineVersion} and this is engine ${ENGINE_VERSION}.`),
      'Records are reproducible bit for bit only within one engine version; verify it with that version.',
    ]);
    return EXIT.differ;
  }
  const ownHash = sha256Hex(canonicalJson(record.result));
  const analyzer = await createAnalyzer({ kind: 'recipe', recipe: record.recipe }, options.threads ? { threads: options.threads } : {}, abort);
  let text: string;
  try {
    text = await analyzer.analyze(inputOf(file, options), () => {}, record.input.view ?? null);
  } catch (error) {
    if (error instanceof LocalInputError) throw new UsageError(error.message);
    throw error;
  } finally {
    await analyzer.close();
  }
  const again = JSON.parse(text) as RecordShape;
  const base = { engineVersion: ENGINE_VERSION, recordResultHash: record.resultHash, resultHash: again.resultHash, recordSha256: record.input.sha256, sha256: again.input.sha256 };
  if (again.input.sha256 !== record.input.sha256) {
    report({ match: false, reason: 'input', ...base }, [
      term.colour('bad', `differ: ${file} is not the input of this record.`),
      `  input.sha256 in the record: ${record.input.sha256}`,
      `  input.sha256 of the file:   ${again.input.sha256}`,
    ]);
    return EXIT.differ;
  }
  const difference = firstDifference(record.result, again.result, '/result');
  if (difference || again.resultHash !== record.resultHash || ownHash !== record.resultHash) {
    const lines = [term.colour('bad', 'differ: the recomputed record does not match.')];
    if (difference) lines.push(`  first difference at ${difference.path}`, `    record:     ${JSON.stringify(difference.record)}`, `    recomputed: ${JSON.stringify(difference.recomputed)}`);
    else lines.push(`  the result is the same, but the record's resultHash ${record.resultHash} is not the SHA-256 of its result (${ownHash})`);
    lines.push(`  resultHash in the record: ${record.resultHash}`, `  recomputed resultHash:    ${again.resultHash}`);
    report({ match: false, reason: difference ? 'result' : 'result-hash', ...base, ...(difference ? { difference } : {}) }, lines);
    return EXIT.differ;
  }
  report({ match: true, ...base }, [
    term.colour('good', 'match: the record was recomputed bit for bit.'),
    `  resultHash   ${again.resultHash}`,
    `  input.sha256 ${again.input.sha256}`,
    `  engine       ${ENGINE_VERSION}`,
  ]);
  return EXIT.ok;
}
