import { mkdir, mkdtemp, readdir, rm, utimes, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createLogger, startApi } from '../../src/cli/runtime.js';
import { loadConfig } from '../../src/config.js';
import { uploadAreaOf } from '../../src/stores/upload-area.js';
import { sink, startTestApi } from '../helpers/app.js';

const octet = { 'content-type': 'application/octet-stream' };
const KB900 = 900_000;
const part = (fill: number) => Buffer.alloc(KB900, fill);
const signal = (channels: string[]) => ({ samplingRate: 100, channels, data: channels.map((_, c) => Array.from({ length: 1000 }, (_, i) => Math.sin(i / 7 + c))) });

const apis: { stop(): Promise<void> }[] = [];
afterEach(async () => {
  for (const api of apis.splice(0)) await api.stop();
});

async function limited(bytes: number, env: Record<string, string> = {}) {
  const api = await startTestApi({ MAX_STORE_BYTES: String(bytes), ...env });
  apis.push(api);
  return api;
}

async function startUpload(api: Awaited<ReturnType<typeof startTestApi>>) {
  const res = await api.app.inject({ method: 'POST', url: '/v1/uploads', payload: { format: 'float32', samplingRate: 500, channels: ['Cz'] } });
  expect(res.statusCode).toBe(201);
  return res.json().id as string;
}

describe('when resumable upload parts fill the store limit', () => {
  // The probe's case (issue 11): 900 kB parts under a 2 MB limit. Two fit, the third must not.
  it('should refuse the part that would exceed MAX_STORE_BYTES with 507, keeping the parts and signals already there', async () => {
    const api = await limited(2_000_000);
    const stored = await api.app.inject({ method: 'POST', url: '/v1/signals', payload: signal(['Cz']) });
    expect(stored.statusCode).toBe(201); // 8 000 bytes of float64 samples
    const id = await startUpload(api);
    for (const n of [1, 2]) expect((await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/${n}`, headers: octet, payload: part(n) })).statusCode).toBe(200);
    const third = await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/3`, headers: octet, payload: part(3) });
    expect(third.statusCode).toBe(507);
    expect(third.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(third.json().type).toBe('/problems/storage-full');
    const state = (await api.app.inject({ method: 'GET', url: `/v1/uploads/${id}` })).json();
    expect(state.parts.map((p: { part: number }) => p.part)).toEqual([1, 2]);
    expect(await api.store.listSignals()).toEqual([stored.json().id]);
    const files = await readdir(join(await api.store.tempDir(), 'uploads', id));
    expect(files.filter((f) => !/^(\d+\.part(\.sha256)?|upload\.json)$/.test(f))).toEqual([]);
  });

  it('should count held parts against single uploads too, and give the room back when the upload is abandoned', async () => {
    const api = await limited(1_000_000);
    const id = await startUpload(api);
    expect((await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/1`, headers: octet, payload: part(1) })).statusCode).toBe(200);
    // 900 000 held + 16 000 bytes of float64 samples would fit; a 160 000-byte signal would not.
    const big = signal(Array.from({ length: 20 }, (_, c) => `E${c + 1}`));
    expect((await api.app.inject({ method: 'POST', url: '/v1/signals', payload: big })).statusCode).toBe(507);
    expect((await api.app.inject({ method: 'DELETE', url: `/v1/uploads/${id}` })).statusCode).toBe(200);
    expect((await api.app.inject({ method: 'POST', url: '/v1/signals', payload: big })).statusCode).toBe(201);
  });

  it('should let an upload complete when its signal fits, its own parts not counted twice', async () => {
    // 400 000 raw float32 bytes are stored as float32 (400 000 bytes): parts + signal would be 800 000, over the limit.
    const api = await limited(700_000);
    const id = await startUpload(api);
    const raw = Buffer.from(new Float32Array(100_000).map((_, i) => Math.sin(i / 11)).buffer);
    expect((await api.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/1`, headers: octet, payload: raw })).statusCode).toBe(200);
    const done = await api.app.inject({ method: 'POST', url: `/v1/uploads/${id}/complete`, payload: { parts: 1 } });
    expect(done.statusCode).toBe(201);
    expect((await api.store.usage()).bytes).toBe(400_000);
    // The parts' room is free again: a 160 000-byte signal fits beside the 400 000.
    expect((await api.app.inject({ method: 'POST', url: '/v1/signals', payload: signal(Array.from({ length: 20 }, (_, c) => `E${c + 1}`)) })).statusCode).toBe(201);
  });

  it('should keep counting parts left on disk by an earlier run', async () => {
    const first = await limited(2_000_000);
    const id = await startUpload(first);
    for (const n of [1, 2]) expect((await first.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/${n}`, headers: octet, payload: part(n) })).statusCode).toBe(200);
    await first.close(); // the data directory stays; a second server opens it
    const config = loadConfig({ DATA_DIR: first.dataDir, LOG_LEVEL: 'info', WORKER_THREADS: '1', MAX_STORE_BYTES: '2000000' });
    const second = await startApi(config, createLogger(config, sink().stream));
    try {
      expect((await second.app.inject({ method: 'PUT', url: `/v1/uploads/${id}/parts/3`, headers: octet, payload: part(3) })).statusCode).toBe(507);
    } finally {
      await second.close();
    }
  });
});

describe('when uploads are abandoned and writes interrupted', () => {
  const HOUR = 3_600_000;
  const age = (path: string, ms: number) => utimes(path, new Date(Date.now() - ms), new Date(Date.now() - ms));

  it('should expire an upload that received nothing for UPLOAD_EXPIRY_SECONDS, and release its room', async () => {
    const api = await limited(1_000_000, { UPLOAD_EXPIRY_SECONDS: '7200' });
    const old = await startUpload(api);
    expect((await api.app.inject({ method: 'PUT', url: `/v1/uploads/${old}/parts/1`, headers: octet, payload: part(1) })).statusCode).toBe(200);
    const fresh = await startUpload(api);
    const uploads = join(await api.store.tempDir(), 'uploads');
    await age(join(uploads, old), 3 * HOUR);
    await age(join(uploads, fresh), 1 * HOUR);
    const removed = await uploadAreaOf(api.store).sweep(api.config.uploadExpirySeconds * 1000);
    expect(removed.uploads).toBe(1);
    expect((await api.app.inject({ method: 'GET', url: `/v1/uploads/${old}` })).statusCode).toBe(404);
    expect((await api.app.inject({ method: 'GET', url: `/v1/uploads/${fresh}` })).statusCode).toBe(200);
    const big = signal(Array.from({ length: 20 }, (_, c) => `E${c + 1}`));
    expect((await api.app.inject({ method: 'POST', url: '/v1/signals', payload: big })).statusCode).toBe(201);
  });

  it('should remove stale temp files of interrupted writes at start-up and keep fresh ones, which may be writes under way', async () => {
    const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-leftovers-'));
    apis.push({ stop: () => rm(dataDir, { recursive: true, force: true }) });
    const temp = join(dataDir, 'tmp');
    const upload = join(temp, 'uploads', 'upl_0123456789abcdef0123456789abcdef');
    await mkdir(upload, { recursive: true });
    await writeFile(
      join(upload, 'upload.json'),
      JSON.stringify({
        id: 'upl_0123456789abcdef0123456789abcdef',
        tenant: 'public',
        start: { format: 'float32', samplingRate: 500, channels: ['Cz'], epochCount: 1 },
        createdAt: new Date().toISOString(),
      }),
    );
    const leftovers = [join(temp, 'a1b2c3d4e5f60718.part'), join(temp, '0011223344556677.f64.part'), join(upload, '8899aabbccddeeff.upload')];
    for (const path of leftovers) {
      await writeFile(path, Buffer.alloc(1000));
      await age(path, 2 * HOUR);
    }
    const live = join(temp, 'ffeeddccbbaa9988.upload');
    await writeFile(live, Buffer.alloc(1000));
    const config = loadConfig({ DATA_DIR: dataDir, LOG_LEVEL: 'info', WORKER_THREADS: '1' });
    const logs = sink();
    const api = await startApi(config, createLogger(config, logs.stream));
    try {
      expect((await readdir(temp)).sort()).toEqual(['ffeeddccbbaa9988.upload', 'uploads']);
      expect((await readdir(upload)).sort()).toEqual(['upload.json']);
      expect(logs.lines.find((l) => l.msg === 'leftovers sweep')).toMatchObject({ removed: { uploads: 0, tempFiles: 3 } });
    } finally {
      await api.close();
    }
  });
});
