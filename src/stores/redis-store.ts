import { mkdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Redis } from 'ioredis';

/** Redis strings hold at most 512 MiB. */
const REDIS_VALUE_LIMIT = 512 * 1024 * 1024;

/** Stores a signal unless its meta exists, so that storing the same content twice counts it once. */
const PUT_SIGNAL = `
if redis.call('SETNX', KEYS[1], ARGV[1]) == 0 then return 0 end
redis.call('SET', KEYS[2], ARGV[2])
redis.call('INCRBY', KEYS[3], ARGV[3])
redis.call('INCR', KEYS[4])
return 1`;
import { checkKey, signalFromParts, type Collection, type SignalMeta, type Store } from './store.js';

/**
 * Signals and documents in Redis, for workers on machines without a shared disk. A signal's meta
 * and samples are written in one MULTI transaction, so no reader sees one without the other.
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

  /** One atomic script: the meta is set only when absent, and only then are samples and usage written. */
  async putSignal(meta: SignalMeta, samples: Uint8Array): Promise<void> {
    const id = checkKey(meta.id);
    await this.redis.eval(
      PUT_SIGNAL,
      4,
      this.key('signal', id, 'meta'),
      this.key('signal', id, 'samples'),
      this.key('usage', 'bytes'),
      this.key('usage', 'signals'),
      JSON.stringify(meta),
      Buffer.from(samples.buffer, samples.byteOffset, samples.byteLength),
      meta.bytes,
    );
  }

  async putSignalFile(meta: SignalMeta, path: string): Promise<void> {
    try {
      if (meta.bytes > REDIS_VALUE_LIMIT) {
        throw new RangeError(`a signal of ${meta.bytes} bytes exceeds what one Redis value can hold (${REDIS_VALUE_LIMIT}); use STORE=filesystem on a shared disk for recordings this large`);
      }
      await this.putSignal(meta, await readFile(path));
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
      .del(this.key('signal', id, 'meta'), this.key('signal', id, 'samples'))
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

  async getSignal(id: string) {
    const [[, metaText], [, samples]] = (await this.redis
      .multi()
      .get(this.key('signal', checkKey(id), 'meta'))
      .getBuffer(this.key('signal', id, 'samples'))
      .exec()) as [[unknown, string | null], [unknown, Buffer | null]];
    if (metaText === null || samples === null) return null;
    const meta = JSON.parse(metaText) as SignalMeta;
    return { meta, signal: signalFromParts(meta, samples) };
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
