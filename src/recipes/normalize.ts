import type { z } from 'zod';
import { deepFreeze } from '../common/freeze.js';
import { hashCanonical } from '../common/hash.js';
import { methodOf } from '../methods/registry.js';
import { pointerOf, RecipeInputError } from './errors.js';
import { asRecipeError } from './method-errors.js';
import { renameDeprecated } from './renames.js';
import { METHODS, RecipeSchema, type Recipe } from './schema.js';

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
  const parsed = RecipeSchema.safeParse(renameDeprecated(input).input);
  if (!parsed.success) throw fromZod(parsed.error);
  const recipe = parsed.data;
  try {
    methodOf(recipe).check(recipe);
  } catch (error) {
    throw asRecipeError(error);
  }
  const hash = hashCanonical(recipe);
  return { id: recipeIdFromHash(hash), hash, recipe: deepFreeze(recipe) };
}

export function fromZod(error: z.ZodError): RecipeInputError {
  const issue = error.issues[0]!;
  const pointer = pointerOf(issue.path);
  let message = issue.message;
  if (issue.code === 'unrecognized_keys') {
    message = `unknown setting${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}; a misspelt setting is never replaced by a default`;
  } else if (issue.code === 'invalid_union' && issue.path.length === 0) {
    message = `method must be one of ${METHODS.map((m) => `"${m}"`).join(', ')}`;
  }
  return new RecipeInputError('invalid', message, pointer || '/');
}
