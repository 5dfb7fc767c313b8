import { createHash, timingSafeEqual } from 'node:crypto';
import type { FastifyInstance, FastifyRequest } from 'fastify';
import type { ApiKeyEntry, Role } from '../config.js';
import { ProblemError } from './problem.js';

export type Access = 'public' | Role;

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

export function registerAuth(app: FastifyInstance, keys: readonly ApiKeyEntry[]): void {
  const open = keys.length === 0;
  const authenticate = createAuthenticator(keys);
  app.decorateRequest('principal', null);
  app.addHook('onRequest', async (request: FastifyRequest) => {
    const access = request.routeOptions.config.access ?? 'read';
    if (open) {
      request.principal = OPEN_PRINCIPAL;
      return;
    }
    const principal = request.headers.authorization ? authenticate(request.headers.authorization) : null;
    request.principal = principal;
    if (access === 'public') return;
    if (!principal) {
      throw new ProblemError(
        'unauthenticated',
        request.headers.authorization ? 'the API key is not valid (unknown, revoked or malformed)' : 'this route needs an API key: send "Authorization: Bearer <key>"',
        null,
        { 'www-authenticate': 'Bearer realm="rhythmetric"' },
      );
    }
    request.log = request.log.child({ tenant: principal.tenant, key: principal.key });
    if (RANK[principal.role] < RANK[access]) {
      throw new ProblemError('forbidden', `the key "${principal.key}" has role "${principal.role}"; this route needs "${access}"`);
    }
  });
}

/** The caller's tenant; routes behind authentication always have a principal. */
export function tenantOf(request: FastifyRequest): string {
  return (request.principal ?? OPEN_PRINCIPAL).tenant;
}
