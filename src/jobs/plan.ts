import { DomainError, locatedUnder } from '../common/errors.js';
import { normalizeRecipe, type PinnedRecipe } from '../recipes/normalize.js';
import { renameDeprecated } from '../recipes/renames.js';
import { resolveRecipe, type RecipeLimits } from '../recipes/resolve.js';
import { checkDerivedEcho } from '../recipes/round-trip.js';
import type { SignalView } from '../signals/view.js';
import type { SignalMeta, Store } from '../stores/store.js';
import { jobIdOf, recordKeyOf, viewedShape, type JobSpec } from './spec.js';

/** Pins a recipe: stored under its id, which follows from its hash. */
export async function pinRecipe(store: Store, input: unknown): Promise<PinnedRecipe> {
  const pinned = normalizeRecipe(input);
  const { derivedEcho: _echo, ...stored } = pinned;
  if ((await store.getDocument('recipes', pinned.id)) === null) await store.putDocument('recipes', pinned.id, JSON.stringify(stored));
  return pinned;
}

export async function getRecipe(store: Store, id: string, pointer: string | null = null): Promise<PinnedRecipe> {
  const text = /^rcp_[0-9a-f]{32}$/.test(id) ? await store.getDocument('recipes', id) : null;
  if (text === null) throw new DomainError('recipe-not-found', `no pinned recipe with id "${id}"`, { pointer });
  // Recipes pinned before the 0.3.0 renames are stored with the old names; their id and hash stay.
  const stored = JSON.parse(text) as PinnedRecipe;
  return { ...stored, recipe: renameDeprecated(stored.recipe).input as PinnedRecipe['recipe'] };
}

/**
 * Builds the job for a (signal, recipe) pair after checking, before anything is queued, that the
 * recipe fits the signal; a misfit answers 422 now instead of a failed job later.
 */
export function planJob(limits: RecipeLimits, meta: SignalMeta, pinned: PinnedRecipe, view: SignalView | null = null, labels: Record<string, string> = {}): { jobId: string; spec: JobSpec } {
  const reference = pinned.recipe.reference;
  if (view?.channels && typeof reference === 'object' && view.channels.includes(reference.channel)) {
    throw new DomainError('recipe-unfit', `channel "${reference.channel}" is the recipe's reference and is left out of the output; do not select it`, { pointer: '/signal/channels' });
  }
  const shape = locatedUnder('/signal', () => viewedShape(meta, view));
  const resolved = locatedUnder('/recipe', () => resolveRecipe(pinned.recipe, pinned.hash, shape, limits));
  locatedUnder('/recipe', () => checkDerivedEcho(pinned.derivedEcho, resolved.derived));
  if (meta.nonFiniteSamples > 0 && pinned.recipe.nonFinite === 'reject') {
    throw new DomainError(
      'non-finite',
      `signal ${meta.id} holds ${meta.nonFiniteSamples} non-finite sample(s); set the recipe's "nonFinite": "skip-epoch" to leave those epochs out, or "bad-span" to leave out only what overlaps the gaps`,
      {
        pointer: '/recipe/nonFinite',
      },
    );
  }
  const recordKey = recordKeyOf(meta.tenant, meta.sha256, pinned.hash, view);
  return {
    jobId: jobIdOf(recordKey),
    spec: { tenant: meta.tenant, signalId: meta.id, sha256: meta.sha256, recipeId: pinned.id, recipeHash: pinned.hash, recipe: pinned.recipe, recordKey, view, resolved, labels },
  };
}
