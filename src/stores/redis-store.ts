import { Redis } from 'ioredis';
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

  async putSignal(meta: SignalMeta, samples: Uint8Array): Promise<void> {
    const id = checkKey(meta.id);
    await this.redis
      .multi()
      .set(this.key('signal', id, 'samples'), Buffer.from(samples.buffer, samples.byteOffset, samples.byteLength))
      .set(this.key('signal', id, 'meta'), JSON.stringify(meta))
      .exec();
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
    const found: string[] = [];
    let cursor = '0';
    const start = this.key(collection, '').length;
    do {
      const [next, keys] = await this.redis.scan(cursor, 'MATCH', this.key(collection, '*'), 'COUNT', 500);
      cursor = next;
      for (const k of keys) found.push(k.slice(start));
    } while (cursor !== '0');
    return found.sort();
  }

  async ping(): Promise<boolean> {
    try {
      return (await this.redis.ping()) === 'PONG';
    } catch {
      return false;
    }
  }

  async close(): Promise<void> {
    await this.redis.quit().catch(() => this.redis.disconnect());
  }
}
