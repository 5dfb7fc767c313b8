import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApi } from '../helpers/app.js';

type Api = Awaited<ReturnType<typeof startTestApi>>;
let api: Api;

beforeAll(async () => {
  api = await startTestApi({ API_KEYS: `lab:read:${'ab'.repeat(32)}` });
});
afterAll(async () => {
  await api.stop();
});

describe('when a browser loads the dashboard page', () => {
  it('should serve the page at / without a key, with a policy that allows only its own scripts and the API', async () => {
    const res = await api.app.inject({ method: 'GET', url: '/' });
    expect(res.statusCode).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/html/);
    expect(res.body).toContain('<script type="module" src="/web/app.js">');
    expect(res.body).toMatch(/not a medical device/);
    const csp = String(res.headers['content-security-policy']);
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("connect-src 'self'");
    expect(csp).not.toContain('unsafe-inline');
    expect(csp).toContain("frame-ancestors 'none'");
  });

  it('should serve its scripts and styles with their types and answer 304 to a matching ETag', async () => {
    const js = await api.app.inject({ method: 'GET', url: '/web/app.js' });
    expect(js.statusCode).toBe(200);
    expect(js.headers['content-type']).toMatch(/^text\/javascript/);
    const css = await api.app.inject({ method: 'GET', url: '/web/style.css' });
    expect(css.headers['content-type']).toMatch(/^text\/css/);
    const again = await api.app.inject({ method: 'GET', url: '/web/app.js', headers: { 'if-none-match': String(js.headers.etag) } });
    expect(again.statusCode).toBe(304);
    expect(again.body).toBe('');
  });

  it('should answer a file it does not have, or a path outside web/, with a 404 problem', async () => {
    for (const url of ['/web/missing.js', '/web/..%2Fpackage.json', '/web/tsconfig.json']) {
      const res = await api.app.inject({ method: 'GET', url });
      expect(res.statusCode, url).toBe(404);
      expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    }
  });

  it('should keep the API itself behind the key', async () => {
    expect((await api.app.inject({ method: 'GET', url: '/v1/jobs' })).statusCode).toBe(401);
  });
});
