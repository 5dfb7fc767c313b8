import { readFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sha256Hex } from '../../src/common/hash.js';
import { canonicalJson } from '../../src/common/canonical-json.js';
import { ApiProblemError, createRhythmetricClient, type RhythmetricClient } from '../../src/client/index.js';
import { demoEpochs, toUploadJson } from '../../src/signals/demo-recording.js';
import { CLIENT_TYPES, generateClientTypes } from '../../scripts/write-client.js';
import { startListeningApi } from '../cli/helpers.js';

const root = resolve(import.meta.dirname, '..', '..');

describe('when the OpenAPI document changes', () => {
  it('should keep src/client/api-types.ts equal to what openapi-typescript generates from it (run npm run client)', async () => {
    expect(await readFile(CLIENT_TYPES, 'utf8')).toBe(await generateClientTypes());
  });

  it('should export the client from the package as rhythmetric/client, built from src/client/index.ts', async () => {
    const pkg = JSON.parse(await readFile(resolve(root, 'package.json'), 'utf8')) as { exports: Record<string, { types: string; default: string }> };
    expect(pkg.exports['./client']).toEqual({ types: './src/client/index.ts', default: './dist/client/index.js' });
  });
});

describe('when the client talks to a running server', () => {
  let api: Awaited<ReturnType<typeof startListeningApi>>['api'];
  let client: RhythmetricClient;
  beforeAll(async () => {
    let url: string;
    ({ api, url } = await startListeningApi());
    client = createRhythmetricClient({ baseUrl: `${url}/` });
  });
  afterAll(async () => {
    await api?.stop();
  });

  it("should upload, submit, wait and fetch a record whose resultHash is the SHA-256 of its result's canonical JSON", async () => {
    const signal = await client.uploadSignal(toUploadJson(demoEpochs('eyes-open', 'early', 2, 4, 11)));
    expect(signal.id).toMatch(/^sig_[0-9a-f]{32}$/);
    const job = await client.submitJob({ signal: signal.id, recipe: { method: 'periodogram' } });
    expect(job.status).toBe(202);
    const progress: number[] = [];
    const done = await client.waitForJob(job.id, { onProgress: (p) => progress.push(p), intervalMs: 10 });
    expect(done.state).toBe('succeeded');
    expect(progress.at(-1)).toBe(1);
    const text = await client.getRecordText(job.id);
    const record = JSON.parse(text) as { result: unknown; resultHash: string };
    expect(record.resultHash).toBe(sha256Hex(canonicalJson(record.result)));
    expect((await client.submitJob({ signal: signal.id, recipe: { method: 'periodogram' } })).status).toBe(200);
  });

  it('should turn a problem answer into an ApiProblemError carrying the status, the problem type and the pointer', async () => {
    const error = await client.submitJob({ signal: 'sig_00000000000000000000000000000000', recipe: { method: 'welch', overlapp: 1 } }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiProblemError);
    const problem = error as ApiProblemError;
    expect([404, 422]).toContain(problem.status);
    expect(problem.problem.type).toMatch(/\/problems\//);
    const bad = (await client.pinRecipe({ method: 'welch', overlapp: 1 }).catch((e: unknown) => e)) as ApiProblemError;
    expect(bad.status).toBe(422);
    expect(bad.problem.detail).toContain('"overlapp"');
    expect(bad.message).toContain('422');
  });
});
