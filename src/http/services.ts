import type { Config } from '../config.js';
import { normalizeRecipe, type PinnedRecipe } from '../recipes/normalize.js';
import { resolveRecipe } from '../recipes/resolve.js';
import { checkDerivedEcho } from '../recipes/round-trip.js';
import { sampleBytes, signalIdFromHash, signalSha256 } from '../signals/content-hash.js';
import { findNonFinite, type Signal } from '../signals/signal.js';
import { jobIdOf, recordKeyOf, viewedShape, type JobSpec } from '../jobs/spec.js';
import type { SignalView } from '../signals/view.js';
import { withStorageReservation, type SignalMeta, type Store } from '../stores/store.js';
import { ProblemError } from './problem.js';

/** Stores a decoded signal under its content hash; storing the same content again is a no-op. */
export async function storeSignal(store: Store, signal: Signal, tenant: string, maxStoreBytes = 0): Promise<SignalMeta> {
  const sha256 = signalSha256(signal);
  const id = signalIdFromHash(sha256, tenant);
  const existing = await store.getSignalMeta(id);
  if (existing) return existing;
  const meta: SignalMeta = {
    id,
    sha256,
    tenant,
    samplingRate: signal.samplingRate,
    channels: signal.channels,
    unit: signal.unit,
    epochCount: signal.epochCount,
    samplesPerEpoch: signal.samplesPerEpoch,
    nonFiniteSamples: findNonFinite(signal).count,
    events: signal.events ?? [],
    bytes: signal.data.byteLength,
    storedAt: new Date().toISOString(),
  };
  await withStorageReservation(store, meta.bytes, maxStoreBytes, () => store.putSignal(meta, sampleBytes(signal.data)));
  return meta;
}

export async function getSignalMeta(store: Store, id: string, tenant: string, pointer: string | null = null): Promise<SignalMeta> {
  const meta = /^sig_[0-9a-f]{32}$/.test(id) ? await store.getSignalMeta(id) : null;
  // Another tenant's signal answers exactly like a missing one.
  if (!meta || meta.tenant !== tenant) throw new ProblemError('signal-not-found', `no signal with id "${id}" is stored`, pointer);
  return meta;
}

/** Pins a recipe: stored under its id, which follows from its hash. */
export async function pinRecipe(store: Store, input: unknown): Promise<PinnedRecipe> {
  const pinned = normalizeRecipe(input);
  const { derivedEcho: _echo, ...stored } = pinned;
  if ((await store.getDocument('recipes', pinned.id)) === null) await store.putDocument('recipes', pinned.id, JSON.stringify(stored));
  return pinned;
}

export async function getRecipe(store: Store, id: string, pointer: string | null = null): Promise<PinnedRecipe> {
  const text = /^rcp_[0-9a-f]{32}$/.test(id) ? await store.getDocument('recipes', id) : null;
  if (text === null) throw new ProblemError('recipe-not-found', `no pinned recipe with id "${id}"`, pointer);
  return JSON.parse(text) as PinnedRecipe;
}

/**
 * Builds the job for a (signal, recipe) pair after checking, before anything is queued, that the
 * recipe fits the signal; a misfit answers 422 now instead of a failed job later.
 */
export function planJob(config: Config, meta: SignalMeta, pinned: PinnedRecipe, view: SignalView | null = null): { jobId: string; spec: JobSpec } {
  const shape = viewedShape(meta, view);
  const reference = pinned.recipe.reference;
  if (view?.channels && typeof reference === 'object' && view.channels.includes(reference.channel)) {
    throw new ProblemError('recipe-unfit', `channel "${reference.channel}" is the recipe's reference and is left out of the output; do not select it`, '/signal/channels');
  }
  const resolved = resolveRecipe(pinned.recipe, pinned.hash, shape, config.recipeLimits);
  checkDerivedEcho(pinned.derivedEcho, resolved.derived);
  if (meta.nonFiniteSamples > 0 && pinned.recipe.nonFinite === 'reject') {
    throw new ProblemError(
      'non-finite',
      `signal ${meta.id} holds ${meta.nonFiniteSamples} non-finite sample(s); set the recipe's "nonFinite": "skip-epoch" to leave those epochs out`,
      '/recipe/nonFinite',
    );
  }
  const recordKey = recordKeyOf(meta.tenant, meta.sha256, pinned.hash, view);
  return {
    jobId: jobIdOf(recordKey),
    spec: { tenant: meta.tenant, signalId: meta.id, sha256: meta.sha256, recipeId: pinned.id, recipeHash: pinned.hash, recipe: pinned.recipe, recordKey, view },
  };
}
