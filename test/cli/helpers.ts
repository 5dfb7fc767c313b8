import { spawn } from 'node:child_process';
import type { AddressInfo } from 'node:net';
import { resolve } from 'node:path';
import { startTestApi } from '../helpers/app.js';

export const ROOT = resolve(import.meta.dirname, '..', '..');
const MAIN = resolve(ROOT, 'src', 'cli', 'main.ts');

export interface CliRun {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

/**
 * Runs `rhythmetric …` as a child process, as a user would (standard output and error piped, so
 * neither is a terminal). `onStderr` sees standard error as it arrives and may act on the child.
 */
export function runCli(args: string[], options: { cwd?: string; env?: Record<string, string>; onStderr?: (text: string, child: ReturnType<typeof spawn>) => void } = {}): Promise<CliRun> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, ['--import', import.meta.resolve('tsx'), MAIN, ...args], {
      cwd: options.cwd ?? ROOT,
      env: { ...process.env, NO_COLOR: '', ...options.env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => {
      stderr += chunk.toString();
      options.onStderr?.(stderr, child);
    });
    child.on('error', fail);
    child.on('close', (code, signal) => done({ code, signal, stdout, stderr }));
  });
}

/** An embedded-mode API listening on a free loopback port, for clients in other processes. */
export async function startListeningApi() {
  const api = await startTestApi();
  await api.app.listen({ port: 0, host: '127.0.0.1' });
  return { api, url: `http://127.0.0.1:${(api.app.server.address() as AddressInfo).port}` };
}
