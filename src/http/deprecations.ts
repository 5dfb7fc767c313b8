import type { FastifyReply } from 'fastify';
import { renameDeprecated } from '../recipes/renames.js';

/**
 * Names the deprecated settings of a submitted recipe in `Warning` headers (code 299, one per
 * setting, the JSON pointer under `under` first). Headers, not the record: a record is shared by
 * every spelling of its recipe, and its hashed result must not depend on the spelling.
 */
export function warnDeprecated(reply: FastifyReply, recipe: unknown, under: string): void {
  const { deprecations } = renameDeprecated(recipe);
  if (deprecations.length === 0) return;
  reply.header(
    'warning',
    deprecations.map((d) => `299 rhythmetric ${JSON.stringify(`${under}${d.pointer}: ${d.message}`.replaceAll('"', "'"))}`),
  );
}
