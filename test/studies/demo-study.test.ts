import { mkdtemp, readFile, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runDemoCommand } from '../../src/cli/demo.js';
import { startTestApi } from '../helpers/app.js';

describe('when the demo study is uploaded as the README walks through it', () => {
  let out: string;
  let api: Awaited<ReturnType<typeof startTestApi>>;
  beforeAll(async () => {
    out = await mkdtemp(join(tmpdir(), 'rhythmetric-demo-'));
    const write = process.stdout.write;
    process.stdout.write = (() => true) as typeof process.stdout.write;
    try {
      expect(await runDemoCommand(['--out', out])).toBe(0);
    } finally {
      process.stdout.write = write;
    }
    api = await startTestApi();
  });
  afterAll(async () => {
    await api.stop();
    await rm(out, { recursive: true, force: true });
  });

  it('should give every recording the id its manifest row names, so the manifest adds all 48 entries', async () => {
    const dir = join(out, 'study');
    const files = (await readdir(join(dir, 'recordings'))).sort();
    expect(files).toHaveLength(12 * 2 * 2);
    for (const file of files) {
      const res = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: { 'content-type': 'application/json' }, payload: await readFile(join(dir, 'recordings', file)) });
      expect(res.statusCode).toBe(201);
    }
    const study = (await api.app.inject({ method: 'POST', url: '/v1/studies', payload: { name: 'night shift' } })).json().id;
    const manifest = await readFile(join(dir, 'manifest.csv'), 'utf8');
    const added = await api.app.inject({ method: 'POST', url: `/v1/studies/${study}/entries`, headers: { 'content-type': 'text/csv' }, payload: manifest });
    expect(added.statusCode, added.body).toBe(201);
    expect(added.json().added).toBe(48);
    const entries = added.json().entries as { metadata: { subject: string; session: string; condition: string; age: number } }[];
    expect(new Set(entries.map((e) => e.metadata.subject)).size).toBe(12);
    expect(entries.filter((e) => e.metadata.session === 'late' && e.metadata.condition === 'eyes-closed')).toHaveLength(12);
    expect(entries.every((e) => typeof e.metadata.age === 'number')).toBe(true);
  });
});
