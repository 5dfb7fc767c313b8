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
  paths: Record<string, Record<string, { responses: Record<string, { content?: Record<string, { schema?: unknown }>; headers?: Record<string, { $ref?: string }> }> }>>;
  components: Record<string, unknown>;
};
const addFormats = addFormatsModule as unknown as (ajv: Ajv2020) => void;
const ajv = new Ajv2020({ strict: false, allErrors: true });
addFormats(ajv);
ajv.addSchema({ $id: 'openapi', components: doc.components });

// A literal segment wins over a parameter, as in the router: /v1/jobs/events is not /v1/jobs/{id}.
const templates = Object.keys(doc.paths)
  .map((path) => ({ path, pattern: new RegExp(`^${path.replace(/\{[^}]+\}/g, '[^/]+')}$`), parameters: path.split('{').length }))
  .sort((a, b) => a.parameters - b.parameters);

function retarget(schema: unknown): unknown {
  return JSON.parse(JSON.stringify(schema).replaceAll('"#/components/', '"openapi#/components/'));
}

const seen = new Set<string>();

/**
 * Checks one live answer against the document: its status is documented for the operation, its
 * content type is one the document lists for that status, a JSON body validates against the
 * schema given there, and an answer without a JSON body (CSV, Parquet, SVG, an event stream, 304)
 * carries every header the document lists for it.
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
  const type = String(res.headers['content-type'] ?? '')
    .split(';')[0]!
    .trim();
  if (!type.endsWith('json')) {
    const missing = Object.keys(response!.headers ?? {}).filter((name) => res.headers[name.toLowerCase()] === undefined);
    expect(missing, `${method} ${template!.path} ${res.statusCode} lacks documented headers`).toEqual([]);
  }
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
  // One job of a study run in the queue at a time, so that a run can be canceled before it finishes.
  api = await startTestApi({ API_KEYS, RATE_LIMIT_PER_MINUTE: '0', BODY_LIMIT_BYTES: String(4 * 1024 * 1024), STUDY_RUN_WINDOW: '1' });
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
    await exchange('POST', '/v1/signals', {
      key: KEYS.submit,
      payload: {
        samplingRate: DEMO_SAMPLING_RATE,
        channels: ['A', 'A'],
        data: [
          [1, 2],
          [3, 4],
        ],
      },
    });
    await exchange('POST', '/v1/signals', { key: KEYS.submit, payload: 'x', headers: { 'content-type': 'text/plain' } });
    await exchange('POST', '/v1/signals?samplingRate=256&channels=Cz', {
      key: KEYS.submit,
      payload: Buffer.alloc(5 * 1024 * 1024) as unknown as string,
      headers: { 'content-type': 'application/octet-stream' },
    });
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

  it('should answer as the document says for plots, studies, their runs and the multi-job event stream', async () => {
    // Two invented recordings (the project's seeded generator) of one subject, two conditions.
    const channels = DEMO_CHANNELS.slice(0, 2);
    const signals: string[] = [];
    for (const [i, condition] of (['eyes-closed', 'eyes-open'] as const).entries()) {
      const block = demoBlock(condition, 'early', 4, 11 + i);
      const data = channels.map((_, c) => Array.from(block[c]!, (v) => Math.round(v * 1000) / 1000));
      const upload = await exchange('POST', '/v1/signals', { key: KEYS.submit, payload: { samplingRate: DEMO_SAMPLING_RATE, channels, data } });
      expect(upload.statusCode, upload.body).toBe(201);
      signals.push(upload.json().id as string);
    }
    const [closed, open] = signals as [string, string];
    const channel = channels[0]!;

    // Job plots and the comparison: SVG, 304 on a matching ETag, and problems.
    const jobs: string[] = [];
    for (const signal of signals) {
      const job = await exchange('POST', '/v1/jobs', { key: KEYS.submit, payload: { signal, recipe: { method: 'welch', segmentSeconds: 1 } } });
      expect(job.statusCode, job.body).toBe(202);
      jobs.push(job.json().id as string);
      await pollJob(api.app, job.json().id as string, 30_000, as(KEYS.read));
    }
    const [first, second] = jobs as [string, string];
    const plot = await exchange('GET', `/v1/jobs/${first}/plots/psd`, { key: KEYS.read });
    expect(plot.statusCode, plot.body).toBe(200);
    const unchanged = await exchange('GET', `/v1/jobs/${first}/plots/psd`, { key: KEYS.read, headers: { 'if-none-match': String(plot.headers.etag) } });
    expect(unchanged.statusCode).toBe(304);
    await exchange('GET', `/v1/jobs/${first}/plots/no-such-kind`, { key: KEYS.read });
    await exchange('GET', `/v1/jobs/${first}/plots/psd?width=20`, { key: KEYS.read });
    await exchange('GET', `/v1/jobs/${first}/plots/psd?channels=T7`, { key: KEYS.read });
    const compare = await exchange('GET', `/v1/plots/compare?jobs=${first},${second}&channel=${channel}&labels=closed,open`, { key: KEYS.read });
    expect(compare.statusCode, compare.body).toBe(200);
    await exchange('GET', `/v1/plots/compare?jobs=${first}&channel=${channel}`, { key: KEYS.read });
    await exchange('GET', `/v1/plots/compare?jobs=${first},job_00000000000000000000000000000000&channel=${channel}`, { key: KEYS.read });

    // Several jobs in one event stream: all finished, so it ends after their states.
    const stream = await exchange('GET', `/v1/jobs/events?ids=${first},${second},job_00000000000000000000000000000000`, { key: KEYS.read });
    expect(stream.statusCode).toBe(200);
    expect(stream.body).toContain('event: unknown');
    await exchange('GET', '/v1/jobs/events', { key: KEYS.read });

    // Studies
    const created = await exchange('POST', '/v1/studies', { key: KEYS.submit, payload: { name: 'wire study', description: 'two conditions' } });
    expect(created.statusCode, created.body).toBe(201);
    const study = created.json().id as string;
    await exchange('POST', '/v1/studies', { key: KEYS.submit, payload: { name: '' } });
    await exchange('POST', '/v1/studies', { key: KEYS.read, payload: { name: 'no rights' } });
    await exchange('GET', '/v1/studies?limit=1', { key: KEYS.read });
    await exchange('GET', '/v1/studies?limit=0', { key: KEYS.read });
    await exchange('GET', `/v1/studies/${study}`, { key: KEYS.read });
    await exchange('GET', '/v1/studies/std_00000000000000000000000000000000', { key: KEYS.read });

    // Entries: JSON and an RFC 4180 CSV manifest; a refused row; an unknown study.
    const added = await exchange('POST', `/v1/studies/${study}/entries`, { key: KEYS.submit, payload: { entries: [{ signal: closed, metadata: { subject: 'p01', condition: 'eyes-closed' } }] } });
    expect(added.statusCode, added.body).toBe(201);
    const csv = await exchange('POST', `/v1/studies/${study}/entries`, { key: KEYS.submit, payload: `signal,subject,condition\r\n${open},p01,eyes-open\r\n`, headers: { 'content-type': 'text/csv' } });
    expect(csv.statusCode, csv.body).toBe(201);
    await exchange('POST', `/v1/studies/${study}/entries`, { key: KEYS.submit, payload: { entries: [{ signal: closed, metadata: { condition: 'no subject' } }] } });
    await exchange('POST', `/v1/studies/${study}/entries`, { key: KEYS.submit, payload: 'entries', headers: { 'content-type': 'text/plain' } });
    await exchange('POST', '/v1/studies/std_00000000000000000000000000000000/entries', { key: KEYS.submit, payload: { entries: [{ signal: closed, metadata: { subject: 'p01' } }] } });
    const entries = await exchange('GET', `/v1/studies/${study}/entries?limit=1`, { key: KEYS.read });
    await exchange('GET', `/v1/studies/${study}/entries?after=nothing`, { key: KEYS.read });
    await exchange('GET', '/v1/studies/std_00000000000000000000000000000000/entries', { key: KEYS.read });

    // Runs, their table and their plot.
    const started = await exchange('POST', `/v1/studies/${study}/runs`, { key: KEYS.submit, payload: { recipe: { method: 'welch', segmentSeconds: 1 } } });
    expect(started.statusCode, started.body).toBe(202);
    const run = started.json().id as string;
    await exchange('POST', `/v1/studies/${study}/runs`, { key: KEYS.submit, payload: {} });
    await exchange('POST', `/v1/studies/${study}/runs`, { key: KEYS.submit, payload: { recipe: { method: 'welsh' } } });
    await exchange('POST', `/v1/studies/${study}/runs`, { key: KEYS.submit, payload: { retryOf: 'run_00000000000000000000000000000000' } });
    const deadline = Date.now() + 60_000;
    let state = 'running';
    while (state === 'running' && Date.now() < deadline) {
      await new Promise((r) => setTimeout(r, 50));
      state = (await exchange('GET', `/v1/studies/${study}/runs/${run}`, { key: KEYS.read })).json().state as string;
    }
    expect(state).toBe('succeeded');
    await exchange('GET', `/v1/studies/${study}/runs/run_00000000000000000000000000000000`, { key: KEYS.read });
    await exchange('GET', `/v1/studies/${study}/runs`, { key: KEYS.read });
    await exchange('GET', '/v1/studies/std_00000000000000000000000000000000/runs', { key: KEYS.read });
    const table = await exchange('GET', `/v1/studies/${study}/runs/${run}/table?format=csv`, { key: KEYS.read });
    expect(table.statusCode, table.body).toBe(200);
    const parquet = await exchange('GET', `/v1/studies/${study}/runs/${run}/table?level=bands`, { key: KEYS.read, headers: { accept: 'application/vnd.apache.parquet' } });
    expect(parquet.statusCode, parquet.body).toBe(200);
    await exchange('GET', `/v1/studies/${study}/runs/${run}/table?format=nothing`, { key: KEYS.read });
    await exchange('GET', `/v1/studies/${study}/runs/${run}/table`, { key: KEYS.read, headers: { accept: 'image/png' } });
    const groups = await exchange('GET', `/v1/studies/${study}/runs/${run}/plots/psd?channel=${channel}`, { key: KEYS.read });
    expect(groups.statusCode, groups.body).toBe(200);
    await exchange('GET', `/v1/studies/${study}/runs/${run}/plots/psd?channel=${channel}&by=shift`, { key: KEYS.read });
    await exchange('GET', `/v1/studies/${study}/runs/run_00000000000000000000000000000000/plots/psd?channel=${channel}`, { key: KEYS.read });
    await exchange('DELETE', `/v1/studies/${study}/runs/${run}`, { key: KEYS.submit });
    // Eight more entries (parts of the two signals) and a slow recipe with no records yet: its jobs run
    // one after another, so the run is still open when the cancel arrives a moment later.
    const parts = [{ channels: [channels[0]!] }, { channels: [channels[1]!] }, { start: 0, end: 2 }, { start: 2, end: 4 }];
    const views = signals.flatMap((signal) => parts.map((part) => ({ signal, ...part, metadata: { subject: 'p01', condition: 'part' } })));
    expect((await exchange('POST', `/v1/studies/${study}/entries`, { key: KEYS.submit, payload: { entries: views } })).statusCode).toBe(201);
    const slow = { method: 'multitaper', timeBandwidth: 8, taperCount: 15, fftLength: 16384 };
    const pending = await exchange('POST', `/v1/studies/${study}/runs`, { key: KEYS.submit, payload: { recipe: slow, filter: { condition: 'part' } } });
    expect(pending.json().counts.waiting).toBe(7);
    const canceled = await exchange('DELETE', `/v1/studies/${study}/runs/${pending.json().id as string}`, { key: KEYS.submit });
    expect(canceled.statusCode, canceled.body).toBe(200);
    await exchange('DELETE', `/v1/studies/${study}/runs/run_00000000000000000000000000000000`, { key: KEYS.submit });

    // Removal: an entry, then the study; twice each, the second time 404.
    const entryId = (entries.json().entries as { id: string }[])[0]!.id;
    await exchange('DELETE', `/v1/studies/${study}/entries/${entryId}`, { key: KEYS.submit });
    await exchange('DELETE', `/v1/studies/${study}/entries/${entryId}`, { key: KEYS.submit });
    await exchange('DELETE', `/v1/studies/${study}`, { key: KEYS.submit });
    await exchange('DELETE', `/v1/studies/${study}`, { key: KEYS.submit });
    for (const signal of signals) await exchange('DELETE', `/v1/signals/${signal}`, { key: KEYS.admin });

    // Each of these operations showed both a success and a problem on the wire.
    const answers = new Map<string, number[]>();
    for (const [method, path, status] of [...seen].map((s) => s.split(' '))) {
      if (!/^\/v1\/(studies|plots|jobs\/events|jobs\/\{id\}\/plots)/.test(path!)) continue;
      answers.set(`${method} ${path}`, [...(answers.get(`${method} ${path}`) ?? []), Number(status)]);
    }
    expect(answers.size).toBe(16);
    for (const [operation, statuses] of answers) {
      expect(
        statuses.some((s) => s < 400),
        `${operation}: ${statuses.join(', ')}`,
      ).toBe(true);
      expect(
        statuses.some((s) => s >= 400 && s < 500),
        `${operation}: ${statuses.join(', ')}`,
      ).toBe(true);
    }
  }, 120_000);

  it('should have exercised every documented operation', () => {
    const operations = Object.entries(doc.paths).flatMap(([path, ops]) => Object.keys(ops).map((m) => `${m.toUpperCase()} ${path}`));
    const exercised = new Set([...seen].map((s) => s.split(' ').slice(0, 2).join(' ')));
    expect(operations.filter((op) => !exercised.has(op))).toEqual([]);
  });
});
