import { DomainError } from '../common/errors.js';
import { materialize, type SampleSource } from '../signals/sample-source.js';
import type { EncodingFields } from '../signals/sample-encoding.js';
import type { Signal, SignalDescription, SignalEvent } from '../signals/signal.js';

/**
 * What is kept about a stored signal besides its samples. The encoding fields say how the samples
 * are kept (absent: float64); reads give the same float64 values whatever it is.
 */
export interface SignalMeta extends SignalDescription, EncodingFields {
  id: string;
  sha256: string;
  /** the tenant that uploaded it; only that tenant's keys can see or use it */
  tenant: string;
  nonFiniteSamples: number;
  events: SignalEvent[];
  /** bytes of the samples as stored (what MAX_STORE_BYTES counts): 2, 4 or 8 a sample by encoding */
  bytes: number;
  /** what the upload's checks noticed but let through (e.g. an implausible amplitude for the unit) */
  warnings?: string[];
  storedAt: string;
}

export type Collection = 'recipes' | 'records' | 'jobs' | 'job-index' | 'studies' | 'runs' | 'upload-signals';

/**
 * Content-addressed storage for signals and JSON documents. Every write is atomic: a reader sees
 * the whole value or nothing, never a half-written one. Writing the same key twice with the same
 * bytes is harmless, which is what makes redelivered jobs safe.
 */
export interface Store {
  readonly kind: 'filesystem' | 'redis';
  /** Stores `meta.bytes` bytes of samples, little-endian in the meta's encoding, [epoch][channel][sample]. */
  putSignal(meta: SignalMeta, samples: Uint8Array): Promise<void>;
  /** Stores samples already written (little-endian, in the meta's encoding) to `path` under tempDir(); the file is moved or consumed. */
  putSignalFile(meta: SignalMeta, path: string): Promise<void>;
  /** A directory for files on their way into the store (same file system for filesystem stores). */
  tempDir(): Promise<string>;
  getSignalMeta(id: string): Promise<SignalMeta | null>;
  /** The whole signal as float64 in memory: {@link readWholeSignal} over {@link Store.openSamples}. */
  getSignal(id: string): Promise<{ meta: SignalMeta; signal: Signal } | null>;
  /**
   * The signal's samples, read a row span at a time as float64 (converted from the stored
   * encoding), holding a bounded buffer instead of the whole recording; null when there is no such
   * signal. The caller closes the source.
   */
  openSamples(id: string): Promise<{ meta: SignalMeta; source: SampleSource } | null>;
  /**
   * `durable: false` skips the flush to disk: the write is still atomic (a crash leaves the old or
   * the new text), but a power loss may lose it. Used for job states that can be recovered.
   */
  putDocument(collection: Collection, key: string, text: string, options?: { durable?: boolean }): Promise<void>;
  getDocument(collection: Collection, key: string): Promise<string | null>;
  listDocuments(collection: Collection): Promise<string[]>;
  listSignals(): Promise<string[]>;
  /** Removes a signal (samples and meta); false when it was not there. */
  deleteSignal(id: string): Promise<boolean>;
  deleteDocument(collection: Collection, key: string): Promise<boolean>;
  /** Binary attachments of records (time–frequency matrices), written atomically. */
  putAttachment(key: string, bytes: Uint8Array): Promise<void>;
  getAttachment(key: string): Promise<Uint8Array | null>;
  deleteAttachment(key: string): Promise<boolean>;
  /** stored signals and their sample bytes */
  usage(): Promise<{ signals: number; bytes: number }>;
  ping(): Promise<boolean>;
  close(): Promise<void>;
}

/** How a worker thread or process reaches the same store as the API. */
export type StoreConfig = { kind: 'filesystem'; dataDir: string } | { kind: 'redis'; url: string; prefix: string };

/** Every sample of a stored signal in one Float64Array: the one way stores implement getSignal. */
export async function readWholeSignal(store: Pick<Store, 'openSamples'>, id: string): Promise<{ meta: SignalMeta; signal: Signal } | null> {
  const opened = await store.openSamples(id);
  if (opened === null) return null;
  try {
    return { meta: opened.meta, signal: materialize(opened.source) };
  } finally {
    opened.source.close();
  }
}

/** Too little room under the configured store limit; nothing was stored. */
export class StorageFullError extends DomainError {
  override readonly name = 'StorageFullError';
  constructor(
    readonly needed: number,
    readonly used: number,
    readonly limit: number,
  ) {
    super('storage-full', `storing ${needed} bytes would exceed this server's limit of ${limit} bytes (${used} in use or reserved); nothing was stored`);
  }
}

const reserved = new WeakMap<Store, number>();

/** Bytes held against the store limit until released (idempotent). */
export interface Reservation {
  readonly bytes: number;
  release(): void;
}

/**
 * Reserves `bytes` against `limit` (0 = none, and the bytes are still counted for others). The
 * check and the reservation happen together after the usage is read, so concurrent writes in one
 * process cannot overshoot the limit together.
 */
export async function reserveStorage(store: Store, bytes: number, limit: number): Promise<Reservation> {
  if (limit > 0) {
    const { bytes: used } = await store.usage();
    const pending = reserved.get(store) ?? 0;
    if (used + pending + bytes > limit) throw new StorageFullError(bytes, used + pending, limit);
  }
  reserved.set(store, (reserved.get(store) ?? 0) + bytes);
  let held = true;
  return {
    bytes,
    release() {
      if (!held) return;
      held = false;
      reserved.set(store, (reserved.get(store) ?? bytes) - bytes);
    },
  };
}

/**
 * Runs `write` with `bytes` reserved against `limit` (0 = none). A reservation is released only
 * after the write, so the count errs on the safe side while a write lands.
 */
export async function withStorageReservation<T>(store: Store, bytes: number, limit: number, write: () => Promise<T>): Promise<T> {
  if (limit <= 0) return write();
  const reservation = await reserveStorage(store, bytes, limit);
  try {
    return await write();
  } finally {
    reservation.release();
  }
}

const SAFE_KEY = /^[A-Za-z0-9_.-]{1,240}$/;

/** Keys reach file names and Redis keys: only a safe alphabet is accepted. */
export function checkKey(key: string): string {
  if (!SAFE_KEY.test(key) || key.startsWith('.')) throw new RangeError(`unsafe store key "${key}"`);
  return key;
}
