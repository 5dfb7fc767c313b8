import { randomBytes } from 'node:crypto';
import { link, mkdir, open, readFile, readdir, rename, rm, stat } from 'node:fs/promises';
import { closeSync, fdatasyncSync, openSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { isMainThread } from 'node:worker_threads';
import { openSampleFile } from './sample-file.js';
import { checkKey, readWholeSignal, type Collection, type SignalMeta, type Store } from './store.js';

/** The samples file's extension for each encoding; signals stored before encodings are float64. */
const EXTENSIONS = { float64: 'f64', float32: 'f32', int16: 'i16' } as const;

/**
 * On a job thread, documents and attachments are written synchronously: the thread has nothing else
 * to do meanwhile, and each asynchronous step is a round trip through the process's shared libuv
 * pool, which the API's own file work keeps busy (a flushed 60 KB write took 2.2 ms instead of 4.0,
 * median, on the shared machine at a load average of 7). The event loop of the API never does this.
 */
const SYNC_WRITES = !isMainThread;

/**
 * Everything under one data directory:
 * `signals/<id>.f64`, `.f32` or `.i16` (little-endian samples in the meta's encoding),
 * `signals/<id>.json` (meta, written last, so a signal exists only once both are complete), and
 * `<collection>/<key>.json`.
 */
export class FilesystemStore implements Store {
  readonly kind = 'filesystem' as const;
  private ready: Promise<void> | null = null;
  private usageCache: Promise<{ signals: number; bytes: number }> | null = null;

  constructor(readonly dataDir: string) {}

  private async init(): Promise<void> {
    this.ready ??= (async () => {
      for (const dir of ['signals', 'recipes', 'records', 'jobs', 'job-index', 'studies', 'runs', 'upload-signals', 'attachments', 'tmp']) await mkdir(join(this.dataDir, dir), { recursive: true });
    })();
    return this.ready;
  }

  private async writeAtomic(path: string, data: string | Uint8Array, durable = true): Promise<void> {
    if (SYNC_WRITES) {
      await this.init();
      this.writeAtomicSync(path, data, durable);
      return;
    }
    const temp = await this.writeTemp(data, durable);
    await this.commitTemp(temp, path);
  }

  /** writeTemp and commitTemp in one synchronous step, for job threads (SYNC_WRITES). */
  private writeAtomicSync(path: string, data: string | Uint8Array, durable: boolean): void {
    const temp = join(this.dataDir, 'tmp', `${randomBytes(8).toString('hex')}.part`);
    try {
      const fd = openSync(temp, 'w');
      try {
        writeFileSync(fd, data);
        if (durable) fdatasyncSync(fd);
      } finally {
        closeSync(fd);
      }
      renameSync(temp, path);
    } catch (error) {
      rmSync(temp, { force: true });
      throw error;
    }
  }

  /** Writes (and optionally flushes) a temp file under tmp/; commitTemp renames it into place. */
  private async writeTemp(data: string | Uint8Array, durable: boolean): Promise<string> {
    await this.init();
    const temp = join(this.dataDir, 'tmp', `${randomBytes(8).toString('hex')}.part`);
    const handle = await open(temp, 'w');
    try {
      await handle.writeFile(data);
      // fdatasync: the data and the size a reader needs, without the file times a full fsync also writes.
      if (durable) await handle.datasync();
    } catch (error) {
      await handle.close();
      await rm(temp, { force: true });
      throw error;
    }
    await handle.close();
    return temp;
  }

  private async commitTemp(temp: string, path: string): Promise<void> {
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
    // Both files are written and flushed at once; the samples are renamed into place before the
    // meta, so a signal exists for readers only once both are complete.
    const [samplesTemp, metaTemp] = await Promise.all([this.writeTemp(samples, true), this.writeTemp(JSON.stringify(meta), true)]);
    await this.commitTemp(samplesTemp, this.samplesPath(meta));
    await this.publishMeta(metaTemp, meta);
  }

  /**
   * Makes a signal visible by linking its meta into place, which fails when another writer of the
   * same content got there first: only the writer that created the signal counts its bytes.
   */
  private async publishMeta(metaTemp: string, meta: SignalMeta): Promise<void> {
    try {
      await link(metaTemp, join(this.dataDir, 'signals', `${meta.id}.json`));
      await this.adjustUsage(1, meta.bytes);
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
    } finally {
      await rm(metaTemp, { force: true });
    }
  }

  async putSignalFile(meta: SignalMeta, path: string): Promise<void> {
    const id = checkKey(meta.id);
    if (await this.getSignalMeta(id)) {
      await rm(path, { force: true });
      return;
    }
    const handle = await open(path, 'r+');
    try {
      await handle.sync();
    } finally {
      await handle.close();
    }
    await rename(path, this.samplesPath(meta));
    await this.publishMeta(await this.writeTemp(JSON.stringify(meta), true), meta);
  }

  async putAttachment(key: string, bytes: Uint8Array): Promise<void> {
    await this.writeAtomic(join(this.dataDir, 'attachments', `${checkKey(key)}.bin`), bytes);
  }

  async getAttachment(key: string): Promise<Uint8Array | null> {
    try {
      return await readFile(join(this.dataDir, 'attachments', `${checkKey(key)}.bin`));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw error;
    }
  }

  async deleteAttachment(key: string): Promise<boolean> {
    const path = join(this.dataDir, 'attachments', `${checkKey(key)}.bin`);
    const existed = (await this.getAttachment(key)) !== null;
    await rm(path, { force: true });
    return existed;
  }

  async tempDir(): Promise<string> {
    await this.init();
    return join(this.dataDir, 'tmp');
  }

  async listSignals(): Promise<string[]> {
    await this.init();
    return (await readdir(join(this.dataDir, 'signals')))
      .filter((n) => n.endsWith('.json'))
      .map((n) => n.slice(0, -5))
      .sort();
  }

  async deleteSignal(id: string): Promise<boolean> {
    const meta = await this.getSignalMeta(id);
    if (!meta) return false;
    // Meta first: once it is gone the signal no longer exists for readers, whatever happens next.
    await rm(join(this.dataDir, 'signals', `${checkKey(id)}.json`), { force: true });
    await rm(this.samplesPath(meta), { force: true });
    await this.adjustUsage(-1, -meta.bytes);
    return true;
  }

  async deleteDocument(collection: Collection, key: string): Promise<boolean> {
    const path = join(this.dataDir, collection, `${checkKey(key)}.json`);
    const existed = (await this.readOrNull(path)) !== null;
    await rm(path, { force: true });
    return existed;
  }

  /** Scanned once, then kept up to date by this process's writes and deletes. */
  usage(): Promise<{ signals: number; bytes: number }> {
    this.usageCache ??= (async () => {
      let bytes = 0;
      const ids = await this.listSignals();
      for (const id of ids) bytes += (await this.getSignalMeta(id))?.bytes ?? 0;
      return { signals: ids.length, bytes };
    })();
    return this.usageCache.then((u) => ({ ...u }));
  }

  private async adjustUsage(signals: number, bytes: number): Promise<void> {
    if (!this.usageCache) return;
    const current = await this.usageCache;
    this.usageCache = Promise.resolve({ signals: current.signals + signals, bytes: current.bytes + bytes });
  }

  async getSignalMeta(id: string): Promise<SignalMeta | null> {
    const text = await this.readOrNull(join(this.dataDir, 'signals', `${checkKey(id)}.json`));
    return text === null ? null : (JSON.parse(text) as SignalMeta);
  }

  private samplesPath(meta: SignalMeta): string {
    return join(this.dataDir, 'signals', `${checkKey(meta.id)}.${EXTENSIONS[meta.encoding ?? 'float64']}`);
  }

  getSignal(id: string) {
    return readWholeSignal(this, id);
  }

  async openSamples(id: string) {
    const meta = await this.getSignalMeta(id);
    if (!meta) return null;
    try {
      return { meta, source: openSampleFile(this.samplesPath(meta), meta) };
    } catch (error) {
      // Deleted between the meta and the samples: as if it had not been there.
      if ((error as NodeJS.ErrnoException).code === 'ENOENT' && !(await this.getSignalMeta(id))) return null;
      throw error;
    }
  }

  async putDocument(collection: Collection, key: string, text: string, options: { durable?: boolean } = {}): Promise<void> {
    await this.writeAtomic(join(this.dataDir, collection, `${checkKey(key)}.json`), text, options.durable ?? true);
  }

  async getDocument(collection: Collection, key: string): Promise<string | null> {
    return this.readOrNull(join(this.dataDir, collection, `${checkKey(key)}.json`));
  }

  async listDocuments(collection: Collection): Promise<string[]> {
    await this.init();
    const names = await readdir(join(this.dataDir, collection));
    return names
      .filter((n) => n.endsWith('.json'))
      .map((n) => n.slice(0, -5))
      .sort();
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
