import { describe, expect, it } from 'vitest';
import type { SignalMeta } from '../../src/stores/store.js';
import { storeKinds } from './store-kinds.js';

const samples = new Uint8Array(new Float64Array([1, 2, 3, 4]).buffer);
const meta: SignalMeta = {
  id: 'sig_0123456789abcdef0123456789abcdef',
  sha256: 'a'.repeat(64),
  tenant: 'public',
  samplingRate: 2,
  channels: ['A'],
  unit: 'uV',
  epochCount: 1,
  samplesPerEpoch: 4,
  nonFiniteSamples: 0,
  events: [],
  bytes: samples.byteLength,
  storedAt: '2026-12-01T00:00:00.000Z',
};

const stores = await storeKinds('usage');

describe.each(stores)('%s store', (_name, enabled, create) => {
  it.skipIf(!enabled)('should count a signal stored twice at once only once (storing the same content is harmless)', async () => {
    const store = await create();
    await store.usage(); // the filesystem store keeps a running total from its first scan
    await Promise.all([store.putSignal(meta, samples), store.putSignal(meta, samples)]);
    expect(await store.usage()).toEqual({ signals: 1, bytes: 32 });
    const loaded = await store.getSignal(meta.id);
    expect(Array.from(loaded!.signal.data)).toEqual([1, 2, 3, 4]);
    expect(await store.deleteSignal(meta.id)).toBe(true);
    expect(await store.usage()).toEqual({ signals: 0, bytes: 0 });
  });
});
