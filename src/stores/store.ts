import { DomainError } from '../common/errors.js';
import type { Signal, SignalDescription, SignalEvent } from '../signals/signal.js';

/** What is kept about a stored signal besides its samples. */
export interface SignalMeta extends SignalDescription {
  id: string;
  sha256: string;
  /** the tenant that uploaded it; only that tenant's keys can see or use it */
  tenant: string;
  nonFiniteSamples: number;
  events: SignalEvent[];
  /** bytes of float64 samples */
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
  putSignal(meta: SignalMeta, samples: Uint8Array): Promise<void>;
  /** Stores samples already written (little-endian float64) to `path` under tempDir(); the file is moved or consumed. */
  putSignalFile(meta: SignalMeta, path: string): Promise<void>;
  /** A directory for files on their way into the store (same file system for filesystem stores). */
  tempDir(): Promise<string>;
  getSignalMeta(id: string): Promise<SignalMeta | null>;
  getSignal(id: string): Promise<{ meta: SignalMeta; signal: Signal } | null>;
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

export function signalFromParts(meta: SignalMeta, samples: Uint8Array): Signal {
  if (samples.byteLength !== meta.bytes) {
    throw new Error(`stored samples of ${meta.id} have ${samples.byteLength} bytes, expected ${meta.bytes}`);
  }
  const aligned = samples.byteOffset % 8 === 0 && samples.buffer instanceof ArrayBuffer;
  const copy = aligned ? new Float64Array(samples.buffer, samples.byteOffset, meta.bytes / 8) : new Float64Array(meta.bytes / 8);
  if (!aligned) new Uint8Array(copy.buffer).set(samples);
  const signal: Signal = {
    samplingRate: meta.samplingRate,
    channels: meta.channels,
    unit: meta.unit,
    epochCount: meta.epochCount,
    samplesPerEpoch: meta.samplesPerEpoch,
    data: copy,
  };
  if (meta.events.length > 0) signal.events = meta.events;
  return signal;
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
