import { channelView, type Signal } from '../signals/signal.js';
import { EngineInputError } from './errors.js';
import type { SkippedEpoch } from './record.js';

/**
 * How an epoch's gaps are met: `reject` refuses the job, `skip-epoch` leaves the epoch out, and
 * `segments` keeps it because its gaps are bad spans that the Welch segment filter already avoids.
 */
export type GapHandling = 'reject' | 'skip-epoch' | 'segments';

/** The handling of a recipe's `nonFinite`: `bad-span` keeps an epoch only where segments go round the gaps. */
export function gapHandling(policy: 'reject' | 'skip-epoch' | 'bad-span', segmentsAvoidSpans: boolean): GapHandling {
  if (policy !== 'bad-span') return policy;
  return segmentsAvoidSpans ? 'segments' : 'skip-epoch';
}

/**
 * The recipe's `nonFinite` policy for one epoch: null when it holds only finite samples (or when its
 * gaps are left to the segment filter), the entry that leaves it out under `skip-epoch`; under
 * `reject` the job is refused, naming the first gap.
 */
export function screenGaps(signal: Signal, epoch: number, policy: GapHandling): SkippedEpoch | null {
  if (policy === 'segments') return null;
  for (let c = 0; c < signal.channels.length; c++) {
    const x = channelView(signal, epoch, c);
    for (let i = 0; i < x.length; i++) {
      if (Number.isFinite(x[i]!)) continue;
      const where = `channel "${signal.channels[c]}", sample ${i}`;
      if (policy === 'reject') {
        throw new EngineInputError(
          'non-finite',
          `epoch ${epoch} holds a non-finite sample (${where}); set the recipe's "nonFinite": "skip-epoch" to leave such epochs out, or "bad-span" to leave out only what overlaps the gaps`,
          '/recipe/nonFinite',
        );
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
export function screenEpochs(signal: Signal, policy: GapHandling, screen: (epoch: number) => SkippedEpoch | null = () => null): { used: number[]; skipped: SkippedEpoch[] } {
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

/**
 * Runs of samples where any channel is NaN or ±Inf in a one-epoch (continuous) signal, as closed
 * [first, last] spans in seconds of their first and last sample: the bad spans of `"nonFinite":
 * "bad-span"`. A Welch segment or an epoch that touches a gap sample overlaps its span.
 */
export function gapSpans(signal: Signal): [number, number][] {
  const spans: [number, number][] = [];
  if (signal.epochCount !== 1) return spans;
  const n = signal.samplesPerEpoch;
  const fs = signal.samplingRate;
  const gap = new Uint8Array(n);
  for (let c = 0; c < signal.channels.length; c++) {
    const x = channelView(signal, 0, c);
    for (let i = 0; i < n; i++) if (!Number.isFinite(x[i]!)) gap[i] = 1;
  }
  for (let i = 0; i < n; i++) {
    if (!gap[i]) continue;
    let j = i;
    while (j + 1 < n && gap[j + 1]) j++;
    spans.push([i / fs, j / fs]);
    i = j;
  }
  return spans;
}
