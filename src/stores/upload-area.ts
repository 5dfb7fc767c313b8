import { readdir, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { reserveStorage, type Reservation, type Store } from './store.js';

/**
 * A temporary file untouched for this long belongs to a write that was interrupted (a crash, a
 * kill): live writes stream and touch their file all the time, and a request is cut off after
 * REQUEST_TIMEOUT_MS. Age, not name, decides, because the temp directory can be shared by other
 * processes (workers on a shared disk; every Redis-store process on a machine) mid-write.
 */
export const STALE_TEMP_MS = 60 * 60_000;

const PART = /^(\d+)\.part$/;
/** The files an upload keeps between requests; anything else in its directory is a leftover. */
const KEPT = /^(\d+\.part|\d+\.part\.sha256|upload\.json)$/;

export interface LeftoversRemoved {
  uploads: number;
  tempFiles: number;
}

/**
 * Resumable uploads in the store's temp directory (`uploads/<id>/<n>.part`). Each part holds a
 * storage reservation from the moment it is accepted until its upload completes, is abandoned or
 * expires, so parts count against MAX_STORE_BYTES exactly as the samples of single uploads do.
 */
export class UploadArea {
  private readonly held = new Map<string, Map<number, Reservation>>();
  private loaded: Promise<void> | null = null;

  constructor(private readonly store: Store) {}

  async root(): Promise<string> {
    return join(await this.store.tempDir(), 'uploads');
  }

  /** Takes up the reservations of parts left on disk by an earlier run (without a limit check: they are there). */
  private load(): Promise<void> {
    this.loaded ??= (async () => {
      for (const id of await readdir(await this.root()).catch(() => [] as string[])) await this.holdOnDisk(id);
    })();
    return this.loaded;
  }

  /** Holds the parts of one upload as they are on disk (again, after a failed completion). */
  async holdOnDisk(id: string): Promise<void> {
    const dir = join(await this.root(), id);
    for (const name of await readdir(dir).catch(() => [] as string[])) {
      const part = PART.exec(name);
      if (!part) continue;
      const size = await stat(join(dir, name)).then(
        (s) => s.size,
        () => 0,
      );
      this.remember(id, Number(part[1]), await reserveStorage(this.store, size, 0));
    }
  }

  private remember(id: string, part: number, reservation: Reservation): void {
    let parts = this.held.get(id);
    if (!parts) this.held.set(id, (parts = new Map()));
    parts.get(part)?.release();
    parts.set(part, reservation);
  }

  /**
   * Reserves room for a part of `bytes` before it is kept; throws StorageFullError (507) when the
   * store, the reservations of writes under way and the parts already held leave too little.
   */
  async reservePart(bytes: number, limit: number): Promise<Reservation> {
    await this.load();
    return reserveStorage(this.store, bytes, limit);
  }

  /** The part is on disk: its reservation stays until the upload ends (a part sent again replaces the old one's). */
  keepPart(id: string, part: number, reservation: Reservation): void {
    this.remember(id, part, reservation);
  }

  /** Releases every part's reservation of an upload whose files are gone or are being stored. */
  release(id: string): void {
    for (const reservation of this.held.get(id)?.values() ?? []) reservation.release();
    this.held.delete(id);
  }

  /** Removes an upload and its reservations. */
  async remove(id: string): Promise<void> {
    await this.load();
    await rm(join(await this.root(), id), { recursive: true, force: true });
    this.release(id);
  }

  /**
   * Removes uploads that received nothing for `maxAgeMs` (their directory's last change), the
   * leftovers of interrupted part writes inside live uploads, and temp files of interrupted writes.
   */
  async sweep(maxAgeMs: number, now = Date.now()): Promise<LeftoversRemoved> {
    await this.load();
    const removed: LeftoversRemoved = { uploads: 0, tempFiles: 0 };
    const temp = await this.store.tempDir();
    const root = await this.root();
    const stale = async (path: string, ageMs: number) => {
      const info = await stat(path).catch(() => null);
      return info !== null && info.mtimeMs < now - ageMs;
    };
    for (const id of await readdir(root).catch(() => [] as string[])) {
      const dir = join(root, id);
      if (await stale(dir, maxAgeMs)) {
        await this.remove(id);
        removed.uploads++;
        continue;
      }
      for (const name of await readdir(dir).catch(() => [] as string[])) {
        if (!KEPT.test(name) && (await stale(join(dir, name), STALE_TEMP_MS))) {
          await rm(join(dir, name), { force: true });
          removed.tempFiles++;
        }
      }
    }
    for (const entry of await readdir(temp, { withFileTypes: true })) {
      if (entry.isFile() && (await stale(join(temp, entry.name), STALE_TEMP_MS))) {
        await rm(join(temp, entry.name), { force: true });
        removed.tempFiles++;
      }
    }
    return removed;
  }
}

const areas = new WeakMap<Store, UploadArea>();

/** The one upload area of a store in this process (the routes and the sweep share its reservations). */
export function uploadAreaOf(store: Store): UploadArea {
  let area = areas.get(store);
  if (!area) areas.set(store, (area = new UploadArea(store)));
  return area;
}
