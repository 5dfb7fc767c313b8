import type { z } from 'zod';
import { CanonicalJsonError } from '../common/canonical-json.js';
import type { DomainError } from '../common/errors.js';
import { deepFreeze } from '../common/freeze.js';
import { hashCanonical } from '../common/hash.js';
import { explainIssue, type SchemaIssue } from '../common/issue-text.js';
import { methodOf } from '../methods/registry.js';
import { pointerOf } from './errors.js';
import { invalid } from '../methods/fit.js';
import { checkRecipeEcho, splitRecipeEcho } from './round-trip.js';
import { renameDeprecated } from './renames.js';
import { RecipeSchema, type Recipe } from './schema.js';

export interface PinnedRecipe {
  id: string;
  hash: string;
  recipe: Recipe;
  /** derived values echoed by a record's recipe, checked once the signal is known (never stored) */
  derivedEcho?: unknown;
}

export function recipeIdFromHash(hash: string): string {
  return `rcp_${hash.slice(0, 32)}`;
}

/**
 * Parses a recipe, fills every default, rejects contradictions by name (each method's own
 * `check`) and returns it frozen with its hash (SHA-256 of the canonical JSON). Two recipes that
 * differ only in defaults they spell out, or in the deprecated names they use (renames.ts), get
 * the same hash. A record's `recipe` is accepted as it prints it: its `id` and `hash` must be
 * those of its settings, and its `derived` values are returned for a check against the signal.
 */
export function normalizeRecipe(input: unknown): PinnedRecipe {
  const { settings, echo } = splitRecipeEcho(input);
  const pinned = normalizeSettings(settings);
  if (!echo) return pinned;
  checkRecipeEcho(echo, pinned);
  return echo.derived === undefined ? pinned : { ...pinned, derivedEcho: echo.derived };
}

function normalizeSettings(input: unknown): PinnedRecipe {
  const renamed = renameDeprecated(input).input;
  const parsed = RecipeSchema.safeParse(renamed);
  if (!parsed.success) throw fromZod(parsed.error, renamed);
  const recipe = parsed.data;
  methodOf(recipe).check(recipe);
  let hash: string;
  try {
    hash = hashCanonical(recipe);
  } catch (error) {
    if (error instanceof CanonicalJsonError) throw invalid(error.message, error.pointer || '/');
    throw error;
  }
  return { id: recipeIdFromHash(hash), hash, recipe: deepFreeze(recipe) };
}

/** A recipe's first schema violation in words people can act on; `input` is the recipe as sent. */
export function fromZod(error: z.ZodError, input?: unknown): DomainError {
  const { path, text } = explainIssue(error.issues[0]! as SchemaIssue, input);
  const pointer = pointerOf(path);
  return invalid(`${pointer ? `${pointer.slice(1)} ` : ''}${text}`, pointer || '/');
}
