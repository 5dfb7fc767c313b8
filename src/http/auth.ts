import { createHash, timingSafeEqual } from 'node:crypto';
import type { FastifyInstance, FastifyRequest } from 'fastify';
import { DomainError } from '../common/errors.js';
import type { ApiKeyEntry, Role } from '../config.js';
import { ProblemError } from './problem.js';

/** `metrics`: an admin key, or the separate metrics token when one is configured. */
export type Access = 'public' | 'metrics' | Role;

export interface Principal {
  tenant: string;
  role: Role;
  /** names the key in logs; never the key itself */
  key: string;
}

declare module 'fastify' {
  interface FastifyContextConfig {
    /** who may call the route; routes without it need `read` */
    access?: Access;
  }
  interface FastifyRequest {
    principal: Principal | null;
  }
}

/** In open mode (no keys configured) every caller acts as this principal. */
export const OPEN_PRINCIPAL: Principal = Object.freeze({ tenant: 'public', role: 'admin', key: 'open-mode' });

const RANK: Record<Role, number> = { read: 1, submit: 2, admin: 3 };

/**
 * Bearer-token authentication against SHA-256 hashes of the keys. The presented token is hashed and
 * compared with every configured hash in constant time, so neither the match nor its position leaks
 * through timing; keys never appear in clear in configuration, logs or errors.
 */
export function createAuthenticator(keys: readonly ApiKeyEntry[]) {
  const entries = keys.map((k) => ({ ...k, digest: Buffer.from(k.sha256, 'hex') }));
  return (authorization: string | undefined): Principal | null => {
    const match = /^Bearer\s+(\S+)\s*$/i.exec(authorization ?? '');
    if (!match) return null;
    const digest = createHash('sha256').update(match[1]!).digest();
    let found: (typeof entries)[number] | null = null;
    for (const entry of entries) if (timingSafeEqual(entry.digest, digest)) found = entry;
    return found ? { tenant: found.tenant, role: found.role, key: found.label } : null;
  };
}

export interface AuthOptions {
  keys: readonly ApiKeyEntry[];
  /** SHA-256 (hex) of a token that may read /metrics only; null = admin keys only */
  metricsTokenSha256: string | null;
  /** failed authentications per client address and minute before 429; 0 = no limit */
  failuresPerMinute: number;
}

/** The principal a valid metrics token stands for: it reaches nothing but /metrics. */
const METRICS_PRINCIPAL: Principal = Object.freeze({ tenant: 'metrics', role: 'read', key: 'metrics-token' });

/**
 * Counts failed authentications per client address in fixed one-minute windows. Once an address
 * has failed `max` times, its further attempts are refused before the key is even looked at, so
 * guessing keys costs a minute per `max` guesses. In memory: each API process counts on its own.
 */
export function createFailureLimiter(max: number, windowMs = 60_000, now: () => number = Date.now) {
  const windows = new Map<string, { count: number; resetAt: number }>();
  const current = (address: string) => {
    const entry = windows.get(address);
    if (entry && entry.resetAt > now()) return entry;
    windows.delete(address);
    return null;
  };
  return {
    /** Seconds until the address may try again; 0 when it may now. */
    retryAfter(address: string): number {
      if (max === 0) return 0;
      const entry = current(address);
      return entry && entry.count >= max ? Math.max(1, Math.ceil((entry.resetAt - now()) / 1000)) : 0;
    },
    fail(address: string): void {
      if (max === 0) return;
      // Bounded memory under a spray of addresses: expired windows go first.
      if (windows.size >= 10_000) for (const [key, e] of windows) if (e.resetAt <= now()) windows.delete(key);
      const entry = current(address) ?? { count: 0, resetAt: now() + windowMs };
      entry.count++;
      windows.set(address, entry);
    },
  };
}

export function registerAuth(app: FastifyInstance, options: AuthOptions): void {
  const open = options.keys.length === 0;
  const authenticate = createAuthenticator(options.keys);
  const metricsToken = options.metricsTokenSha256 ? createAuthenticator([{ tenant: 'metrics', role: 'read', sha256: options.metricsTokenSha256, label: 'metrics-token' }]) : null;
  const failures = createFailureLimiter(options.failuresPerMinute);
  app.decorateRequest('principal', null);
  app.addHook('onRequest', async (request: FastifyRequest) => {
    const access = request.routeOptions.config.access ?? 'read';
    if (open) {
      request.principal = OPEN_PRINCIPAL;
      return;
    }
    const authorization = request.headers.authorization;
    if (authorization) {
      const wait = failures.retryAfter(request.ip);
      if (wait > 0) {
        throw new DomainError('rate-limited', `too many failed authentications from this address; try again in ${wait} s`, { headers: { 'retry-after': String(wait) } });
      }
    }
    let principal = authorization ? authenticate(authorization) : null;
    if (!principal && access === 'metrics' && authorization && metricsToken?.(authorization)) principal = METRICS_PRINCIPAL;
    request.principal = principal;
    if (!principal && authorization) {
      failures.fail(request.ip);
      request.log.warn({ ip: request.ip }, 'authentication failed');
    }
    if (access === 'public') return;
    if (!principal) {
      throw new ProblemError('unauthenticated', authorization ? 'the API key is not valid (unknown, revoked or malformed)' : 'this route needs an API key: send "Authorization: Bearer <key>"', null, {
        'www-authenticate': 'Bearer realm="rhythmetric"',
      });
    }
    request.log = request.log.child({ tenant: principal.tenant, key: principal.key });
    if (access === 'metrics') {
      if (principal !== METRICS_PRINCIPAL && principal.role !== 'admin') {
        throw new ProblemError('forbidden', `the key "${principal.key}" has role "${principal.role}"; /metrics needs an admin key${metricsToken ? ' or the metrics token' : ''}`);
      }
      return;
    }
    if (RANK[principal.role] < RANK[access]) {
      throw new ProblemError('forbidden', `the key "${principal.key}" has role "${principal.role}"; this route needs "${access}"`);
    }
  });
}

/** The caller's tenant; routes behind authentication always have a principal. */
export function tenantOf(request: FastifyRequest): string {
  return (request.principal ?? OPEN_PRINCIPAL).tenant;
}
