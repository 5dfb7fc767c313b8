import { channelView, type Signal } from '../signals/signal.js';
import { EngineInputError } from './errors.js';
import type { SkippedEpoch } from './record.js';

/**
 * The recipe's `nonFinite` policy for one epoch: null when it holds only finite samples, the entry
 * that leaves it out under `skip-epoch`; under `reject` the job is refused, naming the first gap.
 */
export function screenGaps(signal: Signal, epoch: number, policy: 'reject' | 'skip-epoch'): SkippedEpoch | null {
  for (let c = 0; c < signal.channels.length; c++) {
    const x = channelView(signal, epoch, c);
    for (let i = 0; i < x.length; i++) {
      if (Number.isFinite(x[i]!)) continue;
      const where = `channel "${signal.channels[c]}", sample ${i}`;
      if (policy === 'reject') {
        throw new EngineInputError('non-finite', `epoch ${epoch} holds a non-finite sample (${where}); set the recipe's "nonFinite": "skip-epoch" to leave such epochs out`, '/recipe/nonFinite');
      }
      return { index: epoch, reason: 'non-finite', detail: `first non-finite sample at ${where}` };
    }
  }
  return null;
}

/**
 * The epochs a job uses: each epoch goes through the `nonFinite` policy ({@link screenGaps}) and then,
 * when it holds only finite samples, through `screen`, which may leave it out for a reason of its
 * own. Refuses the job when no epoch is left.
 */
export function screenEpochs(signal: Signal, policy: 'reject' | 'skip-epoch', screen: (epoch: number) => SkippedEpoch | null = () => null): { used: number[]; skipped: SkippedEpoch[] } {
  const used: number[] = [];
  const skipped: SkippedEpoch[] = [];
  for (let e = 0; e < signal.epochCount; e++) {
    const left = screenGaps(signal, e, policy) ?? screen(e);
    if (left) skipped.push(left);
    else used.push(e);
  }
  if (used.length === 0) {
    throw new EngineInputError('no-usable-epochs', `all ${signal.epochCount} epoch(s) were left out (${[...new Set(skipped.map((s) => s.reason))].join(', ')}); nothing is left to analyze`);
  }
  return { used, skipped };
}
