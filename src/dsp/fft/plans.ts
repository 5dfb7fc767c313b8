/** The cached plan constructors: mixed radix or Bluestein for complex input, even or odd for real input. */
import { BluesteinPlan } from './bluestein.js';
import { checkSize, MAX_DIRECT_RADIX } from './checks.js';
import { factorize } from './factorization.js';
import { MixedRadixPlan } from './mixed-radix.js';
import { EvenRealPlan, OddRealPlan } from './real.js';
import type { ComplexFftPlan, RealFftPlan } from './types.js';

// Bounded, oldest first out: sizes come from user recipes, and an evicted plan stays valid for
// whoever still holds it.
const PLAN_CACHE_LIMIT = 64;
const complexPlans = new Map<number, ComplexFftPlan>();
const realPlans = new Map<number, RealFftPlan>();

function remember<P>(cache: Map<number, P>, size: number, plan: P): P {
  if (cache.size >= PLAN_CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  cache.set(size, plan);
  return plan;
}

/**
 * A cached in-place complex DFT plan.
 *
 * @param size - transform length n, any integer ≥ 1
 * @returns the plan for `size`, shared by every caller in this thread (its scratch buffers are
 *   internal, so calls must not interleave, which single-threaded JavaScript guarantees); the cache
 *   keeps the 64 most recently created sizes
 * @throws RangeError when `size` is not an integer ≥ 1
 */
export function complexFftPlan(size: number): ComplexFftPlan {
  checkSize(size);
  let plan = complexPlans.get(size);
  if (plan === undefined) {
    const radices = factorize(size);
    const largest = radices.length === 0 ? 1 : radices[radices.length - 1]!;
    plan = remember(complexPlans, size, largest <= MAX_DIRECT_RADIX ? new MixedRadixPlan(size, radices) : new BluesteinPlan(size));
  }
  return plan;
}

/**
 * A cached real-input DFT plan returning bins 0..floor(n/2).
 *
 * @param size - transform length n, any integer ≥ 1
 * @throws RangeError when `size` is not an integer ≥ 1
 */
export function realFftPlan(size: number): RealFftPlan {
  checkSize(size);
  let plan = realPlans.get(size);
  if (plan === undefined) {
    plan = remember(realPlans, size, size % 2 === 0 ? new EvenRealPlan(size) : new OddRealPlan(size));
  }
  return plan;
}
