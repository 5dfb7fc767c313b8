import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createLogger, startApi } from '../../src/cli/runtime.js';
import { loadConfig } from '../../src/config.js';
import { demoEpochs, toUploadJson } from '../../src/signals/demo-recording.js';

describe('when the API stops while a study run is going', () => {
  let dataDir = '';
  afterAll(async () => {
    if (dataDir) await rm(dataDir, { recursive: true, force: true });
  });

  it('should pick the run up after a restart and finish every entry', async () => {
    dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-resume-'));
    const config = loadConfig({ DATA_DIR: dataDir, WORKER_THREADS: '1', STUDY_RUN_WINDOW: '1', LOG_LEVEL: 'silent' });
    const first = await startApi(config, createLogger(config));
    const post = (api: typeof first, url: string, payload: unknown) => api.app.inject({ method: 'POST', url, payload: payload as Record<string, unknown> });
    const study = (await post(first, '/v1/studies', { name: 'interrupted' })).json().id as string;
    const entries = [];
    for (let i = 0; i < 6; i++) entries.push({ signal: (await post(first, '/v1/signals', toUploadJson(demoEpochs('eyes-open', 'early', 4, 2, 700 + i)))).json().id, metadata: { subject: `p${i}` } });
    expect((await post(first, `/v1/studies/${study}/entries`, { entries })).statusCode).toBe(201);
    const run = await post(first, `/v1/studies/${study}/runs`, { recipe: { method: 'multitaper' } });
    expect(run.json().counts.waiting).toBe(5);
    await first.close();

    const second = await startApi(config, createLogger(config));
    try {
      let view;
      for (let i = 0; i < 400; i++) {
        view = (await second.app.inject({ method: 'GET', url: `/v1/studies/${study}/runs/${run.json().id}` })).json();
        if (view.state !== 'running') break;
        await new Promise((r) => setTimeout(r, 50));
      }
      expect(view).toMatchObject({ state: 'succeeded', counts: { total: 6, succeeded: 6 } });
    } finally {
      await second.close();
    }
  });
});
