import { DomainError } from '../common/errors.js';

/** The problem codes a recipe's refusal carries, over HTTP and from a worker alike. */
const RECIPE_CODES = new Set(['invalid-recipe', 'recipe-unfit', 'limit-exceeded']);

/**
 * A refusal of normalize or resolve: a {@link DomainError} with a recipe problem code, its pointer
 * relative to the recipe (callers that know where the recipe sat locate it with `locatedUnder`).
 * The recipe layer and the method modules throw the same errors (`invalid`, `unfit`, `overLimit`
 * in src/methods/fit.ts), so nothing translates between them.
 */
export function isRecipeRefusal(error: unknown): error is DomainError {
  return error instanceof DomainError && RECIPE_CODES.has(error.code);
}

/** Turns a zod issue path into an RFC 6901 JSON pointer. */
export function pointerOf(path: readonly PropertyKey[]): string {
  return path.map((p) => '/' + String(p).replaceAll('~', '~0').replaceAll('/', '~1')).join('');
}
