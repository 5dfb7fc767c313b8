import type { Config } from '../config.js';
import { locatedUnder } from '../common/errors.js';
import { createDataRoot, type DataRoot } from '../signals/data-root.js';
import { ingestFile, type IngestDescription } from '../stores/ingest.js';
import type { SignalMeta, Store } from '../stores/store.js';
import type { SignalEvent } from '../signals/signal.js';
import { ProblemError } from './problem.js';
import { receiveToFile } from './receive.js';
import { openRemote } from './remote-source.js';

/** A recording the server fetches itself: a file under DATA_ROOT or an allow-listed URL. */
/** How a raw file is to be read, as clients describe it for imports and resumable uploads. */
export interface FileDescription {
  format: 'edf' | 'float32';
  samplingRate?: number | undefined;
  channels?: string[] | undefined;
  epochCount?: number | undefined;
  unit?: string | undefined;
  voltage?: boolean | undefined;
  nonFinite?: 'reject' | 'keep' | undefined;
  events?: SignalEvent[] | undefined;
}

export type ImportSource = ({ file: string; url?: undefined } | { url: string; file?: undefined }) & FileDescription;

const roots = new Map<string, Promise<DataRoot>>();

/**
 * Imports a file or URL through the same bounded-memory ingest as uploads. Both are off unless
 * configured; paths are confined to the data root (symlinks included) and URLs to the allow-list,
 * with private addresses refused unless explicitly allowed.
 */
export async function importSignal(config: Readonly<Config>, store: Store, source: ImportSource, tenant: string, pointer: string): Promise<SignalMeta> {
  const description = describeIngest(source, pointer);
  const options = { tenant, limits: config.signalLimits, maxStoreBytes: config.maxStoreBytes };
  return locatedUnder(pointer, async () => {
    if (source.file !== undefined) {
      if (!config.dataRoot) throw new ProblemError('source-refused', 'reading files from the server is off; the operator can set DATA_ROOT', '/file');
      let root = roots.get(config.dataRoot);
      if (!root) roots.set(config.dataRoot, (root = createDataRoot(config.dataRoot)));
      const opened = await (await root).open(source.file);
      try {
        if (opened.size > config.bodyLimitBytes) throw new ProblemError('payload-too-large', `the file has ${opened.size} bytes, over this server's limit of ${config.bodyLimitBytes}`, '/file');
        return await ingestFile(store, { handle: opened.handle, size: opened.size }, description, options);
      } finally {
        await opened.handle.close();
      }
    }
    if (config.fetchAllowedHosts.length === 0) throw new ProblemError('source-refused', 'fetching URLs is off; the operator can set FETCH_ALLOWED_HOSTS', '/url');
    const remote = await openRemote(source.url!, {
      allowedHosts: config.fetchAllowedHosts,
      allowPrivate: config.fetchAllowPrivate,
      maxBytes: config.bodyLimitBytes,
      timeoutMs: config.fetchTimeoutMs,
      maxRedirects: config.fetchMaxRedirects,
    });
    const raw = await receiveToFile(remote.stream, await store.tempDir(), config.bodyLimitBytes);
    try {
      return await ingestFile(store, raw.path, description, options);
    } finally {
      await raw.remove();
    }
  });
}

/** The ingest description of a file; a float32 file needs its sampling rate and channel names. */
export function describeIngest(d: FileDescription, pointer: string): IngestDescription {
  if (d.format === 'edf') {
    if (d.events !== undefined) throw new ProblemError('invalid-signal', 'an EDF+ file brings its events as annotations; events are for float32 files', `${pointer}/events`);
    return { format: 'edf', channels: d.channels, samplingRate: d.samplingRate };
  }
  if (d.samplingRate === undefined || d.channels === undefined) {
    throw new ProblemError('invalid-signal', 'a float32 file needs samplingRate and channels', `${pointer}/${d.samplingRate === undefined ? 'samplingRate' : 'channels'}`);
  }
  return { format: 'float32', samplingRate: d.samplingRate, channels: d.channels, epochCount: d.epochCount ?? 1, unit: d.unit, voltage: d.voltage, nonFinite: d.nonFinite, events: d.events };
}
