import { jobIdOf } from '../jobs/spec.js';
import type { SampleSource } from '../signals/sample-source.js';
import type { Signal } from '../signals/signal.js';
import type { Collection, SignalMeta, Store } from '../stores/store.js';

/** A least-recently-used map bounded by the bytes of its values. */
function createByteLru<V>(maxBytes: number, sizeOf: (value: V) => number, onEvict: (key: string) => void = () => {}) {
  const entries = new Map<string, V>();
  let bytes = 0;
  const remove = (key: string) => {
    const value = entries.get(key);
    if (value === undefined) return;
    entries.delete(key);
    bytes -= sizeOf(value);
    onEvict(key);
  };
  return {
    get(key: string): V | undefined {
      const value = entries.get(key);
      if (value === undefined) return undefined;
      entries.delete(key);
      entries.set(key, value);
      return value;
    },
    set(key: string, value: V): void {
      remove(key);
      const size = sizeOf(value);
      if (size > maxBytes) return;
      entries.set(key, value);
      bytes += size;
      for (const oldest of entries.keys()) {
        if (bytes <= maxBytes) break;
        remove(oldest);
      }
    },
    delete: remove,
    get bytes() {
      return bytes;
    },
  };
}

/**
 * The store as the API sees it, with a read-through cache, bounded by bytes, of records and their
 * attachments. A record never changes once written (its key names the input hash, the recipe hash
 * and the engine version), so a cached copy is never stale; removing one through this store
 * removes the copy too. With STORE=redis it keeps records that were read before readable while
 * Redis is down. A job's index entry follows from its record key (the job id is a hash of the key,
 * which begins with the tenant), so it is answered from the cache too when the store cannot be read.
 */
export class RecordCachingStore implements Store {
  readonly kind: Store['kind'];
  private readonly records: ReturnType<typeof createByteLru<string>>;
  private readonly attachments: ReturnType<typeof createByteLru<Uint8Array>>;
  private readonly recordOfJob = new Map<string, string>();

  /** @param maxBytes - bytes of records and attachments kept, half for each */
  constructor(
    private readonly store: Store,
    readonly maxBytes: number,
  ) {
    this.kind = store.kind;
    // UTF-16 strings: two bytes a character. Half the budget each, so large attachments cannot push every record out.
    this.records = createByteLru<string>(
      maxBytes / 2,
      (text) => 2 * text.length,
      (key) => this.recordOfJob.delete(jobIdOf(key)),
    );
    this.attachments = createByteLru<Uint8Array>(maxBytes / 2, (bytes) => bytes.byteLength);
  }

  get cachedBytes(): number {
    return this.records.bytes + this.attachments.bytes;
  }

  async getDocument(collection: Collection, key: string): Promise<string | null> {
    if (collection === 'records') {
      const cached = this.records.get(key);
      if (cached !== undefined) return cached;
      const text = await this.store.getDocument(collection, key);
      if (text !== null) {
        this.records.set(key, text);
        if (this.records.get(key) !== undefined) this.recordOfJob.set(jobIdOf(key), key);
      }
      return text;
    }
    if (collection === 'job-index') {
      try {
        return await this.store.getDocument(collection, key);
      } catch (error) {
        const recordKey = this.recordOfJob.get(key);
        if (recordKey === undefined) throw error;
        return JSON.stringify({ tenant: recordKey.slice(0, recordKey.indexOf('.')), recordKey });
      }
    }
    return this.store.getDocument(collection, key);
  }

  deleteDocument(collection: Collection, key: string): Promise<boolean> {
    if (collection === 'records') this.records.delete(key);
    return this.store.deleteDocument(collection, key);
  }

  async getAttachment(key: string): Promise<Uint8Array | null> {
    const cached = this.attachments.get(key);
    if (cached !== undefined) return cached;
    const bytes = await this.store.getAttachment(key);
    if (bytes !== null) this.attachments.set(key, bytes);
    return bytes;
  }

  deleteAttachment(key: string): Promise<boolean> {
    this.attachments.delete(key);
    return this.store.deleteAttachment(key);
  }

  putSignal(meta: SignalMeta, samples: Uint8Array): Promise<void> {
    return this.store.putSignal(meta, samples);
  }
  putSignalFile(meta: SignalMeta, path: string): Promise<void> {
    return this.store.putSignalFile(meta, path);
  }
  tempDir(): Promise<string> {
    return this.store.tempDir();
  }
  getSignalMeta(id: string): Promise<SignalMeta | null> {
    return this.store.getSignalMeta(id);
  }
  getSignal(id: string): Promise<{ meta: SignalMeta; signal: Signal } | null> {
    return this.store.getSignal(id);
  }
  openSamples(id: string): Promise<{ meta: SignalMeta; source: SampleSource } | null> {
    return this.store.openSamples(id);
  }
  putDocument(collection: Collection, key: string, text: string, options?: { durable?: boolean }): Promise<void> {
    return this.store.putDocument(collection, key, text, options);
  }
  listDocuments(collection: Collection): Promise<string[]> {
    return this.store.listDocuments(collection);
  }
  listSignals(): Promise<string[]> {
    return this.store.listSignals();
  }
  deleteSignal(id: string): Promise<boolean> {
    return this.store.deleteSignal(id);
  }
  putAttachment(key: string, bytes: Uint8Array): Promise<void> {
    return this.store.putAttachment(key, bytes);
  }
  usage(): Promise<{ signals: number; bytes: number }> {
    return this.store.usage();
  }
  ping(): Promise<boolean> {
    return this.store.ping();
  }
  close(): Promise<void> {
    return this.store.close();
  }
}
