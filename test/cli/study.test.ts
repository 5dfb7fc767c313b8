import { mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { demoEpochs, toUploadJson } from '../../src/signals/demo-recording.js';
import { runCli, startListeningApi } from './helpers.js';

// Each test starts the command as a child process, which takes seconds on a busy machine.
vi.setConfig({ testTimeout: 120_000 });

const RECIPE = '{"method":"welch","segmentSeconds":1}';

/** The last JSON line of --json output whose message starts with `prefix`. */
function summary(stderr: string, prefix: string): Record<string, unknown> {
  const lines = stderr
    .trim()
    .split('\n')
    .map((l) => JSON.parse(l) as { message: string });
  return lines.filter((l) => l.message.startsWith(prefix)).at(-1) as unknown as Record<string, unknown>;
}

describe('rhythmetric study run', () => {
  let dir: string;
  let manifest: string;

  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'rhythmetric-study-'));
    await mkdir(join(dir, 'files'));
    const rows = ['file,subject,condition,age:number'];
    let seed = 40;
    for (const subject of ['s1', 's2']) {
      for (const condition of ['eyes-open', 'eyes-closed'] as const) {
        await writeFile(join(dir, 'files', `${subject}-${condition}.json`), JSON.stringify(toUploadJson(demoEpochs(condition, 'early', 2, 2, seed++))));
        rows.push(`files/${subject}-${condition}.json,${subject},${condition},${subject === 's1' ? 31 : 45}`);
      }
    }
    manifest = join(dir, 'manifest.csv');
    await writeFile(manifest, rows.join('\r\n') + '\r\n');
  });
  afterAll(async () => {
    await rm(dir, { recursive: true, force: true });
  });

  describe('when run here, with no server', () => {
    it("should write every entry's record and a run table led by the entry and its metadata, and skip what is done on a second run", async () => {
      const out = join(dir, 'local');
      const first = await runCli(['study', 'run', manifest, '--recipe', RECIPE, '--out', out, '--table', 'bands', '--json']);
      expect(first.code, first.stderr).toBe(0);
      expect(summary(first.stderr, 'study:')).toMatchObject({ entries: 4, computed: 4, reused: 0, failed: 0 });
      const records = (await readdir(out)).filter((f) => f.endsWith('.record.json'));
      expect(records).toHaveLength(4);

      const [header, ...lines] = (await readFile(join(out, 'bands.csv'), 'utf8'))
        .trim()
        .split('\r\n')
        .map((l) => l.split(','));
      expect(header!.slice(0, 4)).toEqual(['entry', 'subject', 'condition', 'age']);
      // Every row holds exactly the values of the record it came from (read back to the same double).
      const row = lines.find((l) => l[0] === 'files/s2-eyes-closed.json' && l[header!.indexOf('channel')] === 'Oz' && l[header!.indexOf('band')] === 'alpha')!;
      expect(row.slice(1, 4)).toEqual(['s2', 'eyes-closed', '45']);
      const record = JSON.parse(await readFile(join(out, records.find((f) => f.startsWith('s2-eyes-closed'))!), 'utf8')) as {
        result: { channels: { name: string; bands: { name: string; absolute: number }[] }[] };
      };
      const alpha = record.result.channels.find((c) => c.name === 'Oz')!.bands.find((b) => b.name === 'alpha')!.absolute;
      expect(Object.is(Number(row[header!.indexOf('absolute')]), alpha)).toBe(true);

      const second = await runCli(['study', 'run', manifest, '--recipe', RECIPE, '--out', out, '--json']);
      expect(second.code, second.stderr).toBe(0);
      expect(summary(second.stderr, 'study:')).toMatchObject({ entries: 4, computed: 0, reused: 4 });
    }, 120_000);

    it('should refuse a manifest without a subject column with exit status 2, naming the column, and write nothing', async () => {
      const bad = join(dir, 'bad.csv');
      await writeFile(bad, 'file,condition\r\nfiles/s1-eyes-open.json,eyes-open\r\n');
      const run = await runCli(['study', 'run', bad, '--recipe', RECIPE, '--out', join(dir, 'bad-run')]);
      expect(run.code).toBe(2);
      expect(run.stderr).toMatch(/"subject"/);
      expect((await readdir(dir)).includes('bad-run')).toBe(false);
    });
  });

  describe('when run on a server', () => {
    let api: Awaited<ReturnType<typeof startListeningApi>>['api'];
    let server: string;
    beforeAll(async () => {
      ({ api, url: server } = await startListeningApi());
    });
    afterAll(async () => {
      await api?.stop();
    });

    it('should upload the files, run the study, fetch the run table, and on a second run reuse every record', async () => {
      const out = join(dir, 'remote');
      const first = await runCli(['study', 'run', manifest, '--recipe', RECIPE, '--out', out, '--table', 'bands', '--server', server, '--json']);
      expect(first.code, first.stderr).toBe(0);
      const done = summary(first.stderr, 'study stu_') as { state: string; counts: { total: number; succeeded: number } };
      expect(done).toMatchObject({ state: 'succeeded', counts: { total: 4, succeeded: 4 } });
      const table = await readFile(join(out, 'bands.csv'), 'utf8');
      expect(table.split('\r\n')[0]!.split(',').slice(1, 4)).toEqual(['subject', 'condition', 'age']);
      // The same values as the table made here from the same files and recipe (after the entry column).
      const local = (await readFile(join(dir, 'local', 'bands.csv'), 'utf8'))
        .trim()
        .split('\r\n')
        .map((l) => l.split(',').slice(1).join(','))
        .sort();
      const remote = table
        .trim()
        .split('\r\n')
        .map((l) => l.split(',').slice(1).join(','))
        .sort();
      expect(remote).toEqual(local);

      const second = await runCli(['study', 'run', manifest, '--recipe', RECIPE, '--out', out, '--server', server, '--json']);
      expect(second.code, second.stderr).toBe(0);
      expect(summary(second.stderr, 'study stu_')).toMatchObject({ state: 'succeeded', counts: { total: 4, reused: 4 } });
    }, 120_000);
  });
});
