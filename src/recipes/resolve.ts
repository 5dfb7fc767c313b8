import { methodOf } from '../methods/registry.js';
import type { CostEstimate, DerivedSettings, RecipeLimits, SignalShape } from '../methods/fit.js';
import { DEFAULT_RECIPE_LIMITS as DEFAULTS, overLimit, unfit } from '../methods/fit.js';
import type { Recipe } from './schema.js';

export { binFrequency, countBins, DEFAULT_MAX_JOB_BYTES, DEFAULT_RECIPE_LIMITS, type CostEstimate, type DerivedSettings, type RecipeLimits, type SignalShape } from '../methods/fit.js';

export interface ResolvedRecipe<R extends Recipe = Recipe> {
  recipe: R;
  hash: string;
  derived: DerivedSettings;
  warnings: string[];
  /** estimated peak memory and work of the job (not part of the record) */
  cost: CostEstimate;
}

/**
 * Checks a normalized recipe against the signal it will run on, derives the sample counts and
 * estimates the job's cost, through the recipe's method module. Everything that would make the
 * computation meaningless, or larger than this server accepts, is refused here, before any work
 * starts (and, over HTTP, before anything is queued).
 */
export function resolveRecipe<R extends Recipe>(recipe: R, hash: string, shape: SignalShape, limits: Partial<RecipeLimits> = {}): ResolvedRecipe<R> {
  const bounds: RecipeLimits = { ...DEFAULTS, ...limits };
  const method = methodOf(recipe);
  checkGapPolicy(recipe, shape, method.leavesOutSegments === true);
  const { derived, warnings } = method.fit(recipe, shape, bounds);
  const cost = method.cost(recipe, derived, shape);
  checkCost(cost, bounds);
  return { recipe, hash, derived, warnings, cost };
}

/**
 * Gaps as bad spans need something to leave out around them: Welch segments, or the epochs that
 * epoching cuts. A whole-recording estimate (multitaper, periodogram, time–frequency) of an unepoched
 * continuous signal would have to take the gap in.
 */
function checkGapPolicy(recipe: Recipe, shape: SignalShape, leavesOutSegments: boolean): void {
  if (recipe.nonFinite !== 'bad-span' || recipe.epoching !== null || (shape.epochCount ?? 1) !== 1 || leavesOutSegments) return;
  throw unfit(`"nonFinite": "bad-span" leaves out what overlaps a gap, but ${recipe.method} on an unepoched recording uses it whole; add "epoching", or use welch, or "skip-epoch"`, '/nonFinite');
}

function checkCost(cost: CostEstimate, limits: RecipeLimits): void {
  if (cost.bytes <= limits.maxJobBytes) return;
  throw overLimit(
    `this recipe would need about ${formatBytes(cost.bytes)} of memory on this signal (estimated from its shape; ${cost.driver.slice(1)} weighs most), above this server's per-job limit MAX_JOB_BYTES = ${formatBytes(limits.maxJobBytes)}`,
    cost.driver,
    { setting: 'MAX_JOB_BYTES', estimateBytes: Math.round(cost.bytes), limitBytes: limits.maxJobBytes },
  );
}

function formatBytes(bytes: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB', 'PiB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  return `${unit === 0 ? value : value.toPrecision(3)} ${units[unit]}`;
}
