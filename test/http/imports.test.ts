import { mkdir, mkdtemp, rm, symlink, writeFile } from 'node:fs/promises';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeEdf } from '../../src/signals/edf/index.js';
import { pollJob, startTestApi } from '../helpers/app.js';

const edf = Buffer.from(
  writeEdf({
    signals: ['Fp1', 'Fp2'].map((label, c) => ({
      label,
      samplingRate: 128,
      physicalDimension: 'uV',
      samples: Float64Array.from({ length: 128 * 20 }, (_, i) => Math.round(50 * Math.sin(i / 6 + c))),
    })),
    recordDuration: 1,
    startDate: { year: 2026, month: 12, day: 1, hour: 4, minute: 0, second: 0 },
  }),
);

let root: string;
let server: Server;
let port: number;
let api: Awaited<ReturnType<typeof startTestApi>>;

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'rhythmetric-root-'));
  await mkdir(join(root, 'night-shift'));
  await writeFile(join(root, 'night-shift', 'bed-3.edf'), edf);
  await symlink('/etc/hostname', join(root, 'escape.edf'));
  server = createServer((request, response) => {
    if (request.url === '/bed-3.edf') response.end(edf);
    else if (request.url === '/elsewhere') response.writeHead(302, { location: 'http://other.invalid/bed-3.edf' }).end();
    else response.writeHead(404).end();
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  port = (server.address() as AddressInfo).port;
  api = await startTestApi({ DATA_ROOT: root, FETCH_ALLOWED_HOSTS: '127.0.0.1', FETCH_ALLOW_PRIVATE: 'true' });
});
afterAll(async () => {
  await api.stop();
  await new Promise((r) => server.close(r));
  await rm(root, { recursive: true, force: true });
});

async function importing(payload: Record<string, unknown>, app = api.app) {
  return app.inject({ method: 'POST', url: '/v1/signals/import', payload });
}

describe('when the server reads a recording itself', () => {
  it('should import a file under the data root and a URL on the allow-list as the same signal as an upload', async () => {
    const upload = (await api.app.inject({ method: 'POST', url: '/v1/signals?format=edf', headers: { 'content-type': 'application/octet-stream' }, payload: edf })).json();
    const file = await importing({ file: 'night-shift/bed-3.edf' });
    expect(file.statusCode).toBe(201);
    expect(file.json().id).toBe(upload.id);
    const url = await importing({ url: `http://127.0.0.1:${port}/bed-3.edf` });
    expect(url.statusCode).toBe(201);
    expect(url.json().id).toBe(upload.id);
  });

  it.each([
    ['a parent segment', 'night-shift/../../etc/passwd'],
    ['an absolute path', '/etc/passwd'],
    ['an encoded separator', 'night-shift%2Fbed-3.edf'],
    ['a symlink leaving the root', 'escape.edf'],
  ])('should refuse %s with a problem naming the field', async (_what, path) => {
    const res = await importing({ file: path });
    expect(res.statusCode).toBe(422);
    expect(res.json()).toMatchObject({ type: '/problems/source-refused', pointer: '/file' });
  });

  it('should refuse URLs off the allow-list, redirects to other hosts and missing files', async () => {
    expect((await importing({ url: `http://localhost:${port}/bed-3.edf` })).json().type).toBe('/problems/source-refused');
    expect((await importing({ url: `http://127.0.0.1:${port}/elsewhere` })).json().type).toBe('/problems/source-refused');
    expect((await importing({ url: `http://127.0.0.1:${port}/missing.edf` })).statusCode).toBe(502);
    expect((await importing({ file: 'night-shift/bed-9.edf' })).statusCode).toBe(404);
  });

  it('should let a job name a file directly', async () => {
    const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: { file: 'night-shift/bed-3.edf' }, recipe: { method: 'welch' } } });
    expect(res.statusCode).toBe(202);
    expect((await pollJob(api.app, res.json().id)).state).toBe('succeeded');
  });

  it('should refuse both sources when they are not configured (the default)', async () => {
    const plain = await startTestApi();
    try {
      expect((await importing({ file: 'night-shift/bed-3.edf' }, plain.app)).json()).toMatchObject({ type: '/problems/source-refused', pointer: '/file' });
      expect((await importing({ url: `http://127.0.0.1:${port}/bed-3.edf` }, plain.app)).json()).toMatchObject({ type: '/problems/source-refused', pointer: '/url' });
    } finally {
      await plain.stop();
    }
  });
});

describe('when the far side of a URL import fails', () => {
  let far: Server;
  let farPort: number;
  let small: Awaited<ReturnType<typeof startTestApi>>;
  beforeAll(async () => {
    far = createServer((request, response) => {
      if (request.url === '/huge') {
        // No Content-Length: the limit is found while streaming.
        response.writeHead(200, { 'content-type': 'application/octet-stream' });
        response.write(Buffer.alloc(4096));
        response.end(Buffer.alloc(4096));
      } else if (request.url === '/stall') {
        response.writeHead(200, { 'content-type': 'application/octet-stream' });
        response.write(edf.subarray(0, 256));
      } else if (request.url === '/reset') {
        response.writeHead(200, { 'content-type': 'application/octet-stream', 'content-length': '5000' });
        response.write(edf.subarray(0, 256), () => setTimeout(() => request.socket.destroy(), 20));
      } else response.writeHead(404).end();
    });
    await new Promise<void>((r) => far.listen(0, '127.0.0.1', r));
    farPort = (far.address() as AddressInfo).port;
    small = await startTestApi({ FETCH_ALLOWED_HOSTS: '127.0.0.1', FETCH_ALLOW_PRIVATE: 'true', BODY_LIMIT_BYTES: '6000', FETCH_TIMEOUT_MS: '300' });
  });
  afterAll(async () => {
    await small.stop();
    far.closeAllConnections();
    await new Promise((r) => far.close(r));
  });

  // RFC 9110 §15.5.14 (413 Content Too Large) and §15.6.3 (502 Bad Gateway: an invalid response
  // from an inbound server); the client's request was fine, so 400 would blame the wrong side.
  it.each([
    ['a body over the limit', '/huge', 413, '/problems/payload-too-large'],
    ['a body that stalls', '/stall', 502, '/problems/source-failed'],
    ['a connection reset mid-body', '/reset', 502, '/problems/source-failed'],
  ])("should answer %s (%s) with %i, not the client's 400", async (_what, path, status, type) => {
    const res = await importing({ url: `http://127.0.0.1:${farPort}${path}` }, small.app);
    expect(res.statusCode, res.body).toBe(status);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.json()).toMatchObject({ type, pointer: '/url' });
  });
});
