import { execFile } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEpochs, demoRecording, toUploadJson } from '../../src/signals/demo-recording.js';
import { pollJob, startTestApi } from '../helpers/app.js';
import { ROOT } from './helpers.js';

const PYTHON = '/usr/bin/python3';
const run = promisify(execFile);

/** The Python block between the recompute-hashes markers of the README. */
async function readmeSnippet(): Promise<string> {
  const readme = await readFile(join(ROOT, 'README.md'), 'utf8');
  const block = /<!-- recompute-hashes:start -->\n```python\n([\s\S]*?)```\n<!-- recompute-hashes:end -->/.exec(readme);
  if (!block) throw new Error('README.md has no recompute-hashes snippet');
  return block[1]!;
}

if (!existsSync(PYTHON)) console.warn(`[skip] the README's Python snippet is not run: ${PYTHON} does not exist here`);

describe.skipIf(!existsSync(PYTHON))("when the README's Python snippet recomputes a record's hashes", () => {
  let api: Awaited<ReturnType<typeof startTestApi>>;
  let dir: string;
  let snippet: string;

  beforeAll(async () => {
    api = await startTestApi();
    dir = await mkdtemp(join(tmpdir(), 'rhythmetric-snippet-'));
    snippet = join(dir, 'recompute.py');
    await writeFile(snippet, await readmeSnippet());
  });
  afterAll(async () => {
    await api?.stop();
    await rm(dir, { recursive: true, force: true });
  });

  /** Uploads `body` in a job, then runs the snippet on the record and the uploaded file. */
  async function check(name: string, body: Record<string, unknown>, recipe: Record<string, unknown>) {
    const submitted = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: body, recipe } });
    expect(submitted.statusCode, submitted.body).toBe(202);
    const id = (submitted.json() as { id: string }).id;
    expect((await pollJob(api.app, id, 60_000)).state).toBe('succeeded');
    const recordText = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${id}/record` })).body;
    await writeFile(join(dir, `${name}.record.json`), recordText);
    await writeFile(join(dir, `${name}.json`), JSON.stringify(body));
    const { stdout } = await run(PYTHON, [snippet, join(dir, `${name}.record.json`), join(dir, `${name}.json`)]);
    const record = JSON.parse(recordText) as { resultHash: string; input: { sha256: string } };
    // Each line holds the recomputed hash, then the record's; both must be the record's own.
    expect(
      stdout
        .trim()
        .split('\n')
        .map((line) => line.split(/\s+/)),
    ).toEqual([
      ['resultHash', record.resultHash, record.resultHash],
      ['input.sha256', record.input.sha256, record.input.sha256],
    ]);
    return recordText;
  }

  it("should match on the worked example's upload (µV epochs, Welch with a ratio)", async () => {
    await check('eyes-closed', toUploadJson(demoEpochs('eyes-closed', 'late', 4, 4, 1003)), { method: 'welch', ratios: [{ numerator: 'theta', denominator: 'beta' }] });
  }, 90_000);

  it('should match where numbers need exponents (below 1e-6) and samples hold kept gaps and events', async () => {
    // The same invented data scaled down 1000-fold (still declared in µV, so stored as sent): PSD
    // values of order 1e-7 and below, which ECMAScript writes as 1e-7 and Python's repr as 1e-07;
    // and one null sample kept as a gap (NaN) with events beside.
    const body = toUploadJson(demoEpochs('eyes-open', 'early', 3, 2, 77)) as { epochs: (number | null)[][][] } & Record<string, unknown>;
    body.epochs = body.epochs.map((epoch) => epoch.map((row) => row.map((v) => (v === null ? null : Math.round(v) / 1000))));
    body.epochs[2]![1]![5] = null;
    const upload = { ...body, unit: 'uV', nonFinite: 'keep', events: [{ onset: 0.5, duration: null, label: 'probe "A"/é' }] };
    const text = await check('millivolts', upload, { method: 'multitaper', nonFinite: 'skip-epoch', features: { powerLaw: {}, spectralEdge: {} } });
    expect(text).toMatch(/[0-9]e-[0-9]/);
  }, 90_000);

  it('should match on a continuous recording analyzed with Morlet wavelets (attachment hashes inside result)', async () => {
    const recording = toUploadJson(demoRecording(8));
    await check('recording', recording, { method: 'morlet', frequencies: { low: 4, high: 30, count: 6 }, epoching: { mode: 'fixed', lengthSeconds: 4, stepSeconds: null } });
  }, 90_000);
});
