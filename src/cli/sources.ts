import { readFile } from 'node:fs/promises';
import { createRhythmetricClient, type RhythmetricClient } from '../client/index.js';
import { UsageError } from './output.js';

/** What `--recipe` named: a pinned id (needs a server), or the recipe itself. */
export type RecipeSource = { kind: 'id'; id: string } | { kind: 'recipe'; recipe: unknown };

/**
 * `--recipe` takes a pinned id (`rcp_…`), inline JSON, a recipe file, or a record file (whose
 * `recipe` is used as the record prints it: its id, hash and derived values are checked).
 */
export async function loadRecipe(arg: string): Promise<RecipeSource> {
  if (/^rcp_[0-9a-f]{32}$/.test(arg)) return { kind: 'id', id: arg };
  let text = arg;
  if (!arg.trimStart().startsWith('{')) {
    try {
      text = await readFile(arg, 'utf8');
    } catch {
      throw new UsageError(`--recipe ${arg}: not a pinned recipe id (rcp_…), inline JSON or a readable file`);
    }
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (error) {
    throw new UsageError(`--recipe ${arg}: not valid JSON (${(error as Error).message})`);
  }
  if (value && typeof value === 'object' && 'resultHash' in value && 'recipe' in value) return { kind: 'recipe', recipe: (value as { recipe: unknown }).recipe };
  return { kind: 'recipe', recipe: value };
}

export interface ServerOptions {
  server?: string | undefined;
  key?: string | undefined;
}

/** A client for --server (or RHYTHMETRIC_SERVER), with --key (or RHYTHMETRIC_KEY); null for local work. */
export function clientFor(options: ServerOptions, env: NodeJS.ProcessEnv = process.env): RhythmetricClient | null {
  const server = options.server ?? env.RHYTHMETRIC_SERVER;
  if (!server) return null;
  if (!/^https?:\/\//.test(server)) throw new UsageError(`--server ${server}: give an http:// or https:// URL`);
  return createRhythmetricClient({ baseUrl: server, key: options.key ?? env.RHYTHMETRIC_KEY });
}

export function requireClient(options: ServerOptions, env: NodeJS.ProcessEnv = process.env): RhythmetricClient {
  const client = clientFor(options, env);
  if (!client) throw new UsageError('this command fetches from a server: give --server URL (or set RHYTHMETRIC_SERVER)');
  return client;
}
