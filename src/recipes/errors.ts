/**
 * A recipe that cannot be used, located by an RFC 6901 JSON pointer relative to the recipe
 * (the HTTP layer prefixes where the recipe sat in the request body).
 */
export class RecipeInputError extends Error {
  override readonly name = 'RecipeInputError';
  constructor(
    readonly code: 'invalid' | 'unfit-for-signal' | 'limit',
    message: string,
    readonly pointer: string,
  ) {
    super(message);
  }
}

/** Turns a zod issue path into an RFC 6901 JSON pointer. */
export function pointerOf(path: readonly PropertyKey[]): string {
  return path.map((p) => '/' + String(p).replaceAll('~', '~0').replaceAll('/', '~1')).join('');
}
