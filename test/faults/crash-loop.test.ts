import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { http, LONG_RECIPE, LONG_SIGNAL, noiseFloat32, serveEmbedded, type ServiceProcess, until, uploadFloat32 } from './helpers.js';

const { channels, seconds, samplingRate } = LONG_SIGNAL;
const ATTEMPTS = 3;

/**
 * kill -9 is what the kernel's OOM killer does to a process that a job drives out of memory: no
 * shutdown hook runs. A job that does it on every start must stop being restarted once it has used
 * its attempts (JOB_ATTEMPTS), or the service never comes up for long.
 */
describe('when a job is running each time the embedded server is killed with SIGKILL', () => {
  let dataDir: string;
  const children: ServiceProcess[] = [];

  beforeAll(async () => {
    dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-crash-loop-'));
  });
  afterAll(async () => {
    await Promise.all(children.map((c) => c.stop()));
    await rm(dataDir, { recursive: true, force: true });
  });

  const serve = () => serveEmbedded(dataDir, children, { JOB_ATTEMPTS: String(ATTEMPTS) });

  const jobOf = async (base: string, id: string) => (await http(base, 'GET', `/v1/jobs/${id}`)).body;

  it('should fail the job after JOB_ATTEMPTS starts, say it took the process down, and not start it again', async () => {
    let server = await serve();
    const signal = await uploadFloat32(server.base, noiseFloat32(41, channels, seconds, samplingRate), channels, samplingRate);
    const submitted = await http(server.base, 'POST', '/v1/jobs', { signal, recipe: LONG_RECIPE });
    expect(submitted.status).toBe(202);
    const id = submitted.body.id as string;

    for (let kill = 1; kill <= ATTEMPTS; kill++) {
      const running = await until(
        'the job to run',
        async () => {
          const job = await jobOf(server.base, id);
          return job.state === 'running' ? job : undefined;
        },
        30_000,
        50,
      );
      expect(running.attempts).toBe(kill);
      // The state turns "running" in memory a moment before its write is durable; the computation
      // starts only after that write. Kill once the disk says so, as a crash mid-computation would.
      await until(
        'the start to be written',
        async () => {
          const text = await readFile(join(dataDir, 'jobs', `${id}.json`), 'utf8');
          const { view } = JSON.parse(text) as { view: { state: string; attempts: number } };
          return view.state === 'running' && view.attempts === kill ? true : undefined;
        },
        30_000,
        20,
      );
      server.child.kill('SIGKILL');
      expect((await server.child.exited).signal).toBe('SIGKILL');
      server = await serve();
    }

    // The first answer after the last restart is already final: the job never went back to the pool.
    const job = await jobOf(server.base, id);
    expect(job.state).toBe('failed');
    expect(job.attempts).toBe(ATTEMPTS);
    const problem = job.problem as { type: string; status: number; detail: string };
    expect(problem.type).toBe('/problems/worker-crashed');
    expect(problem.status).toBe(500);
    expect(problem.detail).toMatch(/took the process down 3 time\(s\)/);
    await new Promise((r) => setTimeout(r, 1000));
    expect(await jobOf(server.base, id)).toMatchObject({ state: 'failed', attempts: ATTEMPTS });
    // Nothing half-written: no record for a job that never finished a run.
    expect((await http(server.base, 'GET', `/v1/jobs/${id}/record`)).status).toBe(409);
  }, 180_000);
});
