import type { SignalDescription } from '../signals/signal.js';
import type { ChannelSource } from './channel-runner.js';
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

/** Where an epoch's first non-finite sample is: the first channel (in signal order) holding one, and its sample. */
export interface EpochGap {
  channel: number;
  sample: number;
}

/**
 * Reads every channel once, in channel order, and finds per epoch its first non-finite sample
 * ({@link EpochGap}), unless the policy leaves gaps to the segment filter. `visit` sees each
 * channel's rows too, for screening that needs the samples. No pass is made when neither needs one.
 */
export function scanChannels(source: ChannelSource, policy: GapHandling, visit?: (c: number, rows: Float64Array) => void): (EpochGap | null)[] {
  const n = source.samplesPerEpoch;
  const gaps: (EpochGap | null)[] = new Array(source.epochCount).fill(null);
  if (policy === 'segments' && !visit) return gaps;
  for (let c = 0; c < source.channels.length; c++) {
    const rows = source.channel(c);
    if (policy !== 'segments') {
      for (let e = 0; e < source.epochCount; e++) {
        if (gaps[e] !== null) continue;
        const base = e * n;
        for (let i = 0; i < n; i++) {
          if (Number.isFinite(rows[base + i]!)) continue;
          gaps[e] = { channel: c, sample: i };
          break;
        }
      }
    }
    visit?.(c, rows);
  }
  return gaps;
}

/**
 * Under `reject` with no other screening every epoch is used, unless a sample is non-finite, which
 * refuses the job. Then no pass of its own is needed: the returned source looks for gaps in each
 * channel as the computation reads it, and `check()`, called after the computation and before
 * anything reads its outcome, refuses the job naming the same first gap (epoch, then channel) as
 * {@link scanChannels} and {@link screenEpochs} would. A channel with a gap is handed out as zeros,
 * so that no estimator meets a NaN whose outcome will be thrown away.
 */
export function watchGaps(source: ChannelSource): { source: ChannelSource; check(): void } {
  const n = source.samplesPerEpoch;
  const gaps: (EpochGap | null)[] = new Array(source.epochCount).fill(null);
  return {
    source: {
      ...source,
      channel(c) {
        const rows = source.channel(c);
        let found = false;
        for (let e = 0; e < source.epochCount; e++) {
          const base = e * n;
          for (let i = 0; i < n; i++) {
            if (Number.isFinite(rows[base + i]!)) continue;
            // Channels may be read in any order; the lowest channel names the epoch's gap.
            const seen = gaps[e];
            if (!seen || seen.channel > c) gaps[e] = { channel: c, sample: i };
            found = true;
            break;
          }
        }
        return found ? new Float64Array(rows.length) : rows;
      },
    },
    check() {
      screenEpochs(source, gaps, 'reject');
    },
  };
}

/**
 * The recipe's `nonFinite` policy for one epoch: null when it holds only finite samples (or when its
 * gaps are left to the segment filter), the entry that leaves it out under `skip-epoch`; under
 * `reject` the job is refused, naming the first gap.
 */
export function screenGap(shape: SignalDescription, epoch: number, gap: EpochGap | null, policy: GapHandling): SkippedEpoch | null {
  if (policy === 'segments' || gap === null) return null;
  const where = `channel "${shape.channels[gap.channel]}", sample ${gap.sample}`;
  if (policy === 'reject') {
    throw new EngineInputError(
      'non-finite',
      `epoch ${epoch} holds a non-finite sample (${where}); set the recipe's "nonFinite": "skip-epoch" to leave such epochs out, or "bad-span" to leave out only what overlaps the gaps`,
      '/recipe/nonFinite',
    );
  }
  return { index: epoch, reason: 'non-finite', detail: `first non-finite sample at ${where}` };
}

/**
 * The epochs a job uses: each epoch goes through the `nonFinite` policy ({@link screenGap}, with the
 * gaps {@link scanChannels} found) and then, when it holds only finite samples, through `screen`,
 * which may leave it out for a reason of its own. Refuses the job when no epoch is left.
 */
export function screenEpochs(
  shape: SignalDescription,
  gaps: readonly (EpochGap | null)[],
  policy: GapHandling,
  screen: (epoch: number) => SkippedEpoch | null = () => null,
): { used: number[]; skipped: SkippedEpoch[] } {
  const used: number[] = [];
  const skipped: SkippedEpoch[] = [];
  for (let e = 0; e < shape.epochCount; e++) {
    const left = screenGap(shape, e, gaps[e] ?? null, policy) ?? screen(e);
    if (left) skipped.push(left);
    else used.push(e);
  }
  if (used.length === 0) {
    throw new EngineInputError('no-usable-epochs', `all ${shape.epochCount} epoch(s) were left out (${[...new Set(skipped.map((s) => s.reason))].join(', ')}); nothing is left to analyze`);
  }
  return { used, skipped };
}

/**
 * Runs of samples where any channel is NaN or ±Inf in a one-epoch (continuous) signal, as closed
 * [first, last] spans in seconds of their first and last sample: the bad spans of `"nonFinite":
 * "bad-span"`. A Welch segment or an epoch that touches a gap sample overlaps its span. Reads each
 * channel's row once (`row(c)`).
 */
export function gapSpans(shape: SignalDescription, row: (c: number) => Float64Array): [number, number][] {
  const spans: [number, number][] = [];
  if (shape.epochCount !== 1) return spans;
  const n = shape.samplesPerEpoch;
  const fs = shape.samplingRate;
  const gap = new Uint8Array(n);
  for (let c = 0; c < shape.channels.length; c++) {
    const x = row(c);
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
