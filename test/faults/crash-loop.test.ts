import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpuTicks, freePort, http, LONG_RECIPE, LONG_SIGNAL, noiseFloat32, ServiceProcess, until, uploadFloat32 } from './helpers.js';

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

  async function serve(): Promise<{ child: ServiceProcess; base: string }> {
    const port = await freePort();
    const child = new ServiceProcess('serve', { DATA_DIR: dataDir, PORT: String(port), HOST: '127.0.0.1', RATE_LIMIT_PER_MINUTE: '0', JOB_ATTEMPTS: String(ATTEMPTS) });
    children.push(child);
    await child.waitForLog('rhythmetric serving', 20_000);
    return { child, base: `http://127.0.0.1:${port}` };
  }

  const jobOf = async (base: string, id: string) => (await http(base, 'GET', `/v1/jobs/${id}`)).body;

  it('should fail the job after JOB_ATTEMPTS starts, say it took the process down, and not start it again', async () => {
    let server = await serve();
    const signal = await uploadFloat32(server.base, noiseFloat32(41, channels, seconds, samplingRate), channels, samplingRate);
    const submitted = await http(server.base, 'POST', '/v1/jobs', { signal, recipe: LONG_RECIPE });
    expect(submitted.status).toBe(202);
    const id = submitted.body.id as string;

    for (let kill = 1; kill <= ATTEMPTS; kill++) {
      const running = await until('the job to run', async () => {
        const job = await jobOf(server.base, id);
        return job.state === 'running' ? job : undefined;
      }, 30_000, 50);
      expect(running.attempts).toBe(kill);
      // The state turns "running" in memory before its write is durable; the computation (CPU
      // time) starts only after it, so a kill from then on is one the restart must count.
      await until('the job to compute', async () => {
        const before = await cpuTicks(server.child.pid);
        await new Promise((r) => setTimeout(r, 300));
        return (await cpuTicks(server.child.pid)) - before >= 15 ? true : undefined;
      }, 30_000, 0);
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
