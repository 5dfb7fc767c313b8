import { randomBytes } from 'node:crypto';
import { mkdir, open, readdir, readFile, rename, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { checkKey, signalFromParts, type Collection, type SignalMeta, type Store } from './store.js';

/**
 * Everything under one data directory:
 * `signals/<id>.f64` (little-endian float64 samples), `signals/<id>.json` (meta, written last, so a
 * signal exists only once both are complete), and `<collection>/<key>.json`.
 */
export class FilesystemStore implements Store {
  readonly kind = 'filesystem' as const;
  private ready: Promise<void> | null = null;

  constructor(readonly dataDir: string) {}

  private async init(): Promise<void> {
    this.ready ??= (async () => {
      for (const dir of ['signals', 'recipes', 'records', 'jobs', 'tmp']) await mkdir(join(this.dataDir, dir), { recursive: true });
    })();
    return this.ready;
  }

  private async writeAtomic(path: string, data: string | Uint8Array): Promise<void> {
    await this.init();
    const temp = join(this.dataDir, 'tmp', `${randomBytes(8).toString('hex')}.part`);
    const handle = await open(temp, 'w');
    try {
      await handle.writeFile(data);
      await handle.sync();
    } finally {
      await handle.close();
    }
    try {
      await rename(temp, path);
    } catch (error) {
      await rm(temp, { force: true });
      throw error;
    }
  }

  async putSignal(meta: SignalMeta, samples: Uint8Array): Promise<void> {
    const id = checkKey(meta.id);
    if (await this.getSignalMeta(id)) return;
    await this.writeAtomic(join(this.dataDir, 'signals', `${id}.f64`), samples);
    await this.writeAtomic(join(this.dataDir, 'signals', `${id}.json`), JSON.stringify(meta));
  }

  async getSignalMeta(id: string): Promise<SignalMeta | null> {
    const text = await this.readOrNull(join(this.dataDir, 'signals', `${checkKey(id)}.json`));
    return text === null ? null : (JSON.parse(text) as SignalMeta);
  }

  async getSignal(id: string) {
    const meta = await this.getSignalMeta(id);
    if (!meta) return null;
    const samples = await readFile(join(this.dataDir, 'signals', `${checkKey(id)}.f64`));
    return { meta, signal: signalFromParts(meta, samples) };
  }

  async putDocument(collection: Collection, key: string, text: string): Promise<void> {
    await this.writeAtomic(join(this.dataDir, collection, `${checkKey(key)}.json`), text);
  }

  async getDocument(collection: Collection, key: string): Promise<string | null> {
    return this.readOrNull(join(this.dataDir, collection, `${checkKey(key)}.json`));
  }

  async listDocuments(collection: Collection): Promise<string[]> {
    await this.init();
    const names = await readdir(join(this.dataDir, collection));
    return names.filter((n) => n.endsWith('.json')).map((n) => n.slice(0, -5)).sort();
  }

  async ping(): Promise<boolean> {
    await this.init();
    return (await stat(this.dataDir)).isDirectory();
  }

  async close(): Promise<void> {}

  private async readOrNull(path: string): Promise<string | null> {
    try {
      return await readFile(path, 'utf8');
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw error;
    }
  }
}
