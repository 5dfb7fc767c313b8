import { DomainError, type ProblemCode } from '../common/errors.js';
import { RecipeInputError, type RecipeErrorKind } from './errors.js';

const KIND_OF_CODE: Partial<Record<ProblemCode, RecipeErrorKind>> = { 'invalid-recipe': 'invalid', 'recipe-unfit': 'unfit-for-signal', 'limit-exceeded': 'limit' };

/**
 * The method modules throw plain {@link DomainError}s; a recipe's refusal leaves this layer as a
 * RecipeInputError, whose pointer the callers locate under where the recipe sat in their request.
 */
export function asRecipeError(error: unknown): unknown {
  if (!(error instanceof DomainError) || error instanceof RecipeInputError) return error;
  const kind = KIND_OF_CODE[error.code];
  return kind === undefined ? error : new RecipeInputError(kind, error.detail, error.pointer ?? '/');
}
