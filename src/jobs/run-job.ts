import { DomainError, locatedUnder } from '../common/errors.js';
import { canonicalJsonOnce } from '../common/canonical-json.js';
import { analyze, type ProgressListener } from '../engine/analyze.js';
import type { ChannelRunner } from '../engine/channel-runner.js';
import type { FeatureRecord } from '../engine/record.js';
import { renameDeprecated } from '../recipes/renames.js';
import { resolveRecipe, type ResolvedRecipe } from '../recipes/resolve.js';
import type { Signal, SignalDescription, SignalEvent } from '../signals/signal.js';
import { openSource } from './open-source.js';
import type { Store } from '../stores/store.js';
import { viewedShape, type JobSpec, type RunMode } from './spec.js';

/**
 * The record as stored: `result` as its canonical JSON (the text its hash was taken over), the rest
 * as ordinary JSON. Writing the numbers once instead of twice matters for small, frequent jobs.
 */
export function serializeRecord(record: FeatureRecord): string {
  const { result, ...rest } = record;
  const head = JSON.stringify(rest);
  return `${head.slice(0, -1)},"result":${canonicalJsonOnce(result)}}`;
}

export interface JobOutcome {
  recordKey: string;
  resultHash: string;
  /** false when the record was already stored (a redelivered or repeated job) */
  computed: boolean;
}

/**
 * Computes one job and stores its record under its key. The same function runs in the embedded
 * worker threads and in BullMQ workers, so both modes produce the same bytes. `options.signal`, when
 * given, must be the job's signal as `store.getSignal` would return it; it saves reading it back.
 */
export async function runJob(
  spec: JobSpec,
  store: Store,
  mode: RunMode,
  onProgress: ProgressListener = () => {},
  options: { checkpoint?: () => void; channels?: ChannelRunner; signal?: Signal } = {},
): Promise<JobOutcome> {
  const existing = await store.getDocument('records', spec.recordKey);
  if (existing !== null) {
    onProgress(1);
    return { recordKey: spec.recordKey, resultHash: (JSON.parse(existing) as { resultHash: string }).resultHash, computed: false };
  }
  // A signal handed over with the job (an upload kept in memory) is the stored one: same content hash.
  const opened = await openSource(store, spec.signalId, options.signal);
  if (!opened) throw new DomainError('signal-not-found', `signal ${spec.signalId} is not in the store`, { pointer: '/signal' });
  let record: FeatureRecord;
  try {
    const queued = spec.resolved ?? (await resolveLegacy(spec, opened.source));
    // A job queued before the 0.3.0 renames carries the old setting names.
    const resolved = { ...queued, recipe: renameDeprecated(queued.recipe).input as ResolvedRecipe['recipe'] };
    record = analyze(opened.source, resolved, {
      view: spec.view ?? null,
      signalId: spec.signalId,
      sha256: spec.sha256,
      recipeId: spec.recipeId,
      mode,
      onProgress,
      ...(options.checkpoint ? { checkpoint: options.checkpoint } : {}),
      ...(options.channels ? { channels: options.channels } : {}),
    });
  } finally {
    opened.close();
  }
  // Attachments first: once the record exists, everything it names can be fetched.
  for (const a of record.attachments ?? []) {
    const data = a.data!;
    await store.putAttachment(`${spec.recordKey}.${a.name}`, new Uint8Array(data.buffer, data.byteOffset, data.byteLength));
    delete a.data;
  }
  await store.putDocument('records', spec.recordKey, serializeRecord(record));
  return { recordKey: spec.recordKey, resultHash: record.resultHash, computed: true };
}

/** Jobs queued before the resolved recipe travelled with the spec are resolved here, as then. */
async function resolveLegacy(spec: JobSpec, signal: SignalDescription & { events?: SignalEvent[] | undefined }): Promise<ResolvedRecipe> {
  const shape = await locatedUnder('/signal', () => viewedShape(signal, spec.view ?? null));
  return locatedUnder('/recipe', () => resolveRecipe(spec.recipe, spec.recipeHash, shape));
}
