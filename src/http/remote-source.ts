import { lookup as dnsLookup, type LookupAddress } from 'node:dns';
import { type ClientRequest, type IncomingMessage, request as httpRequest } from 'node:http';
import { request as httpsRequest } from 'node:https';
import { isIP, isIPv4, type LookupFunction } from 'node:net';
import { Readable } from 'node:stream';
import { domainToASCII } from 'node:url';
import { SourceError } from '../signals/data-root.js';

/** What a server operator lets clients fetch by URL. */
export interface RemotePolicy {
  /** Host names (exact, case-insensitive) or `*.domain` for subdomains only; empty = feature off. */
  allowedHosts: string[];
  /** Let hosts resolve to private, loopback, link-local … addresses (for labs serving files on their LAN). */
  allowPrivate: boolean;
  /** Largest body accepted, in bytes. */
  maxBytes: number;
  /** Bound on connect + response headers (all redirects together), and on each idle gap of the body, in ms. */
  timeoutMs: number;
  /** How many same-host redirects are followed. */
  maxRedirects: number;
}

export interface RemoteBody {
  stream: Readable;
  contentLength: number | null;
  finalUrl: string;
}

export type AddressClass = 'public' | 'private' | 'shared' | 'loopback' | 'link-local' | 'unique-local' | 'multicast' | 'unspecified' | 'broadcast' | 'reserved' | 'invalid';

const POINTER = '/url';

// IPv4 special-purpose blocks (RFC 6890 and the IANA registry; common practice for SSRF guards).
const IPV4_BLOCKS: ReadonlyArray<readonly [number, number, AddressClass]> = [
  [0x00000000, 8, 'unspecified'], // 0/8 "this network"
  [0x0a000000, 8, 'private'], // 10/8, RFC 1918
  [0x64400000, 10, 'shared'], // 100.64/10, RFC 6598 carrier-grade NAT
  [0x7f000000, 8, 'loopback'], // 127/8
  [0xa9fe0000, 16, 'link-local'], // 169.254/16, RFC 3927 (cloud metadata lives here)
  [0xac100000, 12, 'private'], // 172.16/12
  [0xc0a80000, 16, 'private'], // 192.168/16
  [0xe0000000, 4, 'multicast'], // 224/4
  [0xffffffff, 32, 'broadcast'], // 255.255.255.255
  [0xf0000000, 4, 'reserved'], // 240/4, never routable
];

function ipv4Number(text: string): number {
  return text.split('.').reduce((acc, part) => acc * 256 + Number(part), 0);
}

function classifyIPv4Number(value: number): AddressClass {
  for (const [base, bits, kind] of IPV4_BLOCKS) {
    const mask = bits === 0 ? 0 : (0xffffffff << (32 - bits)) >>> 0;
    if ((value & mask) >>> 0 === base) return kind;
  }
  return 'public';
}

/** Parses an IPv6 text (optionally with a dotted IPv4 tail, without zone) into 8 16-bit groups. */
function ipv6Groups(text: string): number[] | null {
  let hex = text;
  const lastColon = hex.lastIndexOf(':');
  if (hex.includes('.', lastColon)) {
    const v4 = hex.slice(lastColon + 1);
    if (!isIPv4(v4)) return null;
    const n = ipv4Number(v4);
    hex = `${hex.slice(0, lastColon + 1)}${(n >>> 16).toString(16)}:${(n & 0xffff).toString(16)}`;
  }
  const parse = (s: string) => (s === '' ? [] : s.split(':').map((g) => (/^[0-9a-f]{1,4}$/.test(g) ? Number.parseInt(g, 16) : Number.NaN)));
  const halves = hex.split('::');
  if (halves.length > 2) return null;
  const left = parse(halves[0]!);
  const right = halves.length === 2 ? parse(halves[1]!) : [];
  const missing = 8 - left.length - right.length;
  if (halves.length === 1 ? missing !== 0 : missing < 1) return null;
  const groups = [...left, ...new Array<number>(halves.length === 2 ? missing : 0).fill(0), ...right];
  return groups.every((g) => Number.isInteger(g)) ? groups : null;
}

/**
 * Says which kind of address `address` is, so that a fetch can refuse to reach into the server's
 * own networks (server-side request forgery).
 *
 * IPv4: RFC 1918 private blocks, 100.64/10 shared, 127/8 loopback, 169.254/16 link-local, 0/8,
 * 224/4 multicast, 240/4 reserved and 255.255.255.255. IPv6: ::1, ::, fc00::/7 unique-local,
 * fe80::/10 link-local, fec0::/10 (the deprecated site-local, reported as private), ff00::/8
 * multicast; addresses that carry an IPv4 address (IPv4-mapped ::ffff:0:0/96, the deprecated
 * IPv4-compatible ::/96, NAT64 64:ff9b::/96 and 6to4 2002::/16) are judged by that IPv4 address.
 *
 * @param address - An IPv4 or IPv6 literal; brackets and a zone (`%eth0`) are tolerated.
 * @returns 'public' only for globally routable unicast; 'invalid' when it is not an IP literal.
 * @see RFC 6890 (special-purpose address registries), RFC 4291 §2.5.5 (IPv4-embedded IPv6),
 *   RFC 6052 (NAT64), RFC 3056 (6to4).
 */
export function classifyAddress(address: string): AddressClass {
  let text = address.startsWith('[') && address.endsWith(']') ? address.slice(1, -1) : address;
  if (isIPv4(text)) return classifyIPv4Number(ipv4Number(text));
  const zone = text.indexOf('%');
  if (zone >= 0) text = text.slice(0, zone);
  if (isIP(text) !== 6) return 'invalid';
  const g = ipv6Groups(text.toLowerCase());
  if (!g) return 'invalid';
  const embedded = (hi: number, lo: number) => classifyIPv4Number(((hi << 16) >>> 0) + lo);
  const zeros = (from: number, to: number) => g.slice(from, to).every((x) => x === 0);
  if (zeros(0, 8)) return 'unspecified';
  if (zeros(0, 7) && g[7] === 1) return 'loopback';
  if (zeros(0, 5) && g[5] === 0xffff) return embedded(g[6]!, g[7]!); // ::ffff:a.b.c.d
  if (zeros(0, 6)) return embedded(g[6]!, g[7]!); // ::a.b.c.d
  if (g[0] === 0x64 && g[1] === 0xff9b && zeros(2, 6)) return embedded(g[6]!, g[7]!);
  if (g[0] === 0x2002) return embedded(g[1]!, g[2]!);
  const first = g[0]!;
  if ((first & 0xfe00) === 0xfc00) return 'unique-local';
  if ((first & 0xffc0) === 0xfe80) return 'link-local';
  if ((first & 0xffc0) === 0xfec0) return 'private';
  if ((first & 0xff00) === 0xff00) return 'multicast';
  return 'public';
}

function normaliseHost(host: string): string {
  const bare = host.startsWith('[') && host.endsWith(']') ? host.slice(1, -1) : host;
  return isIP(bare) ? bare.toLowerCase() : domainToASCII(bare.toLowerCase());
}

/**
 * Whether `host` (a URL's hostname) is on the allow-list. Entries match exactly and without
 * regard to case; an entry `*.example.org` matches every subdomain of example.org but not
 * example.org itself. International names are compared in their ASCII (punycode) form.
 */
export function isHostAllowed(host: string, allowedHosts: readonly string[]): boolean {
  const wanted = normaliseHost(host);
  if (wanted === '') return false;
  return allowedHosts.some((raw) => {
    const entry = raw.trim().toLowerCase();
    if (entry.startsWith('*.')) {
      const suffix = normaliseHost(entry.slice(2));
      return suffix !== '' && wanted.endsWith(`.${suffix}`);
    }
    const exact = normaliseHost(entry);
    return exact !== '' && wanted === exact;
  });
}

function forbiddenHost(message: string): SourceError {
  return new SourceError('forbidden-host', message, POINTER);
}

function checkAddress(address: string, host: string, allowPrivate: boolean): void {
  const kind = classifyAddress(address);
  if (kind === 'invalid') throw forbiddenHost(`${host} resolved to ${JSON.stringify(address)}, which is not an IP address`);
  if (kind !== 'public' && !allowPrivate) {
    const what = host === address ? `the address ${address} is` : `${host} resolves to ${address},`;
    throw forbiddenHost(`${what} a ${kind} address; this server does not fetch from non-public addresses`);
  }
}

export type Resolver = (hostname: string, options: { all: true; family?: number }, callback: (error: NodeJS.ErrnoException | null, addresses: LookupAddress[]) => void) => void;

/**
 * A `lookup` for http(s).request that resolves every address of a host and refuses the lot when
 * any of them is not public (unless `allowPrivate`). Because the socket connects to the address
 * this returns, a DNS answer that changes between a check and the connect cannot slip through.
 *
 * @param allowPrivate - Accept non-public addresses.
 * @param resolve - The resolver to ask; node:dns lookup by default (tests pass a fake).
 */
export function createGuardedLookup(allowPrivate: boolean, resolve: Resolver = dnsLookup as Resolver): LookupFunction {
  return (hostname, options, callback) => {
    const family = typeof options === 'object' && options !== null && typeof options.family === 'number' ? options.family : 0;
    resolve(hostname, { all: true, family }, (error, addresses) => {
      if (error) {
        callback(error, '', 0);
        return;
      }
      try {
        if (addresses.length === 0) throw new SourceError('fetch-failed', `${hostname} has no address`, POINTER);
        for (const { address } of addresses) checkAddress(address, hostname, allowPrivate);
      } catch (refusal) {
        callback(refusal as NodeJS.ErrnoException, '', 0);
        return;
      }
      if (options.all) callback(null, addresses);
      else callback(null, addresses[0]!.address, addresses[0]!.family);
    });
  };
}

function checkPolicy(policy: RemotePolicy): void {
  if (!Array.isArray(policy.allowedHosts)) throw new TypeError('allowedHosts must be an array of host names');
  if (!Number.isSafeInteger(policy.maxBytes) || policy.maxBytes < 0) throw new RangeError(`maxBytes must be a non-negative integer, got ${policy.maxBytes}`);
  if (!Number.isFinite(policy.timeoutMs) || policy.timeoutMs <= 0) throw new RangeError(`timeoutMs must be a positive number, got ${policy.timeoutMs}`);
  if (!Number.isSafeInteger(policy.maxRedirects) || policy.maxRedirects < 0) {
    throw new RangeError(`maxRedirects must be a non-negative integer, got ${policy.maxRedirects}`);
  }
}

/** Parses and checks a URL against the policy; throws SourceError('forbidden-host'). */
export function checkRemoteUrl(url: string, policy: Pick<RemotePolicy, 'allowedHosts' | 'allowPrivate'>): URL {
  if (policy.allowedHosts.length === 0) throw forbiddenHost('fetching by URL is turned off on this server (no allowed hosts)');
  let parsed: URL;
  try {
    parsed = new URL(url);
  } catch {
    throw forbiddenHost('the URL cannot be parsed');
  }
  if (parsed.protocol !== 'http:' && parsed.protocol !== 'https:') {
    throw forbiddenHost(`the scheme ${JSON.stringify(parsed.protocol.replace(/:$/, ''))} is not allowed; use http or https`);
  }
  if (parsed.username !== '' || parsed.password !== '') {
    throw forbiddenHost('the URL carries credentials; this server does not send credentials to other hosts');
  }
  const host = normaliseHost(parsed.hostname);
  if (!isHostAllowed(host, policy.allowedHosts)) throw forbiddenHost(`the host ${JSON.stringify(host)} is not on this server's list of allowed hosts`);
  // A literal IP never goes through lookup, so it is checked here.
  if (isIP(host)) checkAddress(host, host, policy.allowPrivate);
  return parsed;
}

const REDIRECTS = new Set([301, 302, 303, 307, 308]);

function defaultPort(url: URL): string {
  return url.port || (url.protocol === 'https:' ? '443' : '80');
}

/** Same host name, and the same port unless it is the plain upgrade from http:80 to https:443. */
function checkRedirect(from: URL, to: URL): void {
  if (normaliseHost(to.hostname) !== normaliseHost(from.hostname)) {
    throw forbiddenHost(`the server redirected to another host (${JSON.stringify(to.hostname)}); only redirects to the same host are followed`);
  }
  if (from.protocol === 'https:' && to.protocol === 'http:') throw forbiddenHost('the server redirected from https to plain http');
  const upgrade = from.protocol === 'http:' && to.protocol === 'https:' && defaultPort(from) === '80' && defaultPort(to) === '443';
  if (!upgrade && defaultPort(from) !== defaultPort(to)) {
    throw forbiddenHost(`the server redirected to another port (${defaultPort(to)}); only redirects to the same host and port are followed`);
  }
}

interface Exchange {
  req: ClientRequest;
  res: IncomingMessage;
}

function requestOnce(url: URL, policy: RemotePolicy, signal: AbortSignal): Promise<Exchange> {
  return new Promise((resolve, reject) => {
    const send = url.protocol === 'https:' ? httpsRequest : httpRequest;
    const req = send(url, {
      method: 'GET',
      // No pooling: a kept-alive socket would skip the guarded lookup of this policy.
      agent: false,
      lookup: createGuardedLookup(policy.allowPrivate),
      headers: { accept: '*/*', 'accept-encoding': 'identity' },
      signal,
    });
    req.once('response', (res) => resolve({ req, res }));
    req.once('error', (error) => reject(error));
    req.end();
  });
}

function asSourceError(error: unknown, url: URL, timedOut: boolean): SourceError {
  if (error instanceof SourceError) return error;
  if (timedOut) return new SourceError('timeout', `${url.host} did not answer within the time limit`, POINTER);
  const code = typeof error === 'object' && error !== null && 'code' in error ? ` (${String((error as { code: unknown }).code)})` : '';
  return new SourceError('fetch-failed', `fetching from ${url.host} failed${code}`, POINTER);
}

function parseContentLength(res: IncomingMessage): number | null {
  const header = res.headers['content-length'];
  return header !== undefined && /^\d+$/.test(header) ? Number(header) : null;
}

/**
 * Streams the body, failing it with 'too-large' past maxBytes and 'timeout' when the server
 * sends nothing for timeoutMs while the reader waits; either way the socket is destroyed.
 */
function limitBody(exchange: Exchange, url: URL, policy: RemotePolicy): Readable {
  const { req, res } = exchange;
  let received = 0;
  let idle: NodeJS.Timeout | undefined;
  const disarm = () => {
    if (idle) clearTimeout(idle);
    idle = undefined;
  };
  const arm = () => {
    disarm();
    idle = setTimeout(() => fail(new SourceError('timeout', `${url.host} stopped sending the body for ${policy.timeoutMs} ms`, POINTER)), policy.timeoutMs);
  };
  const out = new Readable({
    read() {
      arm();
      res.resume();
    },
    destroy(error, callback) {
      disarm();
      res.destroy();
      req.destroy();
      callback(error);
    },
  });
  const fail = (error: SourceError) => {
    disarm();
    req.destroy();
    out.destroy(error);
  };
  res.pause();
  res.on('data', (chunk: Buffer) => {
    received += chunk.length;
    if (received > policy.maxBytes) {
      fail(new SourceError('too-large', `the body from ${url.host} exceeds ${policy.maxBytes} bytes`, POINTER));
      return;
    }
    arm();
    if (!out.push(chunk)) {
      res.pause();
      disarm();
    }
  });
  res.once('end', () => {
    disarm();
    out.push(null);
  });
  res.once('error', (error) => fail(asSourceError(error, url, false)));
  res.once('close', () => {
    if (!res.complete && !out.destroyed) fail(new SourceError('fetch-failed', `${url.host} closed the connection before the body was complete`, POINTER));
  });
  return out;
}

/**
 * GETs an http(s) URL under a policy and hands back the body as a stream.
 *
 * The URL must be http or https, carry no credentials, and name a host on `allowedHosts`
 * (see {@link isHostAllowed}). Every address the host resolves to must be public unless
 * `allowPrivate` (see {@link classifyAddress}); the check runs inside the connect, through
 * {@link createGuardedLookup}, so DNS rebinding between a check and the connect is refused, and
 * literal IP hosts are checked the same way. Redirects (301, 302, 303, 307, 308) are followed by
 * hand, to the same host and port only (http→https on the default ports is allowed, https→http is
 * not), at most `maxRedirects` times. No request body, cookies or credentials are ever sent.
 *
 * @param url - The URL a client sent.
 * @param policy - The operator's limits; see {@link RemotePolicy}.
 * @returns The body stream (it errors with SourceError 'too-large' past maxBytes, 'timeout' when
 *   the body stalls for timeoutMs, 'fetch-failed' when the connection breaks), the declared
 *   Content-Length in bytes (null when absent), and the URL after redirects.
 * @throws SourceError (pointer '/url'): 'forbidden-host' for a refused URL, host, address or
 *   redirect; 'too-large' when Content-Length exceeds maxBytes; 'timeout' when connect plus
 *   response headers (over all redirects) take longer than timeoutMs; 'fetch-failed' for a
 *   network error, too many redirects or a status that is not 2xx (with `status`).
 * @throws RangeError / TypeError for a malformed policy, naming the field.
 * @see OWASP "Server-Side Request Forgery Prevention Cheat Sheet" (common practice: allow-list,
 *   resolve and check every address, pin the connection to the checked address, no blind redirects).
 */
export async function openRemote(url: string, policy: RemotePolicy): Promise<RemoteBody> {
  checkPolicy(policy);
  let current = checkRemoteUrl(url, policy);
  const deadline = new AbortController();
  const timer = setTimeout(() => deadline.abort(), policy.timeoutMs);
  try {
    for (let hop = 0; ; hop++) {
      let exchange: Exchange;
      try {
        exchange = await requestOnce(current, policy, deadline.signal);
      } catch (error) {
        throw asSourceError(error, current, deadline.signal.aborted);
      }
      const { req, res } = exchange;
      const status = res.statusCode ?? 0;
      if (REDIRECTS.has(status) && res.headers.location !== undefined) {
        req.destroy();
        if (hop >= policy.maxRedirects) {
          throw new SourceError('fetch-failed', `${current.host} redirected more than ${policy.maxRedirects} time(s)`, POINTER, status);
        }
        let next: URL;
        try {
          next = new URL(res.headers.location, current);
        } catch {
          throw new SourceError('fetch-failed', `${current.host} sent a redirect that is not a URL`, POINTER, status);
        }
        const checked = checkRemoteUrl(next.href, policy);
        checkRedirect(current, checked);
        current = checked;
        continue;
      }
      if (status < 200 || status > 299) {
        req.destroy();
        throw new SourceError('fetch-failed', `${current.host} answered ${status}${res.statusMessage ? ` ${res.statusMessage}` : ''}`, POINTER, status);
      }
      const contentLength = parseContentLength(res);
      if (contentLength !== null && contentLength > policy.maxBytes) {
        req.destroy();
        throw new SourceError('too-large', `${current.host} declares ${contentLength} bytes, more than the limit of ${policy.maxBytes}`, POINTER);
      }
      // The deadline covers connect and headers only; from here the body has its idle limit.
      clearTimeout(timer);
      // Errors after this point reach the reader through the body stream.
      req.on('error', () => {});
      return { stream: limitBody(exchange, current, policy), contentLength, finalUrl: current.href };
    }
  } finally {
    clearTimeout(timer);
  }
}
