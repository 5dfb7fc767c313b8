import { arraySource, type SampleSource } from '../signals/sample-source.js';
import type { Signal } from '../signals/signal.js';
import type { Store } from '../stores/store.js';

/** A stored signal's samples, read a channel row at a time, and how to let go of them. */
export interface OpenedSource {
  source: SampleSource;
  close(): void;
}

/**
 * Opens a stored signal for the engine, or null when the store does not hold it. The store reads
 * rows on demand from its samples file (or a spooled copy of its Redis chunks), converting its
 * encoding to float64, so the engine holds a few rows instead of the whole recording. A signal
 * handed over with the job (an upload still in memory, with the same content hash) is read from
 * memory instead.
 */
export async function openSource(store: Store, signalId: string, handed?: Signal): Promise<OpenedSource | null> {
  const source = handed ? arraySource(handed) : (await store.openSamples(signalId))?.source;
  if (!source) return null;
  return { source, close: () => source.close() };
}
