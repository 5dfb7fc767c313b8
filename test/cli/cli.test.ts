import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Command, CommanderError } from 'commander';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { EXIT } from '../../src/cli/output.js';
import { buildProgram } from '../../src/cli/program.js';
import { canonicalJson } from '../../src/common/canonical-json.js';
import { sha256Hex } from '../../src/common/hash.js';
import { demoEpochs, demoRecording, toUploadJson } from '../../src/signals/demo-recording.js';
import { pollJob } from '../helpers/app.js';
import { runCli, startListeningApi } from './helpers.js';

/** The bytes of the record's `result` member, as written: the text resultHash is taken over. */
function resultText(recordText: string): string {
  const at = recordText.indexOf('"result":');
  const end = recordText.indexOf(',"resultHash":', at);
  return end > at ? recordText.slice(at + 9, end) : recordText.slice(at + 9, recordText.lastIndexOf('}'));
}

// Each test starts the command as a child process, which takes seconds on a busy machine.
vi.setConfig({ testTimeout: 120_000 });

const RECIPE = { method: 'welch', segmentSeconds: 1, ratios: [{ numerator: 'theta', denominator: 'beta' }], features: { peakFrequency: {} } };

describe('rhythmetric (the command line)', () => {
  let dir: string;
  let signalFile: string;
  let recipeFile: string;
  let api: Awaited<ReturnType<typeof startListeningApi>>['api'];
  let server: string;

  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'rhythmetric-cli-'));
    signalFile = join(dir, 'eyes-closed.json');
    recipeFile = join(dir, 'recipe.json');
    await writeFile(signalFile, JSON.stringify(toUploadJson(demoEpochs('eyes-closed', 'late', 3, 4, 5))));
    await writeFile(recipeFile, JSON.stringify(RECIPE));
    ({ api, url: server } = await startListeningApi());
  });
  afterAll(async () => {
    await api?.stop();
    await rm(dir, { recursive: true, force: true });
  });

  describe('when a file is analyzed here and on a server', () => {
    it("should write a local record whose result is the same bytes (and resultHash) as the server's", async () => {
      const local = await runCli(['analyze', signalFile, '--recipe', recipeFile, '--out', join(dir, 'local.json')]);
      expect(local.code, local.stderr).toBe(0);
      const localText = await readFile(join(dir, 'local.json'), 'utf8');

      // The server's record, made by the API itself (not through the command line).
      const upload = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: JSON.parse(await readFile(signalFile, 'utf8')), recipe: RECIPE } });
      const jobId = (upload.json() as { id: string }).id;
      expect((await pollJob(api.app, jobId)).state).toBe('succeeded');
      const serverText = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${jobId}/record` })).body;

      expect(resultText(localText)).toBe(resultText(serverText));
      const localRecord = JSON.parse(localText) as { resultHash: string; result: unknown; input: { sha256: string }; provenance: { mode: string } };
      const serverRecord = JSON.parse(serverText) as typeof localRecord;
      expect(localRecord.resultHash).toBe(serverRecord.resultHash);
      expect(localRecord.input.sha256).toBe(serverRecord.input.sha256);
      expect(localRecord.resultHash).toBe(sha256Hex(canonicalJson(localRecord.result)));
      expect(localRecord.provenance.mode).toBe('local');

      // The same file through --server, which goes through the typed client.
      const remote = await runCli(['analyze', signalFile, '--recipe', recipeFile, '--server', server]);
      expect(remote.code, remote.stderr).toBe(0);
      expect(resultText(remote.stdout.trim())).toBe(resultText(serverText));
    });

    it('should take a record file as the recipe (its id, hash and derived are checked, not refused)', async () => {
      const again = await runCli(['analyze', signalFile, '--recipe', join(dir, 'local.json')]);
      expect(again.code, again.stderr).toBe(0);
      expect(resultText(again.stdout.trim())).toBe(resultText(await readFile(join(dir, 'local.json'), 'utf8')));
    });

    it('should refuse a bad recipe with exit status 2, saying what and where', async () => {
      const run = await runCli(['analyze', signalFile, '--recipe', '{"method":"welch","overlapp":0.5}']);
      expect(run.code).toBe(2);
      expect(run.stderr).toMatch(/"overlapp"/);
      const unfit = await runCli(['analyze', signalFile, '--recipe', '{"method":"welch","segmentSeconds":8}']);
      expect(unfit.code).toBe(2);
      expect(unfit.stderr).toMatch(/segmentSeconds/);
    });
  });

  describe('when a record is verified against a file', () => {
    it('should exit 0 when the record is recomputed bit for bit', async () => {
      const run = await runCli(['verify', join(dir, 'local.json'), signalFile, '--json']);
      expect(run.code, run.stderr).toBe(0);
      expect(JSON.parse(run.stdout)).toMatchObject({ match: true });
    });

    it('should exit 1 and print the first differing JSON path and both values when a number was changed', async () => {
      const record = JSON.parse(await readFile(join(dir, 'local.json'), 'utf8')) as { result: { channels: { bands: { absolute: number }[] }[] } };
      const original = record.result.channels[1]!.bands[2]!.absolute;
      record.result.channels[1]!.bands[2]!.absolute = original * (1 + 1e-12);
      await writeFile(join(dir, 'changed.json'), JSON.stringify(record));
      const run = await runCli(['verify', join(dir, 'changed.json'), signalFile]);
      expect(run.code).toBe(1);
      expect(run.stdout).toContain('/result/channels/1/bands/2/absolute');
      expect(run.stdout).toContain(String(original));
    });

    it('should report a record of another engine version as such, not as a difference of numbers', async () => {
      const record = JSON.parse(await readFile(join(dir, 'local.json'), 'utf8')) as { engineVersion: string };
      record.engineVersion = '0.0.9';
      await writeFile(join(dir, 'old.json'), JSON.stringify(record));
      const run = await runCli(['verify', join(dir, 'old.json'), signalFile]);
      expect(run.code).toBe(1);
      expect(run.stdout).toMatch(/engine 0\.0\.9/);
      expect(run.stdout).not.toMatch(/first difference/);
    });

    it("should exit 1 naming the input hashes when the file is not the record's input", async () => {
      const other = join(dir, 'eyes-open.json');
      await writeFile(other, JSON.stringify(toUploadJson(demoEpochs('eyes-open', 'late', 3, 4, 5))));
      const run = await runCli(['verify', join(dir, 'local.json'), other]);
      expect(run.code).toBe(1);
      expect(run.stdout).toMatch(/input\.sha256/);
    });

    it('should exit 2 for usage and input errors', async () => {
      expect((await runCli(['verify', join(dir, 'local.json')])).code).toBe(2);
      expect((await runCli(['verify', recipeFile, signalFile])).code).toBe(2);
      expect((await runCli(['verify', join(dir, 'missing.json'), signalFile])).code).toBe(2);
    });
  });

  describe('when records are fetched from a server', () => {
    it('should write the record of a job to a file, the same bytes the API serves', async () => {
      const jobs = (await api.app.inject({ method: 'GET', url: '/v1/jobs' })).json() as { jobs: { id: string; state: string }[] };
      const job = jobs.jobs.find((j) => j.state === 'succeeded')!;
      const out = join(dir, 'fetched.json');
      const run = await runCli(['record', job.id, '--server', server, '--out', out]);
      expect(run.code, run.stderr).toBe(0);
      expect((await readFile(out, 'utf8')).trim()).toBe((await api.app.inject({ method: 'GET', url: `/v1/jobs/${job.id}/record` })).body);
      const missing = await runCli(['record', 'job_00000000000000000000000000000000', '--server', server]);
      expect(missing.code).toBe(2);
      expect(missing.stderr).toMatch(/404/);
    });
  });

  describe('when a table is asked for', () => {
    it("should write the same CSV as the server's table route, and fetch that route with the table command", async () => {
      const out = join(dir, 'bands.csv');
      const local = await runCli(['analyze', signalFile, '--recipe', recipeFile, '--table', 'bands', '--format', 'csv', '--out', out]);
      expect(local.code, local.stderr).toBe(0);
      const upload = await api.app.inject({ method: 'POST', url: '/v1/jobs', payload: { signal: JSON.parse(await readFile(signalFile, 'utf8')), recipe: RECIPE } });
      const jobId = (upload.json() as { id: string }).id;
      expect((await pollJob(api.app, jobId)).state).toBe('succeeded');
      const served = (await api.app.inject({ method: 'GET', url: `/v1/jobs/${jobId}/table?level=bands&format=csv` })).body;
      expect(await readFile(out, 'utf8')).toBe(served);

      const fetched = join(dir, 'fetched.parquet');
      const remote = await runCli(['table', jobId, '--level', 'bands', '--format', 'parquet', '--server', server, '--out', fetched]);
      expect(remote.code, remote.stderr).toBe(0);
      // Parquet files begin and end with the magic bytes "PAR1" (Apache Parquet file format).
      const bytes = await readFile(fetched);
      expect(bytes.subarray(0, 4).toString()).toBe('PAR1');
      expect(bytes.subarray(-4).toString()).toBe('PAR1');
    });

    it('should refuse a level the record cannot give with exit status 2, listing those it can', async () => {
      const run = await runCli(['analyze', signalFile, '--recipe', recipeFile, '--table', 'pair-bands']);
      expect(run.code).toBe(2);
      expect(run.stderr).toMatch(/"bands"/);
    });
  });

  describe('when asked for help', () => {
    it.each(['analyze', 'verify', 'study run', 'record', 'plot', 'table', 'serve', 'worker', 'demo'])('should describe the %s command in its own help', async (command) => {
      // In this process: commander prints the help and stops with code commander.helpDisplayed.
      let printed = '';
      const program = buildProgram(async () => EXIT.ok);
      const configure = (c: Command) => {
        c.exitOverride().configureOutput({ writeOut: (text) => (printed += text), writeErr: (text) => (printed += text) });
        c.commands.forEach(configure);
      };
      configure(program);
      const error = await program.parseAsync([...command.split(' '), '--help'], { from: 'user' }).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(CommanderError);
      expect((error as CommanderError).code).toBe('commander.helpDisplayed');
      expect(printed).toContain(`Usage: rhythmetric ${command}`);
      expect(printed.split('\n').length).toBeGreaterThan(4);
    });

    it('should exit 2 for an unknown command', async () => {
      expect((await runCli(['analyse'])).code).toBe(2);
    });
  });

  describe('when the output is piped', () => {
    it('should print plain progress lines without colour or cursor codes, and JSON lines with --json', async () => {
      const plain = await runCli(['analyze', signalFile, '--recipe', recipeFile, '--out', join(dir, 'piped.json')]);
      expect(plain.code).toBe(0);
      expect(plain.stderr).toContain('analyze: 1/1');
      expect(plain.stderr).not.toMatch(/\u001b\[/);
      const json = await runCli(['analyze', signalFile, '--recipe', recipeFile, '--out', join(dir, 'piped.json'), '--json']);
      for (const line of json.stderr.trim().split('\n')) expect(() => JSON.parse(line)).not.toThrow();
    });
  });

  describe('when interrupted with Ctrl-C', () => {
    it('should stop the computation, exit 130 and leave no output file, whole or partial', async () => {
      const recording = join(dir, 'recording.json');
      await writeFile(recording, JSON.stringify(toUploadJson(demoRecording())));
      const out = join(dir, 'interrupted.json');
      let sent = false;
      const run = await runCli(['analyze', recording, '--recipe', '{"method":"morlet","frequencies":{"low":2,"high":45,"count":60}}', '--out', out], {
        onStderr: (text, child) => {
          if (!sent && text.includes('analyzing')) {
            sent = true;
            child.kill('SIGINT');
          }
        },
      });
      expect(sent).toBe(true);
      expect(run.code).toBe(130);
      expect(run.stderr).toContain('interrupted');
      expect((await readdir(dir)).filter((f) => f.startsWith('interrupted') || f.includes('.part'))).toEqual([]);
    });
  });
});
