import { DomainError } from '../common/errors.js';

/**
 * The asked channels in the order asked, or every channel when none is asked. An unknown name is
 * refused with the record's channels listed; the pointer is relative to the plot options.
 */
export function selectChannels(available: readonly string[], asked: readonly string[] | undefined, pointer = '/channels'): string[] {
  if (!asked || asked.length === 0) return [...available];
  const unknown = asked.filter((name) => !available.includes(name));
  if (unknown.length > 0) {
    throw new DomainError('unknown-channel', `the record has no channel ${unknown.map((n) => `"${n}"`).join(', ')}; its channels are ${available.join(', ')}`, {
      pointer,
      extensions: { channels: [...available] },
    });
  }
  return [...new Set(asked)];
}

/** Indices of the frequencies inside [low, high] (both included). */
export function binsInRange(frequencies: readonly number[], range: readonly [number, number]): number[] {
  const keep: number[] = [];
  frequencies.forEach((f, k) => {
    if (f >= range[0] && f <= range[1]) keep.push(k);
  });
  return keep;
}

/** Throws when a range keeps no frequency of the record. */
export function requireBins(frequencies: readonly number[], range: readonly [number, number], pointer = '/frequencyRange'): number[] {
  const keep = binsInRange(frequencies, range);
  if (keep.length === 0) {
    const lo = frequencies[0] ?? 0;
    const hi = frequencies[frequencies.length - 1] ?? 0;
    throw new DomainError('invalid-request', `the frequency range ${range[0]}–${range[1]} Hz holds no frequency of the record, which spans ${lo}–${hi} Hz`, { pointer });
  }
  return keep;
}
