import type { z } from 'zod';
import { deepFreeze } from '../common/freeze.js';
import { hashCanonical } from '../common/hash.js';
import { explainIssue, type SchemaIssue } from '../common/issue-text.js';
import { methodOf } from '../methods/registry.js';
import { pointerOf, RecipeInputError } from './errors.js';
import { asRecipeError } from './method-errors.js';
import { renameDeprecated } from './renames.js';
import { RecipeSchema, type Recipe } from './schema.js';

export interface PinnedRecipe {
  id: string;
  hash: string;
  recipe: Recipe;
}

export function recipeIdFromHash(hash: string): string {
  return `rcp_${hash.slice(0, 32)}`;
}

/**
 * Parses a recipe, fills every default, rejects contradictions by name (each method's own
 * `check`) and returns it frozen with its hash (SHA-256 of the canonical JSON). Two recipes that
 * differ only in defaults they spell out, or in the deprecated names they use (renames.ts), get
 * the same hash.
 */
export function normalizeRecipe(input: unknown): PinnedRecipe {
  const renamed = renameDeprecated(input).input;
  const parsed = RecipeSchema.safeParse(renamed);
  if (!parsed.success) throw fromZod(parsed.error, renamed);
  const recipe = parsed.data;
  try {
    methodOf(recipe).check(recipe);
  } catch (error) {
    throw asRecipeError(error);
  }
  const hash = hashCanonical(recipe);
  return { id: recipeIdFromHash(hash), hash, recipe: deepFreeze(recipe) };
}

/** A recipe's first schema violation in words people can act on; `input` is the recipe as sent. */
export function fromZod(error: z.ZodError, input?: unknown): RecipeInputError {
  const { path, text } = explainIssue(error.issues[0]! as SchemaIssue, input);
  const pointer = pointerOf(path);
  return new RecipeInputError('invalid', `${pointer ? `${pointer.slice(1)} ` : ''}${text}`, pointer || '/');
}
