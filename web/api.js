// The page's only way to the service: the public HTTP API of its own origin, with the API key the
// user typed (kept in sessionStorage, so it leaves with the tab) or none in open mode.

const KEY_NAME = 'rhythmetric.apiKey';

/**
 * RFC 9457 problem details as the service sends them.
 * @typedef {{ type: string, title: string, status: number, detail: string, pointer?: string, requestId?: string }} Problem
 */

/**
 * A job as GET /v1/jobs/{id} answers.
 * @typedef {{ id: string, state: 'queued' | 'running' | 'succeeded' | 'failed' | 'canceled', progress: number, signal: string, recipe: string,
 *   method: string, labels: Record<string, string>, resultHash: string | null, attempts: number, createdAt: string, startedAt: string | null,
 *   finishedAt: string | null, problem: Problem | null }} Job
 */

export class ProblemError extends Error {
  /** @param {Problem} problem */
  constructor(problem) {
    super(problem.detail);
    this.problem = problem;
  }
}

/** @returns {string | null} */
export function apiKey() {
  return sessionStorage.getItem(KEY_NAME);
}

/** @param {string | null} key */
export function setApiKey(key) {
  if (key) sessionStorage.setItem(KEY_NAME, key);
  else sessionStorage.removeItem(KEY_NAME);
}

/**
 * @param {HeadersInit | undefined} given
 * @returns {Headers}
 */
function withAuth(given) {
  const headers = new Headers(given);
  const key = apiKey();
  if (key) headers.set('authorization', `Bearer ${key}`);
  return headers;
}

/**
 * Fetches from the API; a response that is not 2xx/304 becomes a {@link ProblemError}.
 * @param {string} path
 * @param {RequestInit} [init]
 * @returns {Promise<Response>}
 */
export async function request(path, init = {}) {
  let response;
  try {
    response = await fetch(path, { ...init, headers: withAuth(init.headers) });
  } catch (error) {
    throw new ProblemError({ type: 'about:blank', title: 'The service cannot be reached', status: 0, detail: `the request to ${path} failed: ${String(error)}` });
  }
  if (response.ok || response.status === 304) return response;
  const type = response.headers.get('content-type') ?? '';
  if (type.includes('json')) {
    const body = /** @type {Partial<Problem>} */ (await response.json().catch(() => ({})));
    throw new ProblemError({
      type: body.type ?? 'about:blank',
      title: body.title ?? response.statusText,
      status: response.status,
      detail: body.detail ?? response.statusText,
      ...(body.pointer ? { pointer: body.pointer } : {}),
      ...(body.requestId ? { requestId: body.requestId } : {}),
    });
  }
  throw new ProblemError({ type: 'about:blank', title: response.statusText, status: response.status, detail: `${path} answered ${response.status} ${response.statusText}` });
}

/**
 * @template T
 * @param {string} path
 * @param {RequestInit} [init]
 * @returns {Promise<T>}
 */
export async function requestJson(path, init) {
  return /** @type {Promise<T>} */ ((await request(path, init)).json());
}

/**
 * Server-sent events read through fetch, so that the API key travels in a header (EventSource
 * cannot send one). Yields each event until the stream ends or `signal` aborts.
 * @param {string} path
 * @param {AbortSignal} signal
 * @returns {AsyncGenerator<{ event: string, data: unknown }>}
 */
export async function* serverEvents(path, signal) {
  const response = await request(path, { signal, headers: { accept: 'text/event-stream' } });
  if (!response.body) return;
  const reader = response.body.pipeThrough(new TextDecoderStream()).getReader();
  let buffer = '';
  try {
    for (;;) {
      const { value, done } = await reader.read();
      if (done) return;
      buffer += value;
      let end;
      while ((end = buffer.indexOf('\n\n')) >= 0) {
        const block = buffer.slice(0, end);
        buffer = buffer.slice(end + 2);
        let event = 'message';
        const data = [];
        for (const line of block.split('\n')) {
          if (line.startsWith('event:')) event = line.slice(6).trim();
          else if (line.startsWith('data:')) data.push(line.slice(5).trimStart());
        }
        if (data.length > 0) yield { event, data: JSON.parse(data.join('\n')) };
      }
    }
  } finally {
    reader.releaseLock();
  }
}

/**
 * Downloads an API resource under the user's key and hands it to the browser as a file.
 * @param {string} path
 * @param {string} fallbackName
 */
export async function download(path, fallbackName) {
  const response = await request(path);
  const disposition = response.headers.get('content-disposition') ?? '';
  const name = /filename="?([^";]+)"?/.exec(disposition)?.[1] ?? fallbackName;
  const url = URL.createObjectURL(await response.blob());
  const link = document.createElement('a');
  link.href = url;
  link.download = name;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}
