import { DomainError, type ProblemCode } from '../common/errors.js';
import { RecipeInputError } from './errors.js';

const KIND_OF_CODE: Partial<Record<ProblemCode, RecipeInputError['code']>> = { 'invalid-recipe': 'invalid', 'recipe-unfit': 'unfit-for-signal', 'limit-exceeded': 'limit' };

/**
 * The method modules throw {@link DomainError}s; until every translator reads those, a recipe's
 * refusal leaves this layer as the RecipeInputError the HTTP and queue translations know today.
 */
export function asRecipeError(error: unknown): unknown {
  if (!(error instanceof DomainError) || error instanceof RecipeInputError) return error;
  const kind = KIND_OF_CODE[error.code];
  return kind === undefined ? error : new RecipeInputError(kind, error.detail, error.pointer ?? '/');
}
