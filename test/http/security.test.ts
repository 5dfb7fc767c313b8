import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config.js';
import { startApi } from '../../src/cli/runtime.js';
import { pollJob, startTestApi } from '../helpers/app.js';

const sha = (key: string) => createHash('sha256').update(key).digest('hex');
const KEYS = {
  labRead: 'lab-a-read-3f9c1d',
  labSubmit: 'lab-a-submit-77b2e0',
  labAdmin: 'lab-a-admin-0c55aa',
  otherSubmit: 'lab-b-submit-91d4f3',
};
const API_KEYS = [
  `lab-a:read:${sha(KEYS.labRead)}:a-read`,
  `lab-a:submit:${sha(KEYS.labSubmit)}:a-submit`,
  `lab-a:admin:${sha(KEYS.labAdmin)}:a-admin`,
  `lab-b:submit:${sha(KEYS.otherSubmit)}:b-submit`,
].join(',');

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '0', CORS_ORIGINS: 'https://dash.lab-a.example' });
});
afterAll(async () => {
  await api.stop();
});

const auth = (key: string) => ({ authorization: `Bearer ${key}` });
const signal = { samplingRate: 100, channels: ['Cz'], data: [Array.from({ length: 400 }, (_, i) => Math.sin(i / 3))] };

describe('when API keys are configured', () => {
  it('should refuse a missing, unknown or revoked key with 401 and a Bearer challenge', async () => {
    const missing = await api.app.inject({ method: 'GET', url: '/v1/jobs' });
    expect(missing.statusCode).toBe(401);
    expect(missing.headers['www-authenticate']).toMatch(/^Bearer/);
    expect(missing.json().type).toBe('/problems/unauthenticated');
    // A key that was once valid but is no longer configured is just unknown: revocation is removal.
    const revoked = await api.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth('lab-a-old-key-revoked') });
    expect(revoked.statusCode).toBe(401);
    expect(JSON.stringify(revoked.json())).not.toContain('lab-a-old-key-revoked');
  });

  it('should let health and documentation routes through without a key', async () => {
    expect((await api.app.inject({ method: 'GET', url: '/healthz' })).statusCode).toBe(200);
    expect((await api.app.inject({ method: 'GET', url: '/openapi.json' })).statusCode).toBe(200);
  });

  it('should enforce roles: read cannot submit, submit cannot delete', async () => {
    const upload = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: auth(KEYS.labRead), payload: signal });
    expect(upload.statusCode).toBe(403);
    expect(upload.json().detail).toContain('"a-read"');
    const stored = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: auth(KEYS.labSubmit), payload: signal });
    expect(stored.statusCode).toBe(201);
    const del = await api.app.inject({ method: 'DELETE', url: `/v1/signals/${stored.json().id}`, headers: auth(KEYS.labSubmit) });
    expect(del.statusCode).toBe(403);
  });

  it("should answer another tenant's signal and job ids with 404, as if they did not exist", async () => {
    const mine = (await api.app.inject({ method: 'POST', url: '/v1/signals', headers: auth(KEYS.labSubmit), payload: signal })).json();
    const theirs = (await api.app.inject({ method: 'POST', url: '/v1/signals', headers: auth(KEYS.otherSubmit), payload: signal })).json();
    expect(theirs.id).not.toBe(mine.id);
    expect((await api.app.inject({ method: 'GET', url: `/v1/signals/${mine.id}`, headers: auth(KEYS.otherSubmit) })).statusCode).toBe(404);
    const job = await api.app.inject({ method: 'POST', url: '/v1/jobs', headers: auth(KEYS.labSubmit), payload: { signal: mine.id, recipe: { method: 'welch', segmentSeconds: 1 } } });
    expect(job.statusCode).toBe(202);
    const foreign = await api.app.inject({ method: 'POST', url: '/v1/jobs', headers: auth(KEYS.otherSubmit), payload: { signal: mine.id, recipe: { method: 'welch' } } });
    expect(foreign.statusCode).toBe(404);
    expect(foreign.json().type).toBe('/problems/signal-not-found');
    expect((await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.json().id}`, headers: auth(KEYS.otherSubmit) })).statusCode).toBe(404);
    expect((await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.json().id}/record`, headers: auth(KEYS.otherSubmit) })).statusCode).toBe(404);
    const readerSees = await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.json().id}`, headers: auth(KEYS.labRead) });
    expect(readerSees.statusCode).toBe(200);
  });

  it('should let an admin list every tenant and delete a signal with its jobs and records', async () => {
    const stored = (await api.app.inject({ method: 'POST', url: '/v1/signals', headers: auth(KEYS.labSubmit), payload: { ...signal, channels: ['Pz'] } })).json();
    const job = (await api.app.inject({ method: 'POST', url: '/v1/jobs', headers: auth(KEYS.labSubmit), payload: { signal: stored.id, recipe: { method: 'welch', segmentSeconds: 1 } } })).json();
    expect((await pollJob(api.app, job.id, 20_000, auth(KEYS.labRead))).state).toBe('succeeded');
    expect((await api.app.inject({ method: 'GET', url: '/v1/jobs?tenant=all', headers: auth(KEYS.labSubmit) })).statusCode).toBe(403);
    const all = (await api.app.inject({ method: 'GET', url: '/v1/jobs?tenant=all', headers: auth(KEYS.labAdmin) })).json();
    expect(all.jobs.length).toBeGreaterThan(0);
    const del = await api.app.inject({ method: 'DELETE', url: `/v1/signals/${stored.id}`, headers: auth(KEYS.labAdmin) });
    expect(del.statusCode).toBe(200);
    expect(del.json()).toMatchObject({ deleted: true, jobsDeleted: 1 });
    expect((await api.app.inject({ method: 'GET', url: `/v1/signals/${stored.id}`, headers: auth(KEYS.labAdmin) })).statusCode).toBe(404);
    expect((await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}`, headers: auth(KEYS.labAdmin) })).statusCode).toBe(404);
  });

  it('should never write a key in clear into the logs', async () => {
    await api.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth(KEYS.labRead) });
    const text = JSON.stringify(api.logs);
    for (const key of Object.values(KEYS)) expect(text).not.toContain(key);
  });

  it('should send security headers and CORS headers for the configured origin only', async () => {
    const res = await api.app.inject({ method: 'GET', url: '/healthz', headers: { origin: 'https://dash.lab-a.example' } });
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-frame-options']).toBe('DENY');
    expect(res.headers['cache-control']).toBe('no-store');
    expect(res.headers['access-control-allow-origin']).toBe('https://dash.lab-a.example');
    const other = await api.app.inject({ method: 'GET', url: '/healthz', headers: { origin: 'https://elsewhere.example' } });
    expect(other.headers['access-control-allow-origin']).toBeUndefined();
  });
});

describe('when a key sends too many requests', () => {
  it('should answer 429 as problem+json with Retry-After', async () => {
    const limited = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '3' });
    try {
      const codes: number[] = [];
      let last;
      for (let i = 0; i < 5; i++) {
        last = await limited.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth(KEYS.labRead) });
        codes.push(last.statusCode);
      }
      expect(codes).toEqual([200, 200, 200, 429, 429]);
      expect(last!.headers['content-type']).toMatch(/problem\+json/);
      expect(last!.json().type).toBe('/problems/rate-limited');
      expect(Number(last!.headers['retry-after'])).toBeGreaterThan(0);
      // Another key has its own budget.
      expect((await limited.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth(KEYS.otherSubmit) })).statusCode).toBe(200);
    } finally {
      await limited.stop();
    }
  });
});

describe('when no key is configured', () => {
  it('should refuse to serve on a non-loopback address unless open mode is forced', async () => {
    await expect(startApi(loadConfig({ HOST: '0.0.0.0', DATA_DIR: '/tmp/rhythmetric-never-used' }))).rejects.toThrow(/ALLOW_OPEN_MODE/);
  });

  it('should announce open mode loudly at start-up', async () => {
    const open = await startTestApi();
    try {
      expect(open.logs.some((l) => l.level === 40 && String(l.msg).startsWith('OPEN MODE'))).toBe(true);
    } finally {
      await open.stop();
    }
  });
});
