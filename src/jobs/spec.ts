import { hashCanonical, sha256Hex } from '../common/hash.js';
import type { ResolvedRecipe, SignalShape } from '../recipes/resolve.js';
import type { Problem } from '../common/errors.js';
import { resolveView } from '../signals/view.js';
import type { SignalDescription, SignalEvent } from '../signals/signal.js';
import { ENGINE_VERSION } from '../engine/version.js';
import type { Recipe } from '../recipes/schema.js';
import type { SignalView } from '../signals/view.js';

export const JOB_STATES = ['queued', 'running', 'succeeded', 'failed', 'canceled'] as const;
export type JobState = (typeof JOB_STATES)[number];

/** Everything a worker needs; small enough to travel through Redis. The samples stay in the store. */
export interface JobSpec {
  tenant: string;
  signalId: string;
  sha256: string;
  recipeId: string;
  recipeHash: string;
  recipe: Recipe;
  recordKey: string;
  /** the part of the stored signal to analyze; null = all of it */
  view?: SignalView | null;
  /**
   * the recipe as resolved against the signal's shape with the server's limits when the job was
   * planned, so that the worker does not resolve it again (with other limits); absent in jobs
   * queued by earlier versions
   */
  resolved?: ResolvedRecipe;
  /**
   * Free labels a client attaches at submission (e.g. `study`), listed with the job so dashboards
   * can filter without one lookup per job; not part of the job id or the record.
   */
  labels?: Record<string, string>;
}

/** RFC 9457 problem details, as stored on a failed job. */
export type JobProblem = Problem;

export interface JobView {
  id: string;
  tenant: string;
  state: JobState;
  /** 0..1 */
  progress: number;
  signal: string;
  recipe: string;
  /** the recipe's method, so a job list needs no recipe lookup per job */
  method: string;
  labels: Record<string, string>;
  recordKey: string;
  resultHash: string | null;
  attempts: number;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  problem: JobProblem | null;
}

/**
 * A record is stored under (tenant, signal hash, recipe hash, engine version): equal inputs can only
 * write equal bytes, and one tenant deleting its data never removes another tenant's record.
 */
export function recordKeyOf(tenant: string, sha256: string, recipeHash: string, view: SignalView | null = null, engineVersion = ENGINE_VERSION): string {
  const part = view ? `.${hashCanonical(view).slice(0, 16)}` : '';
  return `${tenant}.${sha256}.${recipeHash}${part}.${engineVersion}`;
}

/** What the recipe is resolved against: the signal as the view leaves it. */
export function viewedShape(meta: SignalDescription & { events?: SignalEvent[] | undefined }, view: SignalView | null): SignalShape {
  const events = meta.events ? { events: meta.events } : {};
  if (!view) return { samplingRate: meta.samplingRate, epochCount: meta.epochCount, samplesPerEpoch: meta.samplesPerEpoch, channels: meta.channels, ...events };
  const resolved = resolveView(meta, view);
  return { samplingRate: meta.samplingRate, epochCount: meta.epochCount, samplesPerEpoch: resolved.endSample - resolved.startSample, channels: meta.channels, ...events };
}

/** Job ids follow from the record key (which names the tenant), so an identical submission finds the existing job. */
export function jobIdOf(recordKey: string): string {
  return `job_${sha256Hex(recordKey).slice(0, 32)}`;
}

/** A job that has not started yet. */
export function newJobView(id: string, spec: JobSpec, createdAt: string): JobView {
  return {
    id,
    tenant: spec.tenant,
    state: 'queued',
    progress: 0,
    signal: spec.signalId,
    recipe: spec.recipeId,
    method: spec.recipe.method,
    labels: { ...spec.labels },
    recordKey: spec.recordKey,
    resultHash: null,
    attempts: 0,
    createdAt,
    startedAt: null,
    finishedAt: null,
    problem: null,
  };
}

export function isFinished(state: JobState): boolean {
  return state === 'succeeded' || state === 'failed' || state === 'canceled';
}
