import { arraySource, type SampleSource } from '../signals/sample-source.js';
import type { Store } from '../stores/store.js';

/** A stored signal's samples, read a channel row at a time, and how to let go of them. */
export interface OpenedSource {
  source: SampleSource;
  close(): void;
}

/**
 * Opens a stored signal for the engine, or null when the store does not hold it.
 *
 * For now the samples are loaded whole (`store.getSignal`) and read from memory through
 * {@link arraySource}; no copy is made beyond the loaded signal. When the store can read rows from
 * disk on demand (`store.openSamples`), this is the one place to switch, and the engine then holds
 * a few rows instead of the whole recording.
 */
export async function openSource(store: Store, signalId: string): Promise<OpenedSource | null> {
  const loaded = await store.getSignal(signalId);
  if (!loaded) return null;
  const source = arraySource(loaded.signal);
  return { source, close: () => source.close() };
}
