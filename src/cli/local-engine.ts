import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadConfig, type Config } from '../config.js';
import { DomainError } from '../common/errors.js';
import { SignalUploadEnvelope } from '../http/schemas.js';
import { planJob } from '../jobs/plan.js';
import { storeSignal } from '../stores/signals.js';
import { createComputePool, type ComputePool } from '../jobs/compute-pool.js';
import { normalizeRecipe } from '../recipes/normalize.js';
import { isRecipeRefusal } from '../recipes/errors.js';
import { decodeJsonSignal, type JsonSignalBody } from '../signals/decode-json.js';
import { SignalInputError } from '../signals/errors.js';
import type { SignalView } from '../signals/view.js';
import { ingestFile } from '../stores/ingest.js';
import { createStore } from '../stores/create-store.js';
import type { SignalMeta, Store, StoreConfig } from '../stores/store.js';

export type InputFormat = 'json' | 'float32' | 'edf';

/** A file to analyze and how to read it (float32 needs the sampling rate and channel names). */
export interface LocalInput {
  path: string;
  format: InputFormat;
  samplingRate?: number | undefined;
  channels?: string[] | undefined;
  epochCount?: number | undefined;
  unit?: string | undefined;
}

/** Bad input found before or during the computation: the CLI exits with 2 and says what and where. */
export class LocalInputError extends Error {
  override readonly name = 'LocalInputError';
  constructor(
    message: string,
    readonly where: string | null = null,
  ) {
    super(where ? `${message} (at ${where})` : message);
  }
}

export function formatOf(path: string, given?: string): InputFormat {
  if (given === 'json' || given === 'float32' || given === 'edf') return given;
  if (given) throw new LocalInputError(`--format must be json, float32 or edf, not "${given}"`);
  const lower = path.toLowerCase();
  if (lower.endsWith('.edf') || lower.endsWith('.bdf')) return 'edf';
  if (lower.endsWith('.f32') || lower.endsWith('.bin') || lower.endsWith('.float32')) return 'float32';
  return 'json';
}

/**
 * The engine without a server: the same decoding, recipe checks, job planning and worker-thread
 * computation as the API, on a throw-away store, so a record made here has the same `result`
 * bytes (and resultHash) as the server's for the same input and recipe.
 */
export async function createLocalEngine(options: { threads?: number; env?: NodeJS.ProcessEnv } = {}) {
  const dataDir = await mkdtemp(join(tmpdir(), 'rhythmetric-local-'));
  const config: Readonly<Config> = loadConfig({ ...(options.env ?? process.env), DATA_DIR: dataDir, REDIS_URL: '', STORE: 'filesystem' });
  const storeConfig: StoreConfig = { kind: 'filesystem', dataDir };
  const store: Store = createStore(storeConfig);
  let pool: ComputePool | null = null;

  async function storeInput(input: LocalInput): Promise<SignalMeta> {
    if (input.format === 'json') {
      let body: unknown;
      try {
        body = JSON.parse(await readFile(input.path, 'utf8'));
      } catch (error) {
        throw new LocalInputError(`${input.path} is not readable JSON: ${(error as Error).message}`);
      }
      const parsed = SignalUploadEnvelope.safeParse(body);
      if (!parsed.success) {
        const issue = parsed.error.issues[0]!;
        throw new LocalInputError(`${input.path}: ${issue.message}`, '/' + issue.path.join('/'));
      }
      return storeSignal(store, decodeJsonSignal(parsed.data as JsonSignalBody, config.signalLimits), 'public');
    }
    if (input.format === 'float32') {
      if (!input.samplingRate || !input.channels?.length) throw new LocalInputError('float32 files need --sampling-rate and --channels');
      return ingestFile(
        store,
        input.path,
        { format: 'float32', samplingRate: input.samplingRate, channels: input.channels, epochCount: input.epochCount ?? 1, unit: input.unit },
        { tenant: 'public', limits: config.signalLimits, maxStoreBytes: 0 },
      );
    }
    return ingestFile(store, input.path, { format: 'edf', channels: input.channels, samplingRate: input.samplingRate }, { tenant: 'public', limits: config.signalLimits, maxStoreBytes: 0 });
  }

  return {
    config,
    /**
     * Analyzes one file with one recipe (a recipe object, as a file holds it, or a record's recipe).
     * @returns the record as JSON text, `result` in the canonical form its hash was taken over
     */
    async analyze(
      input: LocalInput,
      recipe: unknown,
      run: { onProgress?: (fraction: number) => void; signal?: AbortSignal; view?: SignalView | null } = {},
    ): Promise<{ text: string; signal: SignalMeta }> {
      try {
        const meta = await storeInput(input);
        const { spec } = planJob(config.recipeLimits, meta, normalizeRecipe(recipe), run.view ?? null);
        pool ??= createComputePool(options.threads ?? config.workerThreads, config.jobThreads);
        const output = await pool.run(spec, storeConfig, 'local', run.onProgress ?? (() => {}), run.signal);
        if (!output.ok) throw new LocalInputError(output.problem.detail, output.problem.pointer ?? null);
        const text = await store.getDocument('records', spec.recordKey);
        if (text === null) throw new Error('the record was not written');
        return { text, signal: meta };
      } catch (error) {
        throw asInputError(error, input.path);
      }
    },
    async close() {
      await pool?.close();
      await store.close();
      await rm(dataDir, { recursive: true, force: true });
    },
  };
}

export type LocalEngine = Awaited<ReturnType<typeof createLocalEngine>>;

/** The errors the API would answer with a 4xx become input errors that name the file and the place. */
function asInputError(error: unknown, path: string): unknown {
  if (error instanceof SignalInputError) return new LocalInputError(`${path}: ${error.message}`, error.pointer);
  if (isRecipeRefusal(error)) return new LocalInputError(`recipe: ${error.detail}`, error.pointer);
  if (error instanceof DomainError && error.status < 500) return new LocalInputError(error.detail, error.pointer);
  if ((error as NodeJS.ErrnoException).code === 'ENOENT') return new LocalInputError(`${path}: no such file`);
  return error;
}
