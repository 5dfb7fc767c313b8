import { connect } from 'node:net';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closest, editDistance } from '../../src/common/issue-text.js';
import { writeEdf } from '../../src/signals/edf/index.js';
import { startTestApi } from '../helpers/app.js';

let api: Awaited<ReturnType<typeof startTestApi>>;
let port: number;
let signalId = '';

beforeAll(async () => {
  api = await startTestApi({ BODY_LIMIT_BYTES: '65536' });
  // Invented: one second of a 10 Hz sine on Oz at 256 Hz.
  const data = [Array.from({ length: 256 }, (_, i) => Math.sin((2 * Math.PI * 10 * i) / 256))];
  signalId = (await api.app.inject({ method: 'POST', url: '/v1/signals', payload: { samplingRate: 256, channels: ['Oz'], data } })).json().id as string;
  await api.app.listen({ port: 0, host: '127.0.0.1' });
  port = (api.app.server.address() as AddressInfo).port;
});
afterAll(() => api.stop());

/** Sends raw bytes (inject bypasses Node's HTTP parser) and parses the answer. */
function raw(text: string): Promise<{ status: number; headers: Record<string, string>; body: Record<string, unknown> }> {
  return new Promise((resolve, reject) => {
    let out = '';
    const socket = connect(port, '127.0.0.1', () => socket.write(text));
    socket.on('data', (d) => (out += d.toString('latin1')));
    socket.on('error', () => undefined);
    socket.on('close', () => {
      const [head = '', ...rest] = out.split('\r\n\r\n');
      const [statusLine = '', ...lines] = head.split('\r\n');
      const headers = Object.fromEntries(lines.map((l) => [l.slice(0, l.indexOf(':')).toLowerCase(), l.slice(l.indexOf(':') + 1).trim()]));
      try {
        resolve({ status: Number(statusLine.split(' ')[1]), headers, body: JSON.parse(rest.join('\r\n')) as Record<string, unknown> });
      } catch (error) {
        reject(new Error(`not JSON: ${out.slice(0, 300)} (${String(error)})`));
      }
    });
  });
}

// RFC 9457 §3 (problem details members) and §6.1 (the application/problem+json media type).
function expectProblem(res: { headers: Record<string, unknown> }, body: Record<string, unknown>, code: string) {
  expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
  expect(res.headers['x-request-id']).toBeTruthy();
  expect(res.headers['x-content-type-options']).toBe('nosniff');
  expect(res.headers['content-security-policy']).toContain("default-src 'none'");
  expect(body.type).toBe(`/problems/${code}`);
  expect(body.requestId).toBe(res.headers['x-request-id']);
  expect(String(body.detail)).not.toMatch(/^Invalid input/);
}

describe('when the HTTP layer refuses a request before any route runs', () => {
  it.each([
    // RFC 3986 §2.1: "%" must be followed by two hex digits.
    ['a malformed percent-encoding in the path', 'GET /v1/jobs/%E0%A4%A HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n', 400, 'invalid-request'],
    // RFC 9110 §15.5.15: 414 URI Too Long.
    ['an over-long path segment', `GET /v1/jobs/${'a'.repeat(300)} HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n`, 414, 'uri-too-long'],
    ['an over-long URL', `GET /v1/jobs?x=${'a'.repeat(20_000)} HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n`, 414, 'uri-too-long'],
    // RFC 6585 §5: 431 Request Header Fields Too Large.
    ['over-large headers', `GET /v1/jobs HTTP/1.1\r\nHost: x\r\nX-Big: ${'a'.repeat(20_000)}\r\nConnection: close\r\n\r\n`, 431, 'headers-too-large'],
  ])('should answer %s as problem+json with a request id', async (_what, text, status, code) => {
    const res = await raw(text);
    expect(res.status).toBe(status);
    expectProblem(res, res.body, code);
  });

  // RFC 9110 §15.5.6: a 405 answer MUST carry Allow with the target's methods.
  it.each([
    ['a method the route does not have', 'PATCH /v1/jobs HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n'],
    ['a method HTTP parsers do not know', 'FROB /v1/jobs HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n'],
  ])('should answer %s with 405 and Allow', async (_what, text) => {
    const res = await raw(text);
    expect(res.status).toBe(405);
    expectProblem(res, res.body, 'method-not-allowed');
    expect(res.headers.allow?.split(', ')).toEqual(['GET', 'HEAD', 'POST']);
  });

  it('should still answer 404 for a path no route has', async () => {
    const res = await api.app.inject({ method: 'PATCH', url: '/v1/nothing-here' });
    expect(res.statusCode).toBe(404);
    expectProblem(res, res.json(), 'not-found');
  });
});

describe('when a detail has to say what to send instead', () => {
  it('should measure the edit distance the closest-value hint uses', () => {
    // Worked by hand: welsh → welch is one substitution; kitten → sitting is the textbook 3.
    expect(editDistance('welsh', 'welch')).toBe(1);
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(closest('welsh', ['welch', 'multitaper', 'periodogram'])).toBe('welch');
    expect(closest('zzz', ['welch', 'multitaper'])).toBeNull();
  });

  it.each([
    ['a misspelt method', { method: 'welsh' }, '/recipe/method', /"welch", "multitaper".*did you mean "welch"\?/],
    ['an overlap given as a percentage', { method: 'welch', overlap: 50 }, '/recipe/overlap', /below 1 \(a fraction, not a percentage\); got 50; did you mean 0\.5\?/],
    ['a misspelt window', { method: 'welch', window: 'han' }, '/recipe/window', /did you mean "hann"\?/],
    ['a negative segment length', { method: 'welch', segmentSeconds: -2 }, '/recipe/segmentSeconds', /above 0 s; got -2/],
  ])('should name the allowed values or the unit for %s', async (_what, recipe, pointer, detail) => {
    const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: signalId, recipe } });
    expect(res.statusCode).toBe(422);
    const body = res.json();
    expectProblem(res, body, 'invalid-recipe');
    expect(body.pointer).toBe(pointer);
    expect(body.detail).toMatch(detail);
  });

  it.each([
    ['a signal of no known form', { signal: 42, recipe: 'rcp_x' }, '/signal', /stored signal id.*reference.*import.*upload/],
    ['a recipe of no known form', { signal: 'sig_x', recipe: 7 }, '/recipe', /pinned recipe id.*recipe object/],
    ['an upload with a misspelt field', { signal: { samplingRate: 256, channels: ['Cz'], dta: [[1, 2]] }, recipe: 'rcp_x' }, '/signal', /unknown field "dta"/],
  ])('should describe the accepted forms for %s', async (_what, payload, pointer, detail) => {
    const res = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload });
    expect(res.statusCode).toBe(400);
    const body = res.json();
    expectProblem(res, body, 'invalid-request');
    expect(body.pointer).toBe(pointer);
    expect(body.detail).toMatch(detail);
  });
});

describe('when the body is of the wrong type or size', () => {
  // RFC 9110 §15.5.16: 415 Unsupported Media Type.
  it('should answer a JSON body sent as text/plain with 415 naming the accepted types', async () => {
    const res = await api.app.inject({ method: 'POST', url: '/v1/recipes', headers: { 'content-type': 'text/plain' }, payload: '{"method":"welch"}' });
    expect(res.statusCode).toBe(415);
    const body = res.json();
    expectProblem(res, body, 'unsupported-media-type');
    expect(body.accepted).toEqual(['application/json']);
    expect(body.detail).toContain('application/json');
  });

  it('should name both types where binary uploads are read', async () => {
    const res = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: { 'content-type': 'text/csv' }, payload: '1,2,3' });
    expect(res.statusCode).toBe(415);
    expect(res.json().accepted).toEqual(['application/json', 'application/octet-stream']);
  });

  it('should point a body over the limit to the resumable upload', async () => {
    const res = await api.app.inject({ method: 'POST', url: '/v1/signals?samplingRate=256&channels=Cz', headers: { 'content-type': 'application/octet-stream' }, payload: Buffer.alloc(70_000) });
    expect(res.statusCode).toBe(413);
    expectProblem(res, res.json(), 'payload-too-large');
    expect(res.json().detail).toContain('POST /v1/uploads');
    const json = await api.app.inject({ method: 'POST', url: '/v1/signals', payload: { samplingRate: 256, channels: ['Cz'], data: [Array.from({ length: 20_000 }, () => 1.5)] } });
    expect(json.statusCode).toBe(413);
    expect(json.json().detail).toContain('POST /v1/uploads');
  });

  it('should hint at format=edf for an EDF body sent without it', async () => {
    // Invented: two seconds of a 10 Hz sine on Oz at 128 Hz, written by the project's EDF writer.
    const edf = writeEdf({
      signals: [{ label: 'Oz', samplingRate: 128, physicalDimension: 'uV', samples: Float64Array.from({ length: 256 }, (_, i) => Math.round(20 * Math.sin((2 * Math.PI * 10 * i) / 128))) }],
      recordDuration: 1,
      startDate: { year: 2026, month: 12, day: 1, hour: 4, minute: 0, second: 0 },
    });
    const res = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: { 'content-type': 'application/octet-stream' }, payload: Buffer.from(edf) });
    expect(res.statusCode).toBe(400);
    const body = res.json();
    expectProblem(res, body, 'invalid-request');
    expect(body.pointer).toBe('/query/format');
    expect(body.detail).toContain('format=edf');
    expect(body.detail).not.toContain('samplingRate');
  });
});
