import { randomBytes } from 'node:crypto';
import { rename, rm, writeFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import cliProgress from 'cli-progress';

/** Exit codes: 0 done (or match), 1 a difference or a failed job, 2 usage or input errors, 130 interrupted. */
export const EXIT = { ok: 0, differ: 1, usage: 2, interrupted: 130 } as const;

/** A usage or input error: the command prints the message and exits with 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

/**
 * Writes a file whole or not at all: to a temporary name beside it, then renamed over the target,
 * so an interruption (Ctrl-C, a crash) never leaves half a record or table under the real name.
 */
export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
  const temp = join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(4).toString('hex')}.part`);
  try {
    await writeFile(temp, data);
    await rename(temp, path);
  } catch (error) {
    await rm(temp, { force: true });
    throw error;
  }
}

export interface Terminal {
  /** colour and progress bars: only on a terminal, never with NO_COLOR or --json */
  readonly fancy: boolean;
  readonly json: boolean;
  /** a line for people on standard error (plain when piped, a JSON object with --json) */
  note(message: string, fields?: Record<string, unknown>): void;
  warn(message: string, fields?: Record<string, unknown>): void;
  /** progress of named work items; a bar on a terminal, a line per item otherwise */
  progress(total: number, label: string): Progress;
  colour(kind: 'good' | 'bad' | 'dim', text: string): string;
}

export interface Progress {
  update(done: number, detail?: string): void;
  stop(): void;
}

const COLOURS = { good: '\u001b[32m', bad: '\u001b[31m', dim: '\u001b[2m' } as const;

export function createTerminal(options: { json?: boolean; stream?: NodeJS.WriteStream; env?: NodeJS.ProcessEnv } = {}): Terminal {
  const stream = options.stream ?? process.stderr;
  const env = options.env ?? process.env;
  const json = options.json ?? false;
  const fancy = !json && stream.isTTY === true && !('NO_COLOR' in env && env.NO_COLOR !== '');
  const line = (level: 'info' | 'warn', message: string, fields: Record<string, unknown> = {}) => {
    stream.write(json ? `${JSON.stringify({ level, message, ...fields })}\n` : `${message}\n`);
  };
  return {
    fancy,
    json,
    note: (message, fields) => line('info', message, fields),
    warn: (message, fields) => line('warn', fancy ? `${COLOURS.bad}${message}\u001b[0m` : message, fields),
    colour: (kind, text) => (fancy ? `${COLOURS[kind]}${text}\u001b[0m` : text),
    progress(total, label) {
      if (fancy) {
        const bar = new cliProgress.SingleBar(
          { stream, format: `${label} [{bar}] {percentage}% | {value}/{total} | {detail}`, hideCursor: true, clearOnComplete: false, fps: 10 },
          cliProgress.Presets.shades_classic,
        );
        bar.start(total, 0, { detail: '' });
        return { update: (done, detail = '') => bar.update(done, { detail }), stop: () => bar.stop() };
      }
      let last = 0;
      return {
        update(done, detail) {
          // One line per finished item when piped, never a line per progress tick.
          if (Math.floor(done) === last) return;
          last = Math.floor(done);
          line('info', `${label}: ${last}/${total}${detail ? ` ${detail}` : ''}`, { label, done: last, total, ...(detail ? { detail } : {}) });
        },
        stop() {},
      };
    },
  };
}
