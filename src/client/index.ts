/**
 * The typed client of the rhythmetric API (`rhythmetric/client`): openapi-fetch over types that
 * openapi-typescript generates from openapi/openapi.json, so every call is checked against the
 * published contract. The command line makes all its remote calls through it.
 *
 * @example
 * const client = createRhythmetricClient({ baseUrl: 'http://127.0.0.1:8080', key: process.env.RHYTHMETRIC_KEY });
 * const job = await client.submitJob({ signal: 'sig_…', recipe: { method: 'welch' } });
 * const done = await client.waitForJob(job.id);
 */
import createFetchClient from 'openapi-fetch';
import type { components, paths } from './api-types.js';

export type { components, paths };
export type Job = components['schemas']['Job'];
export type Problem = components['schemas']['Problem'];
export type SignalInfo = components['schemas']['SignalInfo'];
export type PinnedRecipe = components['schemas']['PinnedRecipe'];
export type JobRequest = components['schemas']['JobRequestInput'];
export type Study = components['schemas']['Study'];
export type StudyRun = components['schemas']['StudyRun'];

export interface ClientOptions {
  /** e.g. http://127.0.0.1:8080 */
  baseUrl: string;
  /** API key, sent as `Authorization: Bearer <key>` */
  key?: string | undefined;
  /** a fetch of your own (tests, proxies); defaults to the global fetch */
  fetch?: typeof fetch;
}

/** A 4xx/5xx answer of the API: the RFC 9457 problem it sent, or what could be read of the body. */
export class ApiProblemError extends Error {
  override readonly name = 'ApiProblemError';
  constructor(
    readonly status: number,
    readonly problem: Partial<Problem> & { detail?: string; pointer?: string },
  ) {
    super(`${status} ${problem.title ?? 'error'}${problem.detail ? `: ${problem.detail}` : ''}${problem.pointer ? ` (at ${problem.pointer})` : ''}`);
  }
}

const FINISHED = new Set(['succeeded', 'failed', 'canceled']);

function problemOf(status: number, body: unknown): ApiProblemError {
  if (body && typeof body === 'object') return new ApiProblemError(status, body as Problem);
  return new ApiProblemError(status, { detail: typeof body === 'string' && body ? body.slice(0, 500) : `HTTP ${status}` });
}

function expectData<T>(result: { data?: T; error?: unknown; response: Response }): T {
  if (result.data === undefined || !result.response.ok) throw problemOf(result.response.status, result.error);
  return result.data;
}

export function createRhythmetricClient(options: ClientOptions) {
  const baseUrl = options.baseUrl.replace(/\/+$/, '');
  const headers: Record<string, string> = options.key ? { authorization: `Bearer ${options.key}` } : {};
  const api = createFetchClient<paths>({ baseUrl, headers, ...(options.fetch ? { fetch: options.fetch } : {}) });

  const client = {
    /** the underlying openapi-fetch client, typed by path */
    api,
    baseUrl,

    async health() {
      return expectData(await api.GET('/healthz'));
    },

    /** Uploads a JSON signal body (`data` or `epochs`, `samplingRate`, `channels`, …). */
    async uploadSignal(body: unknown): Promise<SignalInfo> {
      return expectData(await api.POST('/v1/signals', { body: body as never }));
    },

    /** Uploads float32 (little-endian, [epoch][channel][sample]) or EDF/EDF+ bytes. */
    async uploadSignalBytes(bytes: Uint8Array, query: { format: 'float32' | 'edf'; samplingRate?: number; channels?: string; epochCount?: number }): Promise<SignalInfo> {
      return expectData(
        await api.POST('/v1/signals', {
          params: { query: query as never },
          body: bytes as never,
          bodySerializer: (b: unknown) => b as never,
          headers: { 'content-type': 'application/octet-stream' },
        }),
      );
    },

    async pinRecipe(recipe: unknown) {
      return expectData(await api.POST('/v1/recipes', { body: recipe as never }));
    },

    /** Submits a job; `status` is 202 when queued, 200 when an identical job already succeeded. */
    async submitJob(request: { signal: unknown; recipe: unknown }): Promise<Job & { status: number }> {
      const result = await api.POST('/v1/jobs', { body: request as JobRequest });
      return { ...expectData(result), status: result.response.status };
    },

    async getJob(id: string): Promise<Job> {
      return expectData(await api.GET('/v1/jobs/{id}', { params: { path: { id } } }));
    },

    /**
     * Polls a job until it has finished, reporting progress (0..1). Aborting `signal` stops the
     * polling (the job itself goes on on the server).
     */
    async waitForJob(id: string, wait: { onProgress?: (fraction: number, job: Job) => void; signal?: AbortSignal; intervalMs?: number } = {}): Promise<Job> {
      let interval = wait.intervalMs ?? 100;
      for (;;) {
        wait.signal?.throwIfAborted();
        const job = await client.getJob(id);
        wait.onProgress?.(job.progress, job);
        if (FINISHED.has(job.state)) return job;
        await new Promise<void>((resolve, reject) => {
          const timer = setTimeout(resolve, interval);
          wait.signal?.addEventListener('abort', () => (clearTimeout(timer), reject(wait.signal!.reason)), { once: true });
        });
        interval = Math.min(1000, interval * 1.5);
      }
    },

    /** The record exactly as the server stores it (its `result` is the canonical JSON behind resultHash). */
    async getRecordText(id: string): Promise<string> {
      return expectData(await api.GET('/v1/jobs/{id}/record', { params: { path: { id } }, parseAs: 'text' }));
    },

    async getAttachment(id: string, name: string): Promise<Uint8Array> {
      return new Uint8Array(expectData(await api.GET('/v1/jobs/{id}/attachments/{name}', { params: { path: { id, name } }, parseAs: 'arrayBuffer' })));
    },

    async createStudy(study: { name: string; description?: string }): Promise<Study> {
      return expectData(await api.POST('/v1/studies', { body: study as never }));
    },

    /** Adds entries all or nothing, as JSON `{entries: [...]}` or a CSV manifest (text). */
    async addStudyEntries(studyId: string, entries: unknown[] | string) {
      if (typeof entries === 'string') {
        return expectData(
          await api.POST('/v1/studies/{id}/entries', {
            params: { path: { id: studyId } },
            body: entries as never,
            bodySerializer: (b: unknown) => b as never,
            headers: { 'content-type': 'text/csv' },
          }),
        );
      }
      return expectData(await api.POST('/v1/studies/{id}/entries', { params: { path: { id: studyId } }, body: { entries } as never }));
    },

    async startStudyRun(studyId: string, request: { recipe: unknown; filter?: Record<string, unknown> } | { retryOf: string }): Promise<StudyRun> {
      return expectData(await api.POST('/v1/studies/{id}/runs', { params: { path: { id: studyId } }, body: request as never }));
    },

    async getStudyRun(studyId: string, runId: string): Promise<StudyRun> {
      return expectData(await api.GET('/v1/studies/{id}/runs/{runId}', { params: { path: { id: studyId, runId } } }));
    },

    /** A run's table (every succeeded entry's rows, led by the entry and its metadata). */
    async getStudyRunTable(studyId: string, runId: string, query: { level?: string; format?: string }): Promise<Uint8Array> {
      const result = await api.GET('/v1/studies/{id}/runs/{runId}/table', { params: { path: { id: studyId, runId }, query: query as never }, parseAs: 'arrayBuffer' });
      return new Uint8Array(expectData(result));
    },

    /** A job's record as a table (CSV or Parquet bytes). */
    async getJobTable(id: string, query: { level?: string; format?: string }): Promise<Uint8Array> {
      const result = await api.GET('/v1/jobs/{id}/table', { params: { path: { id }, query: query as never }, parseAs: 'arrayBuffer' });
      return new Uint8Array(expectData(result));
    },

    /**
     * A file the server renders from a job's record (a table or a plot), with its content type.
     * @param path - e.g. `/v1/jobs/{id}/plots/{kind}`
     */
    async getJobFile(path: string, params: { id: string; kind?: string }, query: Record<string, string | number | undefined>): Promise<{ bytes: Uint8Array; contentType: string }> {
      // Typed loosely until the plot routes are in the OpenAPI document this client is generated from.
      const loose = api as unknown as { GET: (path: string, init: object) => Promise<{ data?: ArrayBuffer; error?: unknown; response: Response }> };
      const result = await loose.GET(path, { params: { path: params, query }, parseAs: 'arrayBuffer' });
      return { bytes: new Uint8Array(expectData(result)), contentType: result.response.headers.get('content-type') ?? 'application/octet-stream' };
    },
  };
  return client;
}

export type RhythmetricClient = ReturnType<typeof createRhythmetricClient>;
