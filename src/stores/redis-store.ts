import { randomBytes } from 'node:crypto';
import { rmSync } from 'node:fs';
import { mkdir, open, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Redis } from 'ioredis';

/**
 * Samples are stored in values of at most this many bytes. Redis runs one command at a time: a
 * whole signal in one value held every client (job locks, stall checks, the queue) for the length
 * of one write or read, 1.6 s for 61 MB on the shared test Redis; a chunk holds them for
 * milliseconds. Chunks are written first with an expiry that the script storing the meta lifts, so
 * a write interrupted half-way leaves nothing behind for long.
 */
export const SAMPLE_CHUNK_BYTES = 4 * 1024 * 1024;
const PENDING_CHUNK_MS = 3_600_000;

/** Stores a signal unless its meta exists, so that storing the same content twice counts it once; makes its chunks permanent. */
const PUT_SIGNAL = `
for i = 4, #KEYS do redis.call('PERSIST', KEYS[i]) end
if redis.call('SETNX', KEYS[1], ARGV[1]) == 0 then return 0 end
redis.call('INCRBY', KEYS[2], ARGV[2])
redis.call('INCR', KEYS[3])
return 1`;
import { openSampleFile } from './sample-file.js';
import { checkKey, readWholeSignal, type Collection, type SignalMeta, type Store } from './store.js';

/**
 * Signals and documents in Redis, for workers on machines without a shared disk. A signal's meta
 * is written after every chunk of its samples, so no reader sees the meta without the samples.
 */
export class RedisStore implements Store {
  readonly kind = 'redis' as const;
  readonly redis: Redis;

  constructor(
    url: string,
    readonly prefix = 'rhythmetric',
  ) {
    this.redis = new Redis(url, { maxRetriesPerRequest: 2, lazyConnect: false, enableOfflineQueue: true });
    this.redis.on('error', () => {
      // Connection errors surface on the commands that fail; readiness reports them.
    });
  }

  private key(...parts: string[]): string {
    return [this.prefix, ...parts].join(':');
  }

  private chunkKeys(id: string, bytes: number): string[] {
    return Array.from({ length: Math.ceil(bytes / SAMPLE_CHUNK_BYTES) }, (_, n) => this.key('signal', id, 'samples', String(n)));
  }

  /** The chunks are written first (expiring), then one atomic script sets the meta, counts the usage and keeps the chunks. */
  private async commitSignal(meta: SignalMeta, writeChunks: (keys: string[]) => Promise<void>): Promise<void> {
    const id = checkKey(meta.id);
    const chunks = this.chunkKeys(id, meta.bytes);
    await writeChunks(chunks);
    await this.redis.eval(PUT_SIGNAL, 3 + chunks.length, this.key('signal', id, 'meta'), this.key('usage', 'bytes'), this.key('usage', 'signals'), ...chunks, JSON.stringify(meta), meta.bytes);
  }

  async putSignal(meta: SignalMeta, samples: Uint8Array): Promise<void> {
    await this.commitSignal(meta, async (keys) => {
      for (const [n, key] of keys.entries()) {
        const start = samples.byteOffset + n * SAMPLE_CHUNK_BYTES;
        const end = Math.min(samples.byteOffset + samples.byteLength, start + SAMPLE_CHUNK_BYTES);
        await this.redis.set(key, Buffer.from(samples.buffer, start, end - start), 'PX', PENDING_CHUNK_MS);
      }
    });
  }

  async putSignalFile(meta: SignalMeta, path: string): Promise<void> {
    try {
      const file = await open(path, 'r');
      try {
        await this.commitSignal(meta, async (keys) => {
          for (const [n, key] of keys.entries()) {
            const chunk = Buffer.alloc(Math.min(SAMPLE_CHUNK_BYTES, meta.bytes - n * SAMPLE_CHUNK_BYTES));
            const { bytesRead } = await file.read(chunk, 0, chunk.length, n * SAMPLE_CHUNK_BYTES);
            if (bytesRead !== chunk.length) throw new Error(`samples file ${path} ended after ${n * SAMPLE_CHUNK_BYTES + bytesRead} of ${meta.bytes} bytes`);
            await this.redis.set(key, chunk, 'PX', PENDING_CHUNK_MS);
          }
        });
      } finally {
        await file.close();
      }
    } finally {
      await rm(path, { force: true });
    }
  }

  async putAttachment(key: string, bytes: Uint8Array): Promise<void> {
    await this.redis.set(this.key('attachment', checkKey(key)), Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  }

  async getAttachment(key: string): Promise<Uint8Array | null> {
    return this.redis.getBuffer(this.key('attachment', checkKey(key)));
  }

  async deleteAttachment(key: string): Promise<boolean> {
    return (await this.redis.del(this.key('attachment', checkKey(key)))) > 0;
  }

  async tempDir(): Promise<string> {
    const dir = join(tmpdir(), 'rhythmetric-ingest');
    await mkdir(dir, { recursive: true });
    return dir;
  }

  async listSignals(): Promise<string[]> {
    const start = this.key('signal', '').length;
    return (await this.scanKeys(this.key('signal', '*', 'meta'))).map((k) => k.slice(start, -':meta'.length)).sort();
  }

  async deleteSignal(id: string): Promise<boolean> {
    const meta = await this.getSignalMeta(id);
    if (!meta) return false;
    const [[, removed]] = (await this.redis
      .multi()
      // 'samples' is the single value signals were stored in before chunks.
      .del(this.key('signal', id, 'meta'), this.key('signal', id, 'samples'), ...this.chunkKeys(id, meta.bytes))
      .decrby(this.key('usage', 'bytes'), meta.bytes)
      .decr(this.key('usage', 'signals'))
      .exec()) as [[unknown, number]];
    return removed > 0;
  }

  async deleteDocument(collection: Collection, key: string): Promise<boolean> {
    return (await this.redis.del(this.key(collection, checkKey(key)))) > 0;
  }

  async usage(): Promise<{ signals: number; bytes: number }> {
    const [bytes, signals] = await this.redis.mget(this.key('usage', 'bytes'), this.key('usage', 'signals'));
    return { signals: Number(signals ?? 0), bytes: Number(bytes ?? 0) };
  }

  private async scanKeys(pattern: string): Promise<string[]> {
    const found: string[] = [];
    let cursor = '0';
    do {
      const [next, keys] = await this.redis.scan(cursor, 'MATCH', pattern, 'COUNT', 500);
      cursor = next;
      found.push(...keys);
    } while (cursor !== '0');
    return found;
  }

  async getSignalMeta(id: string): Promise<SignalMeta | null> {
    const text = await this.redis.get(this.key('signal', checkKey(id), 'meta'));
    return text === null ? null : (JSON.parse(text) as SignalMeta);
  }

  getSignal(id: string) {
    return readWholeSignal(this, id);
  }

  /**
   * Reads must be synchronous (the engine is) and Redis answers asynchronously, so the samples are
   * first copied, one chunk at a time, into a file under tempDir(), which the source reads and
   * removes when it is closed: memory holds one chunk, the disk one copy of the stored bytes.
   */
  async openSamples(id: string) {
    const meta = await this.getSignalMeta(id);
    if (meta === null) return null;
    // Named after the store's prefix: the temp directory is shared by every Redis store on the machine.
    const path = join(await this.tempDir(), `${this.prefix.replace(/[^A-Za-z0-9_-]/g, '_')}-${randomBytes(8).toString('hex')}.spool`);
    let complete = false;
    try {
      const file = await open(path, 'w');
      try {
        complete = await this.spoolSamples(meta, async (chunk, position) => {
          for (let done = 0; done < chunk.length; ) done += (await file.write(chunk, done, chunk.length - done, position + done)).bytesWritten;
        });
      } finally {
        await file.close();
      }
      if (!complete) return null;
      return { meta, source: openSampleFile(path, meta, () => rmSync(path, { force: true })) };
    } finally {
      if (!complete) await rm(path, { force: true });
    }
  }

  /** Hands every stored chunk of a signal's samples to `write` in order; false when the signal was deleted meanwhile. */
  private async spoolSamples(meta: SignalMeta, write: (chunk: Buffer, position: number) => Promise<void>): Promise<boolean> {
    // Signals stored before chunks hold their samples in one value: read in chunk-sized ranges.
    const whole = this.key('signal', meta.id, 'samples');
    if ((await this.redis.exists(whole)) === 1) {
      for (let position = 0; position < meta.bytes; position += SAMPLE_CHUNK_BYTES) {
        const chunk = await this.redis.getrangeBuffer(whole, position, Math.min(meta.bytes, position + SAMPLE_CHUNK_BYTES) - 1);
        if (chunk.length === 0) return false;
        await write(chunk, position);
      }
      return true;
    }
    for (const [n, key] of this.chunkKeys(meta.id, meta.bytes).entries()) {
      const chunk = await this.redis.getBuffer(key);
      if (chunk === null) return false; // deleted while it was read
      await write(chunk, n * SAMPLE_CHUNK_BYTES);
    }
    return true;
  }

  async putDocument(collection: Collection, key: string, text: string): Promise<void> {
    await this.redis.set(this.key(collection, checkKey(key)), text);
  }

  async getDocument(collection: Collection, key: string): Promise<string | null> {
    return this.redis.get(this.key(collection, checkKey(key)));
  }

  async listDocuments(collection: Collection): Promise<string[]> {
    const start = this.key(collection, '').length;
    return (await this.scanKeys(this.key(collection, '*'))).map((k) => k.slice(start)).sort();
  }

  async ping(): Promise<boolean> {
    try {
      return (await this.redis.ping()) === 'PONG';
    } catch {
      return false;
    }
  }

  async close(): Promise<void> {
    if (this.redis.status === 'ready') await Promise.race([this.redis.quit().catch(() => undefined), new Promise((r) => setTimeout(r, 2000).unref())]);
    this.redis.disconnect();
  }
}
