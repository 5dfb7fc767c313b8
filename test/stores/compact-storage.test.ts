import { readdir } from 'node:fs/promises';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { signalSha256 } from '../../src/signals/content-hash.js';
import { writeEdf } from '../../src/signals/edf/index.js';
import { edfToSignal } from '../../src/signals/edf-to-signal.js';
import { DEFAULT_SIGNAL_LIMITS } from '../../src/signals/limits.js';
import { materialize } from '../../src/signals/sample-source.js';
import { FilesystemStore } from '../../src/stores/filesystem-store.js';
import { ingestFile, type IngestDescription } from '../../src/stores/ingest.js';
import type { RedisStore } from '../../src/stores/redis-store.js';
import { READ_BLOCK_BYTES } from '../../src/stores/sample-file.js';
import { StorageFullError, type SignalMeta, type Store } from '../../src/stores/store.js';
import { pinnedEdf, pinnedFloat32 } from './compact-fixtures.js';
import { storeKinds } from './store-kinds.js';

const cleanups: (() => Promise<void>)[] = [];
afterAll(async () => {
  for (const cleanup of cleanups) await cleanup();
});

const work = await mkdtemp(join(tmpdir(), 'rhythmetric-compact-'));
cleanups.push(() => rm(work, { recursive: true, force: true }));

async function fileOf(name: string, bytes: Uint8Array): Promise<string> {
  const path = join(work, name);
  await writeFile(path, bytes);
  return path;
}

const options = (maxStoreBytes = 0) => ({ tenant: 'public', limits: DEFAULT_SIGNAL_LIMITS, maxStoreBytes });
const bitsOf = (data: Float64Array) => Buffer.from(data.buffer, data.byteOffset, data.byteLength);

/**
 * Signal ids and content hashes of the fixtures, computed by the code before samples were stored
 * compactly (commit 34d3015, which stored and hashed float64): storing them compactly must not
 * change them, since records carry them.
 */
const PINNED = {
  edf: { id: 'sig_9c4a29faa8d3f1c3ffd248ba675682ed', sha256: '9c4a29faa8d3f1c3ffd248ba675682edc0b0b0bf31f090afe05a0f78fb92921b' },
  float32: {
    uV: 'sig_45abede4cbfd8b04de42116ad01d899f',
    mV: 'sig_661776447c34b47b4d3efad341516a03',
    nV: 'sig_039bd81c51ac66227719dbed79bda93e',
    V: 'sig_5e97054e5589ca12da7d082b95a7858c',
    mmHg: 'sig_324762de65fe40975cc03365fba434df',
  },
} as const;

const float32Upload = (unit: keyof typeof PINNED.float32): IngestDescription => ({
  format: 'float32',
  samplingRate: 250,
  channels: ['A', 'B', 'C'],
  epochCount: 2,
  unit,
  ...(unit === 'mmHg' ? { voltage: false } : {}),
});

/** The microvolt exponent of each unit (SI prefixes; common practice) and the µV value of a float32 sample in it, computed here with one rounding. */
const EXPONENT = { uV: 0, mV: 3, nV: -3, V: 6, mmHg: 0 } as const;
const expectedValue = (v: number, exponent: number) => (exponent >= 0 ? v * 10 ** exponent : v / 10 ** -exponent);

const stores = await storeKinds('compact');

async function readBack(store: Store, id: string) {
  const opened = await store.openSamples(id);
  expect(opened).not.toBeNull();
  try {
    return materialize(opened!.source);
  } finally {
    opened!.source.close();
  }
}

describe.each(stores)('%s store, samples kept at their source precision', (_name, enabled, create) => {
  it.skipIf(!enabled)('should store an EDF upload as 16-bit codes and read back the float64 values of decoding it, under the id pinned before', async () => {
    const store = await create();
    const edf = pinnedEdf();
    const meta = await ingestFile(store, await fileOf('pinned.edf', edf), { format: 'edf' }, options());
    expect(meta.id).toBe(PINNED.edf.id);
    expect(meta.sha256).toBe(PINNED.edf.sha256);
    expect(meta.encoding).toBe('int16');
    expect(meta.bytes).toBe(3 * 1400 * 2);
    expect((await store.usage()).bytes).toBe(meta.bytes);
    const back = await readBack(store, meta.id);
    // Decoding the whole file in memory (the float64 path, EDF §2.1.3 calibration) gives the same bits.
    const decoded = edfToSignal(edf, {}, DEFAULT_SIGNAL_LIMITS);
    expect(bitsOf(back.data).equals(bitsOf(decoded.data))).toBe(true);
    expect(signalSha256(back)).toBe(PINNED.edf.sha256);
    expect(back.events).toEqual(meta.events);
    const whole = await store.getSignal(meta.id);
    expect(bitsOf(whole!.signal.data).equals(bitsOf(decoded.data))).toBe(true);
  });

  it.skipIf(!enabled)('should store an EDF larger than one read batch, rows larger than one block, as the values decoding it in memory gives', async () => {
    const store = await create();
    // Plain EDF, 2 channels × 200 Hz × 11 000 one-second records: 8.8 MB, more than the 8 MiB read
    // per batch, and each row (4.4 MB of codes) spans many blocks of the hash pass and Redis chunks.
    const fs = 200;
    const records = 11_000;
    const wave = (phase: number, scale: number) => Float64Array.from({ length: fs * records }, (_, i) => scale * (80 * Math.sin(i / 7 + phase) + 20 * Math.sin(i / 1013)));
    const edf = writeEdf({
      signals: [
        { label: 'O1', samples: wave(0, 1), samplingRate: fs, physicalDimension: 'uV', physicalMinimum: -100, physicalMaximum: 100 },
        { label: 'O2', samples: wave(1, 1e-3), samplingRate: fs, physicalDimension: 'mV', physicalMinimum: -0.1, physicalMaximum: 0.1 },
      ],
      recordDuration: 1,
      startDate: { year: 2026, month: 12, day: 2, hour: 1, minute: 0, second: 0 },
    });
    const meta = await ingestFile(store, await fileOf('long.edf', edf), { format: 'edf' }, options());
    const decoded = edfToSignal(edf, {}, DEFAULT_SIGNAL_LIMITS);
    expect(meta.sha256).toBe(signalSha256(decoded));
    expect(meta.bytes).toBe(2 * fs * records * 2);
    const back = await readBack(store, meta.id);
    expect(bitsOf(back.data).equals(bitsOf(decoded.data))).toBe(true);
  });

  it.skipIf(!enabled)('should store float32 uploads as float32 and read back v·10^k with one rounding, under the ids pinned before', async () => {
    const store = await create();
    const raw = pinnedFloat32();
    const values = new Float32Array(raw.buffer, raw.byteOffset, raw.byteLength / 4);
    const path = await fileOf('pinned.f32', raw);
    for (const unit of Object.keys(PINNED.float32) as (keyof typeof PINNED.float32)[]) {
      const meta = await ingestFile(store, path, float32Upload(unit), options());
      expect(meta.id, unit).toBe(PINNED.float32[unit]);
      expect(meta.encoding).toBe('float32');
      expect(meta.bytes).toBe(raw.byteLength);
      const back = await readBack(store, meta.id);
      const expected = Float64Array.from(values, (v) => expectedValue(v, EXPONENT[unit]));
      expect(bitsOf(back.data).equals(bitsOf(expected)), unit).toBe(true);
      expect(signalSha256(back)).toBe(meta.sha256);
    }
    expect((await store.usage()).bytes).toBe(5 * raw.byteLength);
  });

  it.skipIf(!enabled)('should keep NaN, ±Inf and −0 of a float32 upload bit for bit through storing and reading', async () => {
    const store = await create();
    const values = new Float32Array([1.5, Number.NaN, Number.POSITIVE_INFINITY, -0, Number.NEGATIVE_INFINITY, 3.4e38, -1e-45, 0.1]);
    // A NaN with a payload, written as raw bits.
    new Uint32Array(values.buffer)[7] = 0x7fc01234;
    const meta = await ingestFile(
      store,
      await fileOf('gaps.f32', new Uint8Array(values.buffer)),
      { format: 'float32', samplingRate: 4, channels: ['A', 'B'], epochCount: 1, unit: 'mV', nonFinite: 'keep' },
      options(),
    );
    expect(meta.nonFiniteSamples).toBe(4);
    const back = await readBack(store, meta.id);
    // The same conversion as ingest hashed: float32 → float64 is exact, then × 1000 (IEEE 754; common practice).
    const expected = Float64Array.from(values, (v) => v * 1000);
    expect(bitsOf(back.data).equals(bitsOf(expected))).toBe(true);
    expect(signalSha256(back)).toBe(meta.sha256);
  });

  it.skipIf(!enabled)('should read any span of any row of a stored signal as the values of the whole signal there (fast-check)', async () => {
    const store = await create();
    const edfMeta = await ingestFile(store, await fileOf('span.edf', pinnedEdf()), { format: 'edf' }, options());
    const f32Meta = await ingestFile(store, await fileOf('span.f32', pinnedFloat32()), float32Upload('nV'), options());
    for (const meta of [edfMeta, f32Meta]) {
      const whole = await readBack(store, meta.id);
      const opened = (await store.openSamples(meta.id))!;
      try {
        fc.assert(
          fc.property(fc.nat(), fc.nat(), fc.nat(), (a, b, pick) => {
            const n = meta.samplesPerEpoch;
            const [from, to] = [a % (n + 1), b % (n + 1)].sort((x, y) => x - y) as [number, number];
            const epoch = pick % meta.epochCount;
            const channel = (pick >> 3) % meta.channels.length;
            const into = new Float64Array(to - from);
            opened.source.readRow(epoch, channel, from, to, into);
            const start = (epoch * meta.channels.length + channel) * n;
            return bitsOf(into).equals(bitsOf(whole.data.subarray(start + from, start + to)));
          }),
          { numRuns: 200 },
        );
        expect(() => opened.source.readRow(meta.epochCount, 0, 0, 1, new Float64Array(1))).toThrow(RangeError);
      } finally {
        opened.source.close();
      }
      expect(() => opened.source.readRow(0, 0, 0, 1, new Float64Array(1))).toThrow(/closed/);
    }
  });

  it.skipIf(!enabled)('should count stored bytes against the store limit: an EDF fits as int16 where it would not as float64', async () => {
    const store = await create();
    const stored = 3 * 1400 * 2;
    // Room for the 16-bit codes (8 400 bytes) but not for float64 (33 600) nor for two signals.
    const limit = stored + 1000;
    const meta = await ingestFile(store, await fileOf('limit.edf', pinnedEdf()), { format: 'edf' }, options(limit));
    expect(meta.bytes).toBe(stored);
    expect(await store.usage()).toEqual({ signals: 1, bytes: stored });
    await expect(ingestFile(store, await fileOf('limit.f32', pinnedFloat32()), float32Upload('uV'), options(limit))).rejects.toBeInstanceOf(StorageFullError);
    expect(await store.deleteSignal(meta.id)).toBe(true);
    expect(await store.usage()).toEqual({ signals: 0, bytes: 0 });
    expect(await store.openSamples(meta.id)).toBeNull();
  });

  it.skipIf(!enabled)('should still read a float64 signal stored before encodings (no encoding in its meta)', async () => {
    const store = await create();
    const data = Float64Array.from({ length: 2 * 3 * 50 }, (_, i) => Math.sin(i) * 1e3);
    const meta: SignalMeta = {
      id: 'sig_00112233445566778899aabbccddeeff',
      sha256: 'c'.repeat(64),
      tenant: 'public',
      samplingRate: 100,
      channels: ['A', 'B', 'C'],
      unit: 'uV',
      epochCount: 2,
      samplesPerEpoch: 50,
      nonFiniteSamples: 0,
      events: [{ onset: 0.1, duration: null, label: 'x' }],
      bytes: data.byteLength,
      storedAt: '2026-11-01T00:00:00.000Z',
    };
    await store.putSignal(meta, new Uint8Array(data.buffer));
    const back = await readBack(store, meta.id);
    expect(bitsOf(back.data).equals(bitsOf(data))).toBe(true);
    expect(back.events).toEqual(meta.events);
  });
});

describe.skipIf(!stores[1]![1])('redis store, rows on demand', () => {
  it('should read a signal kept in one value (before chunks) and remove its spooled copy on close', async () => {
    const store = (await stores[1]![2]()) as RedisStore;
    const data = Float64Array.from({ length: (READ_BLOCK_BYTES / 8) * 2 + 13 }, (_, i) => i / 7);
    const id = 'sig_ffeeddccbbaa99887766554433221100';
    const meta: SignalMeta = {
      id,
      sha256: 'd'.repeat(64),
      tenant: 'public',
      samplingRate: 100,
      channels: ['A'],
      unit: 'uV',
      epochCount: 1,
      samplesPerEpoch: data.length,
      nonFiniteSamples: 0,
      events: [],
      bytes: data.byteLength,
      storedAt: '2026-10-01T00:00:00.000Z',
    };
    await store.redis.set(`${store.prefix}:signal:${id}:samples`, Buffer.from(data.buffer));
    await store.redis.set(`${store.prefix}:signal:${id}:meta`, JSON.stringify(meta));
    // Only this store's spooled copies: other tests' Redis stores share the temp directory.
    const spools = async () => (await readdir(await store.tempDir())).filter((n) => n.startsWith(`${store.prefix}-`) && n.endsWith('.spool')).length;
    const before = await spools();
    const opened = (await store.openSamples(id))!;
    expect(await spools()).toBe(before + 1);
    const into = new Float64Array(20);
    opened.source.readRow(0, 0, data.length - 20, data.length, into);
    expect(Array.from(into)).toEqual(Array.from(data.subarray(data.length - 20)));
    opened.source.close();
    expect(await spools()).toBe(before);
    expect(bitsOf((await store.getSignal(id))!.signal.data).equals(bitsOf(data))).toBe(true);
  });

  it('should answer null, and keep no spooled copy, when a chunk is gone (the signal deleted while it is read)', async () => {
    const store = (await stores[1]![2]()) as RedisStore;
    const meta = await ingestFile(store, await fileOf('gone.edf', pinnedEdf()), { format: 'edf' }, options());
    await store.redis.del(`${store.prefix}:signal:${meta.id}:samples:0`);
    // Only this store's spooled copies: other tests' Redis stores share the temp directory.
    const spools = async () => (await readdir(await store.tempDir())).filter((n) => n.startsWith(`${store.prefix}-`) && n.endsWith('.spool')).length;
    const before = await spools();
    expect(await store.openSamples(meta.id)).toBeNull();
    expect(await spools()).toBe(before);
  });
});

describe('an EDF refused in its second read batch', () => {
  it('should store nothing and leave no samples file behind', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'rhythmetric-compact-bad-'));
    cleanups.push(() => rm(dir, { recursive: true, force: true }));
    const store = new FilesystemStore(dir);
    const fs = 200;
    const records = 22_000;
    const edf = writeEdf({
      signals: [
        { label: 'Cz', samples: Float64Array.from({ length: fs * records }, (_, i) => 50 * Math.sin(i / 9)), samplingRate: fs, physicalDimension: 'uV', physicalMinimum: -60, physicalMaximum: 60 },
      ],
      recordDuration: 1,
      startDate: { year: 2026, month: 12, day: 2, hour: 3, minute: 0, second: 0 },
      annotations: [],
    });
    // The last record's time-keeping TAL says +29999 s instead of +21999 s: an EDF+C file must be
    // contiguous (EDF+ §2.2.4), and this record lies beyond the first 8 MiB batch.
    const text = Buffer.from(edf.buffer, edf.byteOffset, edf.byteLength);
    const at = text.lastIndexOf('+21999\x14\x14', undefined, 'latin1');
    expect(at).toBeGreaterThan(8 * 1024 * 1024);
    text.write('+29999', at, 'latin1');
    await expect(ingestFile(store, await fileOf('gap.edf', edf), { format: 'edf' }, options())).rejects.toMatchObject({
      kind: 'format',
      code: 'invalid-signal',
      message: expect.stringMatching(/record 22000/),
    });
    expect(await store.listSignals()).toEqual([]);
    expect((await readdir(await store.tempDir())).filter((n) => n.endsWith('.part'))).toEqual([]);
  });
});

describe('an EDF whose calibration would not survive the meta as JSON', () => {
  it('should be stored as float64 and read back exactly what decoding gives', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'rhythmetric-compact-neg0-'));
    cleanups.push(() => rm(dir, { recursive: true, force: true }));
    const store = new FilesystemStore(dir);
    const edf = pinnedEdf();
    // Physical minimum of signal 3 (Pz, µV) written as "-0": 256 + 104·ns + 8·i (EDF header layout, Kemp et al. 1992); ns = 4 with the annotations.
    const at = 256 + 104 * 4 + 8 * 2;
    Buffer.from(edf.buffer, edf.byteOffset).write('-0      ', at, 'latin1');
    const meta = await ingestFile(store, await fileOf('neg0.edf', edf), { format: 'edf' }, options());
    expect(meta.encoding).toBe('float64');
    expect(meta.bytes).toBe(3 * 1400 * 8);
    const decoded = edfToSignal(edf, {}, DEFAULT_SIGNAL_LIMITS);
    expect(meta.sha256).toBe(signalSha256(decoded));
    const back = await readBack(store, meta.id);
    expect(bitsOf(back.data).equals(bitsOf(decoded.data))).toBe(true);
  });
});
