import { canonicalJson } from '../common/canonical-json.js';
import { invalid, unfit } from '../methods/fit.js';
import type { DerivedSettings } from './resolve.js';

/**
 * What a record adds to the recipe it prints: the id and hash it was pinned under and the values
 * derived from the signal. A record's `recipe` may be submitted back as it is; these are then
 * checked against the rest of the recipe (and the signal), never silently dropped or trusted.
 */
export interface RecipeEcho {
  id?: unknown;
  hash?: unknown;
  derived?: unknown;
}

const ECHO_KEYS = ['id', 'hash', 'derived'] as const;

/** Separates the settings from the echoed id, hash and derived values (null when there are none). */
export function splitRecipeEcho(input: unknown): { settings: unknown; echo: RecipeEcho | null } {
  if (input === null || typeof input !== 'object' || Array.isArray(input) || !ECHO_KEYS.some((k) => k in input)) return { settings: input, echo: null };
  const { id, hash, derived, ...settings } = input as Record<string, unknown>;
  const echo: RecipeEcho = {};
  if (id !== undefined) echo.id = id;
  if (hash !== undefined) echo.hash = hash;
  if (derived !== undefined) {
    if (derived === null || typeof derived !== 'object' || Array.isArray(derived)) throw invalid('derived must be an object, as a record prints it', '/derived');
    echo.derived = derived;
  }
  return { settings, echo };
}

/** The echoed hash and id must be those the settings hash to (SHA-256 of their canonical JSON). */
export function checkRecipeEcho(echo: RecipeEcho, pinned: { id: string; hash: string }): void {
  if (echo.hash !== undefined && echo.hash !== pinned.hash) {
    throw invalid(`hash ${JSON.stringify(echo.hash)} is not the hash of this recipe's settings, ${pinned.hash}; a setting was changed after the record was made, or the hash was`, '/hash');
  }
  if (echo.id !== undefined && echo.id !== pinned.id) {
    throw invalid(`id ${JSON.stringify(echo.id)} is not the id of this recipe's settings, ${pinned.id}`, '/id');
  }
}

/**
 * Each echoed derived value must equal the one the recipe gives on this signal; a name that the
 * recipe does not derive is refused. Values left out are not required.
 */
export function checkDerivedEcho(claimed: unknown, derived: DerivedSettings): void {
  if (claimed === undefined) return;
  const actual = derived as unknown as Record<string, unknown>;
  for (const [name, value] of Object.entries(claimed as Record<string, unknown>)) {
    const pointer = `/derived/${name.replaceAll('~', '~0').replaceAll('/', '~1')}`;
    if (!(name in actual)) throw unfit(`derived.${name} is not a value this recipe derives on this signal`, pointer);
    if (!sameJson(value, actual[name])) {
      throw unfit(`derived.${name} is ${JSON.stringify(value)}, but this recipe on this signal gives ${JSON.stringify(actual[name])}; the record was made on a signal of another shape`, pointer);
    }
  }
}

function sameJson(a: unknown, b: unknown): boolean {
  try {
    return canonicalJson(a) === canonicalJson(b);
  } catch {
    return false;
  }
}
