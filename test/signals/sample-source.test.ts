import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { arraySource, materialize } from '../../src/signals/sample-source.js';
import type { Signal } from '../../src/signals/signal.js';

function signalOf(epochs: number, channels: number, samples: number): Signal {
  const data = Float64Array.from({ length: epochs * channels * samples }, (_, i) => i * 0.5 - 3);
  return { samplingRate: 100, channels: Array.from({ length: channels }, (_, c) => `C${c}`), unit: 'uV', epochCount: epochs, samplesPerEpoch: samples, data };
}

describe('when a signal in memory is read as a sample source', () => {
  it('should read any span of any row as the same values the array holds there', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 3 }), fc.integer({ min: 1, max: 4 }), fc.integer({ min: 1, max: 40 }), fc.nat(), fc.nat(), fc.nat(), (epochs, channels, samples, a, b, pick) => {
        const signal = signalOf(epochs, channels, samples);
        const source = arraySource(signal);
        const [from, to] = [a % (samples + 1), b % (samples + 1)].sort((x, y) => x - y) as [number, number];
        const epoch = pick % epochs;
        const channel = (pick >> 2) % channels;
        const into = new Float64Array(to - from);
        source.readRow(epoch, channel, from, to, into);
        const start = (epoch * channels + channel) * samples;
        expect(Array.from(into)).toEqual(Array.from(signal.data.subarray(start + from, start + to)));
      }),
    );
  });

  it('should give back the same samples, shape and events when materialized', () => {
    const signal = { ...signalOf(2, 3, 7), events: [{ onset: 0.01, duration: null, label: 'go' }] };
    const back = materialize(arraySource(signal));
    expect(back).toEqual(signal);
  });

  it('should refuse reads outside the signal and reads after close, naming the span', () => {
    const source = arraySource(signalOf(1, 2, 10));
    expect(() => source.readRow(0, 2, 0, 1, new Float64Array(1))).toThrow(/channel 2 in epoch 0/);
    expect(() => source.readRow(0, 0, 5, 11, new Float64Array(6))).toThrow(/\[5, 11\)/);
    expect(() => source.readRow(0, 0, 0, 4, new Float64Array(3))).toThrow(/cannot take 4/);
    source.close();
    expect(() => source.readRow(0, 0, 0, 1, new Float64Array(1))).toThrow(/closed/);
  });
});
