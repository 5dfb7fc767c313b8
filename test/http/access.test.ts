import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFailureLimiter } from '../../src/http/auth.js';
import { startTestApi } from '../helpers/app.js';

const sha = (text: string) => createHash('sha256').update(text).digest('hex');
const KEYS = { read: 'lab-a-read-5e1c0b', submit: 'lab-a-submit-2d9a47', admin: 'lab-a-admin-83f6c2' };
const METRICS_TOKEN = 'scraper-token-4b7e19';
const API_KEYS = [`lab-a:read:${sha(KEYS.read)}:a-read`, `lab-a:submit:${sha(KEYS.submit)}:a-submit`, `lab-a:admin:${sha(KEYS.admin)}:a-admin`].join(',');
const auth = (key: string) => ({ authorization: `Bearer ${key}` });

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '0', AUTH_FAILURES_PER_MINUTE: '20', METRICS_TOKEN_SHA256: sha(METRICS_TOKEN) });
});
afterAll(async () => {
  await api.stop();
});

describe('when one address keeps presenting wrong keys', () => {
  it('should answer the 21st attempt within a minute with 429 problem+json and Retry-After, even with a valid key', async () => {
    const from = { remoteAddress: '198.51.100.7' }; // RFC 5737 documentation address
    for (let i = 0; i < 20; i++) {
      const res = await api.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth(`guess-${i}`), ...from });
      expect(res.statusCode).toBe(401);
    }
    const blocked = await api.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth(KEYS.read), ...from });
    expect(blocked.statusCode).toBe(429);
    expect(blocked.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(blocked.json()).toMatchObject({ type: '/problems/rate-limited', status: 429 });
    expect(blocked.json().detail).toMatch(/failed authentications/);
    const retryAfter = Number(blocked.headers['retry-after']);
    expect(retryAfter).toBeGreaterThan(0);
    expect(retryAfter).toBeLessThanOrEqual(60);
    // Another address is not punished for it, and health probes without a key still pass.
    expect((await api.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth(KEYS.read), remoteAddress: '198.51.100.8' })).statusCode).toBe(200);
    expect((await api.app.inject({ method: 'GET', url: '/healthz', ...from })).statusCode).toBe(200);
  });

  it('should not count requests that carry the right key', async () => {
    const from = { remoteAddress: '198.51.100.9' };
    for (let i = 0; i < 30; i++) expect((await api.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth(KEYS.read), ...from })).statusCode).toBe(200);
  });
});

describe('when failures are counted over time', () => {
  it('should let an address try again once its minute is over', () => {
    let now = 1_000_000;
    const limiter = createFailureLimiter(3, 60_000, () => now);
    for (let i = 0; i < 3; i++) limiter.fail('203.0.113.1');
    expect(limiter.retryAfter('203.0.113.1')).toBe(60);
    now += 59_500;
    expect(limiter.retryAfter('203.0.113.1')).toBe(1);
    now += 500;
    expect(limiter.retryAfter('203.0.113.1')).toBe(0);
    limiter.fail('203.0.113.1');
    expect(limiter.retryAfter('203.0.113.1')).toBe(0);
  });
});

describe('when someone scrapes /metrics', () => {
  it('should refuse read and submit keys with 403 and no key with 401', async () => {
    for (const key of [KEYS.read, KEYS.submit]) {
      const res = await api.app.inject({ method: 'GET', url: '/metrics', headers: auth(key) });
      expect(res.statusCode).toBe(403);
      expect(res.json().type).toBe('/problems/forbidden');
    }
    expect((await api.app.inject({ method: 'GET', url: '/metrics' })).statusCode).toBe(401);
  });

  it('should serve an admin key and the metrics token', async () => {
    for (const key of [KEYS.admin, METRICS_TOKEN]) {
      const res = await api.app.inject({ method: 'GET', url: '/metrics', headers: auth(key) });
      expect(res.statusCode).toBe(200);
      expect(res.body).toMatch(/^# HELP /m);
    }
  });

  it('should not let the metrics token reach anything else', async () => {
    expect((await api.app.inject({ method: 'GET', url: '/v1/jobs', headers: auth(METRICS_TOKEN) })).statusCode).toBe(401);
  });

  it('should stay open in open mode', async () => {
    const open = await startTestApi();
    try {
      expect((await open.app.inject({ method: 'GET', url: '/metrics' })).statusCode).toBe(200);
    } finally {
      await open.stop();
    }
  });
});
