import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runDemoCommand } from '../../src/cli/demo.js';
import { pollJob, startTestApi } from '../helpers/app.js';
import { ROOT } from './helpers.js';

interface Band {
  name: string;
  absolute: number;
  relative: number;
  decibels: number;
  bins: number;
}
type RecordBody = { result: { channels: { name: string; bands: Band[] }[] } };

function band(record: RecordBody, channel: string, name: string): Band {
  return record.result.channels.find((c) => c.name === channel)!.bands.find((b) => b.name === name)!;
}

/** "308.0155…" in the README: the value must start with these digits. */
function expectDigits(value: number, printed: string) {
  expect(String(value).startsWith(printed.replace('…', '')), `${value} against the README's ${printed}`).toBe(true);
}

describe("when the README's worked example is run as written", () => {
  let readme: string;
  let section: string;
  let api: Awaited<ReturnType<typeof startTestApi>>;
  let demo: string;

  beforeAll(async () => {
    readme = await readFile(join(ROOT, 'README.md'), 'utf8');
    section = readme.slice(readme.indexOf('## A worked example'), readme.indexOf('## Recipes'));
    demo = await mkdtemp(join(tmpdir(), 'rhythmetric-readme-'));
    await runDemoCommand(['--out', demo]);
    api = await startTestApi();
  });
  afterAll(async () => {
    await api?.stop();
    await rm(demo, { recursive: true, force: true });
  });

  it('should give the ids, hashes, states and band values the README shows', async () => {
    const signalId = /"id":"(sig_[0-9a-f]{32})"/.exec(section)![1]!;
    const sha = /"sha256":"([0-9a-f]+)…"/.exec(section)![1]!;
    const jobId = /"id":"(job_[0-9a-f]{32})"/.exec(section)![1]!;
    const resultHash = /"resultHash":"([0-9a-f]+)…"/.exec(section)![1]!;

    // Step 1: the upload, byte for byte the file npm run demo writes.
    const upload = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: { 'content-type': 'application/json' }, payload: await readFile(join(demo, 'eyes-closed-late.json')) });
    expect(upload.statusCode).toBe(201);
    expect(upload.json()).toMatchObject({ id: signalId, samplingRate: 256, channels: ['F3', 'F4', 'Fz', 'Cz', 'Pz', 'O1', 'Oz', 'O2'], unit: 'uV', epochCount: 10, samplesPerEpoch: 1024 });
    expect((upload.json() as { sha256: string }).sha256.startsWith(sha)).toBe(true);

    // Step 2: the body of the README's curl -d, as written there.
    const body = JSON.parse(/-d '(\{[\s\S]*?\})'/.exec(section)![1]!) as unknown;
    const submitted = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: body as object });
    expect(submitted.statusCode).toBe(202);
    expect((submitted.json() as { id: string }).id).toBe(jobId);
    expect(['queued', 'running']).toContain((submitted.json() as { state: string }).state);

    // Step 3: poll and fetch.
    const done = await pollJob(api.app, jobId);
    expect(done).toMatchObject({ state: 'succeeded', progress: 1 });
    expect(String(done.resultHash).startsWith(resultHash)).toBe(true);
    const record = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${jobId}/record` })).json() as RecordBody;
    const [, absolute, relative, decibels, bins] = /"absolute":([0-9.]+…),"relative":([0-9.]+…),\s*"decibels":([0-9.]+…),\s*"bins":(\d+)/.exec(section)!;
    const alpha = band(record, 'Oz', 'alpha');
    expectDigits(alpha.absolute, absolute!);
    expectDigits(alpha.relative, relative!);
    expectDigits(alpha.decibels, decibels!);
    expect(alpha.bins).toBe(Number(bins));
    // "about 24 µV of 10 Hz alpha … ≈ 300 µV²" (the generator's own amplitude; the README's estimate)
    expect(alpha.absolute).toBeGreaterThan(270);
    expect(alpha.absolute).toBeLessThan(330);
    expect(band(record, 'F3', 'delta').absolute).toBeLessThan(40);

    const again = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: body as object });
    expect(again.statusCode).toBe(200);
  });

  it('should give the eyes-open values the README quotes (Oz alpha about 41 µV², F3/F4 delta about 275 µV²)', async () => {
    const about = (text: RegExp) => Number(text.exec(section)![1]);
    const ozAlpha = about(/gives about (\d+) µV² on Oz/);
    const blinkDelta = about(/blinks put about\s+(\d+) µV² of delta/);
    const upload = await api.app.inject({ method: 'POST', url: '/v1/signals', headers: { 'content-type': 'application/json' }, payload: await readFile(join(demo, 'eyes-open-late.json')) });
    const submitted = await api.app.inject({
      method: 'POST',
      url: '/v1/jobs',
      payload: { signal: (upload.json() as { id: string }).id, recipe: { method: 'welch', ratios: [{ numerator: 'theta', denominator: 'beta' }] } },
    });
    const id = (submitted.json() as { id: string }).id;
    expect((await pollJob(api.app, id)).state).toBe('succeeded');
    const record = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${id}/record` })).json() as RecordBody;
    expect(Math.round(band(record, 'Oz', 'alpha').absolute)).toBe(ozAlpha);
    for (const channel of ['F3', 'F4']) expect(Math.abs(band(record, channel, 'delta').absolute - blinkDelta) / blinkDelta).toBeLessThan(0.05);
  });
});
