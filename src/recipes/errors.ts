import { DomainError, type ProblemCode } from '../common/errors.js';

export type RecipeErrorKind = 'invalid' | 'unfit-for-signal' | 'limit';

const RECIPE_PROBLEM: Record<RecipeErrorKind, ProblemCode> = { invalid: 'invalid-recipe', 'unfit-for-signal': 'recipe-unfit', limit: 'limit-exceeded' };

/**
 * A recipe that cannot be used, located by an RFC 6901 JSON pointer relative to the recipe
 * (callers that know where the recipe sat locate it with `under('/recipe')`). The kind decides the
 * problem code, the same over HTTP and from a worker.
 */
export class RecipeInputError extends DomainError {
  override readonly name = 'RecipeInputError';
  constructor(
    readonly kind: RecipeErrorKind,
    message: string,
    pointer: string,
    extensions?: Record<string, unknown>,
  ) {
    super(RECIPE_PROBLEM[kind], message, { pointer, ...(extensions ? { extensions } : {}) });
  }
}

/** Turns a zod issue path into an RFC 6901 JSON pointer. */
export function pointerOf(path: readonly PropertyKey[]): string {
  return path.map((p) => '/' + String(p).replaceAll('~', '~0').replaceAll('/', '~1')).join('');
}
