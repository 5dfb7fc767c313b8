import { connect } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { http, startHttpApi } from './helpers.js';

const TIMEOUT_MS = 1000;
/** Node checks request timeouts on a timer (http.createServer connectionsCheckingInterval). */
const ANSWER_BOUND_MS = 10_000;

interface Trickle {
  /** the first line the server sent, e.g. "HTTP/1.1 408 Request Timeout"; null when it only closed */
  statusLine: string | null;
  closed: boolean;
  elapsedMs: number;
  bytesSent: number;
}

/**
 * A slowloris-style client: complete headers announcing a body, then one byte every 300 ms,
 * which keeps the socket busy but never finishes within REQUEST_TIMEOUT_MS. Stops by itself after
 * `boundMs` (bounded loop).
 */
function trickle(port: number, boundMs: number): Promise<Trickle> {
  return new Promise((resolve) => {
    const started = Date.now();
    const socket = connect(port, '127.0.0.1');
    let response = '';
    let bytesSent = 0;
    let timer: NodeJS.Timeout | null = null;
    const finish = (closed: boolean) => {
      if (timer) clearInterval(timer);
      clearTimeout(bound);
      socket.destroy();
      const line = response.split('\r\n')[0] ?? '';
      resolve({ statusLine: line.startsWith('HTTP/') ? line : null, closed, elapsedMs: Date.now() - started, bytesSent });
    };
    const bound = setTimeout(() => finish(false), boundMs);
    socket.on('data', (chunk: Buffer) => {
      response += chunk.toString('latin1');
      if (response.includes('\r\n\r\n')) finish(false);
    });
    socket.on('close', () => finish(true));
    socket.on('error', () => finish(true));
    socket.on('connect', () => {
      socket.write('POST /v1/signals HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: application/json\r\nContent-Length: 100000\r\n\r\n{');
      timer = setInterval(() => {
        if (socket.writable) {
          socket.write(' ');
          bytesSent++;
        }
      }, 300);
    });
  });
}

describe('when a client trickles its body slower than REQUEST_TIMEOUT_MS', () => {
  let api: Awaited<ReturnType<typeof startHttpApi>>;
  beforeAll(async () => (api = await startHttpApi({ REQUEST_TIMEOUT_MS: String(TIMEOUT_MS) })));
  afterAll(async () => api?.stop());

  it('should keep answering /healthz and small requests while slow clients hold connections', async () => {
    const slow = Array.from({ length: 5 }, () => trickle(api.port, 3000));
    const started = Date.now();
    const health = await http(api.base, 'GET', '/healthz');
    expect(health.status).toBe(200);
    expect(health.body.status).toBe('ok');
    expect((await http(api.base, 'GET', '/readyz')).status).toBe(200);
    expect(Date.now() - started).toBeLessThan(2000);
    await Promise.all(slow);
  }, 30_000);

  // Node checks request deadlines every connectionsCheckingInterval, set only when the server is
  // created; without it a trickling client stayed connected for 45 s under REQUEST_TIMEOUT_MS=1000.
  it(`should answer 408 or close the connection within ${ANSWER_BOUND_MS} ms`, async () => {
    const result = await trickle(api.port, ANSWER_BOUND_MS);
    // RFC 9110 §15.5.9: 408 Request Timeout, the server closing the connection after it.
    const cutOff = result.statusLine !== null ? /^HTTP\/1\.1 408/.test(result.statusLine) : result.closed;
    expect(cutOff, `status ${result.statusLine ?? 'none'}, closed ${result.closed} after ${result.elapsedMs} ms`).toBe(true);
    expect(result.elapsedMs).toBeGreaterThanOrEqual(TIMEOUT_MS - 50);
    expect(result.elapsedMs).toBeLessThan(ANSWER_BOUND_MS);
    expect((await http(api.base, 'GET', '/healthz')).status).toBe(200);
  }, 30_000);
});
