import { DomainError } from '../common/errors.js';
import { sampleBytes, signalIdFromHash, signalSha256 } from '../signals/content-hash.js';
import { FLOAT64, encodingFields } from '../signals/sample-encoding.js';
import { findNonFinite, type Signal } from '../signals/signal.js';
import { amplitudeWarnings } from '../signals/units.js';
import { withStorageReservation, type SignalMeta, type Store } from './store.js';

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
    // Values given as JSON numbers are kept as float64.
    bytes: signal.data.byteLength,
    ...encodingFields(FLOAT64),
    storedAt: new Date().toISOString(),
    warnings: amplitudeWarnings(signal),
  };
  await withStorageReservation(store, meta.bytes, maxStoreBytes, () => store.putSignal(meta, sampleBytes(signal.data)));
  return meta;
}

/** The meta of a tenant's stored signal; `pointer` locates the id in the caller's request. */
export async function getSignalMeta(store: Store, id: string, tenant: string, pointer: string | null = null): Promise<SignalMeta> {
  const meta = /^sig_[0-9a-f]{32}$/.test(id) ? await store.getSignalMeta(id) : null;
  // Another tenant's signal answers exactly like a missing one.
  if (!meta || meta.tenant !== tenant) throw new DomainError('signal-not-found', `no signal with id "${id}" is stored`, { pointer });
  return meta;
}
