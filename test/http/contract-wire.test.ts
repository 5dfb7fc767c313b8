import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { LightMyRequestResponse } from 'fastify';
import { Ajv2020 } from 'ajv/dist/2020.js';
import addFormatsModule from 'ajv-formats';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_CHANNELS, DEMO_SAMPLING_RATE, demoBlock } from '../../src/signals/demo-recording.js';
import { pollJob, startTestApi } from '../helpers/app.js';

// The OpenAPI 3.1 document as committed (checked equal to the generated one by contract.test.ts).
// OpenAPI 3.1 schemas are JSON Schema 2020-12 (OpenAPI 3.1.0 §4.8.24), hence Ajv's 2020 draft.
const doc = JSON.parse(readFileSync(resolve(import.meta.dirname, '..', '..', 'openapi', 'openapi.json'), 'utf8')) as {
  paths: Record<string, Record<string, { responses: Record<string, { content?: Record<string, { schema?: unknown }> }> }>>;
  components: Record<string, unknown>;
};
const addFormats = addFormatsModule as unknown as (ajv: Ajv2020) => void;
const ajv = new Ajv2020({ strict: false, allErrors: true });
addFormats(ajv);
ajv.addSchema({ $id: 'openapi', components: doc.components });

const templates = Object.keys(doc.paths).map((path) => ({ path, pattern: new RegExp(`^${path.replace(/\{[^}]+\}/g, '[^/]+')}$`) }));

function retarget(schema: unknown): unknown {
  return JSON.parse(JSON.stringify(schema).replaceAll('"#/components/', '"openapi#/components/'));
}

const seen = new Set<string>();

/**
 * Checks one live answer against the document: its status is documented for the operation, its
 * content type is one the document lists for that status, and a JSON body validates against the
 * schema given there.
 */
function conforms(method: string, url: string, res: LightMyRequestResponse): void {
  const path = url.split('?')[0]!;
  const template = templates.find((t) => t.pattern.test(path));
  expect(template, `${method} ${path} is not in the document`).toBeDefined();
  const operation = doc.paths[template!.path]![method.toLowerCase()];
  expect(operation, `${method} ${template!.path} is not in the document`).toBeDefined();
  const response = operation!.responses[String(res.statusCode)] ?? operation!.responses.default;
  expect(response, `${method} ${template!.path} answered ${res.statusCode}, which the document does not list: ${res.body.slice(0, 200)}`).toBeDefined();
  seen.add(`${method} ${template!.path} ${res.statusCode}`);
  const type = String(res.headers['content-type'] ?? '').split(';')[0]!.trim();
  if (!response!.content) return;
  const media = response!.content[type];
  expect(media, `${method} ${template!.path} ${res.statusCode} sent ${type}; the document lists ${Object.keys(response!.content).join(', ')}`).toBeDefined();
  if (!type.endsWith('json') || !media!.schema) return;
  const validate = ajv.compile(retarget(media!.schema) as object);
  const ok = validate(res.json());
  expect(ok, `${method} ${template!.path} ${res.statusCode}: ${ajv.errorsText(validate.errors)}`).toBe(true);
}

const sha = (key: string) => createHash('sha256').update(key).digest('hex');
const KEYS = { read: 'wire-read-5a1c', submit: 'wire-submit-8d2e', admin: 'wire-admin-1f7b' };
const API_KEYS = [`lab:read:${sha(KEYS.read)}`, `lab:submit:${sha(KEYS.submit)}`, `lab:admin:${sha(KEYS.admin)}`].join(',');
const as = (key: string) => ({ authorization: `Bearer ${key}` });

let api: Awaited<ReturnType<typeof startTestApi>>;
beforeAll(async () => {
  api = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '0', BODY_LIMIT_BYTES: String(4 * 1024 * 1024) });
});
afterAll(() => api.stop());

async function exchange(method: 'GET' | 'POST' | 'PUT' | 'DELETE', url: string, options: { key?: string; payload?: unknown; headers?: Record<string, string> } = {}) {
  const res = await api.app.inject({
    method,
    url,
    headers: { ...(options.key ? as(options.key) : {}), ...options.headers },
    ...(options.payload !== undefined ? { payload: options.payload as string } : {}),
  });
  conforms(method, url, res);
  return res;
}

describe('when every route answers, successes and errors alike', () => {
  it('should answer as the OpenAPI document says, schema for schema', async () => {
    // Operations
    await exchange('GET', '/healthz');
    await exchange('GET', '/readyz');
    await exchange('GET', '/metrics', { key: KEYS.admin });
    await exchange('GET', '/problems/invalid-recipe');
    await exchange('GET', '/problems/no-such-problem');

    // Access: 401 without a key, 403 with too weak a role.
    await exchange('GET', '/v1/jobs');
    await exchange('POST', '/v1/recipes', { key: KEYS.read, payload: { method: 'welch' } });

    // Signals: the invented demo recording (the project's seeded generator), JSON upload.
    const block = demoBlock('eyes-closed', 'late', 4, 7);
    const channels = DEMO_CHANNELS.slice(0, 2);
    const data = channels.map((_, c) => Array.from(block[c]!, (v) => Math.round(v * 1000) / 1000));
    const upload = await exchange('POST', '/v1/signals', { key: KEYS.submit, payload: { samplingRate: DEMO_SAMPLING_RATE, channels, data } });
    expect(upload.statusCode).toBe(201);
    const signalId = upload.json().id as string;
    await exchange('POST', '/v1/signals', { key: KEYS.submit, payload: { samplingRate: DEMO_SAMPLING_RATE, channels: ['A', 'A'], data: [[1, 2], [3, 4]] } });
    await exchange('POST', '/v1/signals', { key: KEYS.submit, payload: 'x', headers: { 'content-type': 'text/plain' } });
    await exchange('POST', '/v1/signals?samplingRate=256&channels=Cz', { key: KEYS.submit, payload: Buffer.alloc(5 * 1024 * 1024) as unknown as string, headers: { 'content-type': 'application/octet-stream' } });
    await exchange('POST', '/v1/signals/import', { key: KEYS.submit, payload: { file: 'nothing.edf' } });
    await exchange('GET', `/v1/signals/${signalId}`, { key: KEYS.read });
    await exchange('GET', '/v1/signals/sig_00000000000000000000000000000000', { key: KEYS.read });

    // Recipes
    const pinned = await exchange('POST', '/v1/recipes', { key: KEYS.submit, payload: { method: 'welch', segmentSeconds: 1 } });
    const recipeId = pinned.json().id as string;
    await exchange('POST', '/v1/recipes', { key: KEYS.submit, payload: { method: 'welsh' } });
    await exchange('GET', `/v1/recipes/${recipeId}`, { key: KEYS.read });
    await exchange('GET', '/v1/recipes/rcp_00000000000000000000000000000000', { key: KEYS.read });

    // Jobs: a spectrum and a time–frequency record with attachments.
    const welch = await exchange('POST', '/v1/jobs', { key: KEYS.submit, payload: { signal: signalId, recipe: recipeId } });
    const morlet = await exchange('POST', '/v1/jobs', { key: KEYS.submit, payload: { signal: signalId, recipe: { method: 'morlet', frequencies: [8, 10, 12] } } });
    await exchange('POST', '/v1/jobs', { key: KEYS.submit, payload: { signal: signalId, recipe: { method: 'welch', segmentSeconds: 60 } } });
    await exchange('POST', '/v1/jobs', { key: KEYS.submit, payload: { signal: 42, recipe: recipeId } });
    for (const job of [welch, morlet]) {
      expect(job.statusCode, job.body).toBe(202);
      const id = job.json().id as string;
      await exchange('GET', `/v1/jobs/${id}/record`, { key: KEYS.read }).catch(() => undefined);
      await pollJob(api.app, id, 30_000, as(KEYS.read));
      await exchange('GET', `/v1/jobs/${id}`, { key: KEYS.read });
      await exchange('GET', `/v1/jobs/${id}/events`, { key: KEYS.read });
      const record = await exchange('GET', `/v1/jobs/${id}/record`, { key: KEYS.read });
      const attachments = (record.json().attachments ?? []) as { name: string }[];
      if (attachments[0]) await exchange('GET', `/v1/jobs/${id}/attachments/${attachments[0].name}`, { key: KEYS.read });
      await exchange('GET', `/v1/jobs/${id}/attachments/no-such`, { key: KEYS.read });
      await exchange('GET', `/v1/jobs/${id}/table?format=csv`, { key: KEYS.read });
      await exchange('GET', `/v1/jobs/${id}/table?format=nothing`, { key: KEYS.read });
      await exchange('DELETE', `/v1/jobs/${id}`, { key: KEYS.submit });
    }
    expect([...seen].some((s) => s.startsWith('GET /v1/jobs/{id}/attachments/{name} 200'))).toBe(true);
    await exchange('GET', '/v1/jobs?limit=5', { key: KEYS.read });
    await exchange('GET', '/v1/jobs?limit=0', { key: KEYS.read });
    await exchange('GET', '/v1/jobs?tenant=all', { key: KEYS.read });
    await exchange('GET', '/v1/jobs/job_00000000000000000000000000000000', { key: KEYS.read });

    // Resumable uploads
    const started = await exchange('POST', '/v1/uploads', { key: KEYS.submit, payload: { format: 'float32', samplingRate: 256, channels: ['Cz'] } });
    const uploadId = started.json().id as string;
    const octet = { 'content-type': 'application/octet-stream' };
    await exchange('PUT', `/v1/uploads/${uploadId}/parts/1`, { key: KEYS.submit, payload: Buffer.from(new Float32Array(512).fill(1.5).buffer) as unknown as string, headers: octet });
    await exchange('GET', `/v1/uploads/${uploadId}`, { key: KEYS.submit });
    await exchange('POST', `/v1/uploads/${uploadId}/complete`, { key: KEYS.submit, payload: { parts: 1 } });
    await exchange('GET', '/v1/uploads/upl_00000000000000000000000000000000', { key: KEYS.submit });
    const abandoned = await exchange('POST', '/v1/uploads', { key: KEYS.submit, payload: { format: 'edf' } });
    await exchange('DELETE', `/v1/uploads/${abandoned.json().id as string}`, { key: KEYS.submit });

    // Deleting the signal last: its jobs and records go with it.
    await exchange('DELETE', `/v1/signals/${signalId}`, { key: KEYS.admin });
    await exchange('DELETE', `/v1/signals/${signalId}`, { key: KEYS.admin });
  }, 120_000);

  it('should have exercised every documented operation', () => {
    const operations = Object.entries(doc.paths).flatMap(([path, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${path}`));
    const exercised = new Set([...seen].map((s) => s.split(' ').slice(0, 2).join(' ')));
    expect(operations.filter((op) => !exercised.has(op))).toEqual([]);
  });
});
