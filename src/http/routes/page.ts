import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { extname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FastifyPluginAsyncZod } from 'fastify-type-provider-zod';
import { z } from 'zod';
import { ProblemError } from '../problem.js';

/** web/ at the repository root, from src/http/routes or dist/http/routes alike. */
export const WEB_DIR = fileURLToPath(new URL('../../../web/', import.meta.url));

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml; charset=utf-8',
};

/**
 * The page talks to the API of its own origin only; plots are inlined as SVG elements made of
 * presentation attributes, so no inline script or style needs allowing.
 */
export const PAGE_CSP = [
  "default-src 'none'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data: blob:",
  "connect-src 'self'",
  "form-action 'none'",
  "base-uri 'none'",
  "frame-ancestors 'none'",
].join('; ');

interface Asset {
  body: Buffer;
  type: string;
  etag: string;
}

/** Reads the page's files once at start-up; only names directly in web/ with a known type are served. */
function loadAssets(dir: string): Map<string, Asset> {
  const assets = new Map<string, Asset>();
  for (const name of readdirSync(dir)) {
    const type = TYPES[extname(name)];
    if (!type || !/^[a-z0-9-]+\.[a-z]+$/.test(name)) continue;
    const body = readFileSync(join(dir, name));
    assets.set(name, { body, type, etag: `"${createHash('sha256').update(body).digest('hex').slice(0, 32)}"` });
  }
  return assets;
}

/** The dashboard page: static files from web/, at `/` and `/web/<file>`. */
export const pageRoutes =
  (dir = WEB_DIR): FastifyPluginAsyncZod =>
  async (app) => {
    const assets = loadAssets(dir);

    const serve = (name: string) => {
      const asset = assets.get(name);
      if (!asset) throw new ProblemError('not-found', `the page has no file "${name}"`);
      return asset;
    };

    app.get('/', { config: { access: 'public' }, schema: { hide: true } }, async (request, reply) => send(serve('index.html'), request.headers['if-none-match'], reply));

    app.get('/web/:file', { config: { access: 'public' }, schema: { hide: true, params: z.object({ file: z.string().max(100) }) } }, async (request, reply) =>
      send(serve(request.params.file), request.headers['if-none-match'], reply),
    );
  };

function send(asset: Asset, ifNoneMatch: string | undefined, reply: import('fastify').FastifyReply) {
  reply.header('content-security-policy', PAGE_CSP).header('cache-control', 'no-cache').header('etag', asset.etag);
  if (ifNoneMatch === asset.etag) return reply.code(304).send();
  return reply.type(asset.type).send(asset.body);
}
