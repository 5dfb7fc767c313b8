import { DomainError, type ProblemCode } from '../common/errors.js';
import type { Stats } from 'node:fs';
import { constants, type FileHandle, open, realpath, stat } from 'node:fs/promises';
import { isAbsolute, join, relative, sep } from 'node:path';

export type SourceErrorCode = 'forbidden-path' | 'not-found' | 'not-a-file' | 'forbidden-host' | 'too-large' | 'timeout' | 'fetch-failed';

/** A body over the limit is 413 and a far side that fails or stalls is 502, never the client's 4xx. */
const SOURCE_PROBLEM: Record<SourceErrorCode, ProblemCode> = {
  'forbidden-path': 'source-refused',
  'not-found': 'source-not-found',
  'not-a-file': 'source-refused',
  'forbidden-host': 'source-refused',
  'too-large': 'payload-too-large',
  timeout: 'source-failed',
  'fetch-failed': 'source-failed',
};

/**
 * A recording source the service refuses or cannot reach: a path outside the data root, a URL
 * whose host is not allowed, a body too large or too slow. `pointer` is the RFC 6901 pointer of
 * the offending request field (`/file` or `/url`); `status` is the upstream HTTP status when a
 * remote server answered with an error. The HTTP layer maps `code` to a problem+json answer.
 */
export class SourceError extends DomainError {
  override readonly name = 'SourceError';
  constructor(
    readonly reason: SourceErrorCode,
    message: string,
    pointer: string,
    readonly upstreamStatus: number | null = null,
  ) {
    super(SOURCE_PROBLEM[reason], message, { pointer });
  }
}

const POINTER = '/file';

// Percent-escapes of '.', '/', '\' and NUL, also double-escaped (%252F): we never decode, so a
// name that carries one is refused instead of guessed at, whatever a layer in front decoded.
const ENCODED_SPECIAL = /%(?:25)*(?:2e|2f|5c|00)/i;
// C0 controls and DEL: never in a lab's file names, and they would forge log lines.
const CONTROL = /[\u0001-\u001f\u007f]/;
const DRIVE = /^[A-Za-z]:/;

function refuse(why: string): SourceError {
  return new SourceError('forbidden-path', why, POINTER);
}

/**
 * Checks the text of a client path without touching the disk and returns its segments
 * (`.` and empty segments dropped). Throws SourceError('forbidden-path') naming the reason.
 */
export function checkRelativePath(requested: unknown): string[] {
  if (typeof requested !== 'string') throw refuse('the path must be a string');
  if (requested.length === 0) throw refuse('the path is empty');
  if (requested.includes('\0')) throw refuse('the path contains a NUL byte');
  if (CONTROL.test(requested)) throw refuse('the path contains a control character');
  if (requested.includes('\\')) throw refuse('the path contains a backslash; use "/" between segments');
  if (DRIVE.test(requested)) throw refuse('the path starts with a drive letter; send a path relative to the data root');
  if (requested.startsWith('/')) throw refuse('the path is absolute; send a path relative to the data root');
  if (ENCODED_SPECIAL.test(requested)) {
    throw refuse('the path contains a percent-encoded dot, slash, backslash or NUL; paths are taken literally and never URL-decoded');
  }
  const segments = requested.split('/');
  if (segments.includes('..')) throw refuse('the path contains a ".." segment');
  const kept = segments.filter((s) => s !== '' && s !== '.');
  if (kept.length === 0) throw refuse('the path names no file');
  return kept;
}

function errnoCode(error: unknown): string | undefined {
  return typeof error === 'object' && error !== null && 'code' in error ? String((error as { code: unknown }).code) : undefined;
}

function isInside(realRoot: string, real: string): boolean {
  const rel = relative(realRoot, real);
  return rel !== '' && rel !== '..' && !rel.startsWith(`..${sep}`) && !isAbsolute(rel);
}

/**
 * A data directory whose real path was resolved once, when it was opened. Operators point the
 * service at it; clients name files by paths relative to it.
 */
export interface DataRoot {
  /** The real path of the root (symlinks resolved). */
  readonly realRoot: string;
  /** See {@link resolveUnderRoot}. */
  resolve(requested: string): Promise<string>;
  /** See {@link openUnderRoot}. */
  open(requested: string): Promise<OpenedFile>;
}

export interface OpenedFile {
  handle: FileHandle;
  realPath: string;
  size: number;
}

/**
 * Resolves the real path of `root` once and returns a resolver bound to it.
 *
 * @param root - The data directory, as the operator configured it (absolute or relative to the
 *   working directory).
 * @throws Error when the root does not exist or is not a directory. That is a configuration fault
 *   of the server, not of a client, so it is not a SourceError.
 */
export async function createDataRoot(root: string): Promise<DataRoot> {
  let realRoot: string;
  try {
    realRoot = await realpath(root);
  } catch (error) {
    throw new Error(`the data root ${JSON.stringify(root)} cannot be resolved (${errnoCode(error) ?? 'error'})`, { cause: error });
  }
  if (!(await stat(realRoot)).isDirectory()) throw new Error(`the data root ${JSON.stringify(root)} is not a directory`);
  return {
    realRoot,
    resolve: async (requested: string) => (await resolveInside(realRoot, requested)).real,
    open: (requested: string) => openInside(realRoot, requested),
  };
}

async function resolveInside(realRoot: string, requested: string): Promise<{ real: string; info: Stats }> {
  const segments = checkRelativePath(requested);
  let real: string;
  try {
    real = await realpath(join(realRoot, ...segments));
  } catch (error) {
    const code = errnoCode(error);
    if (code === 'ENOENT' || code === 'ENOTDIR') {
      throw new SourceError('not-found', `no file ${JSON.stringify(requested)} under the data root`, POINTER);
    }
    if (code === 'ELOOP') throw refuse('the path runs through a loop of symbolic links');
    if (code === 'ENAMETOOLONG') throw refuse('the path or one of its names is too long for the file system');
    if (code === 'EACCES' || code === 'EPERM') throw refuse('the server may not read this path');
    throw error;
  }
  // Symlinks are followed by realpath, so this catches links (anywhere on the path) leading out.
  if (!isInside(realRoot, real)) {
    if (real === realRoot) throw new SourceError('not-a-file', 'the path names the data root itself, not a file', POINTER);
    throw refuse('the path leads outside the data root (through a symbolic link)');
  }
  const info = await stat(real);
  if (!info.isFile()) {
    throw new SourceError('not-a-file', `${JSON.stringify(requested)} is ${info.isDirectory() ? 'a directory' : 'not a regular file'}`, POINTER);
  }
  return { real, info };
}

async function openInside(realRoot: string, requested: string): Promise<OpenedFile> {
  const { real: realPath, info: checked } = await resolveInside(realRoot, requested);
  // O_NOFOLLOW refuses a final component swapped for a symlink after the check; the inode
  // comparison catches a file swapped for another one (a rename race) in between.
  const handle = await open(realPath, constants.O_RDONLY | constants.O_NOFOLLOW).catch((error: unknown) => {
    const code = errnoCode(error);
    if (code === 'ELOOP') throw refuse('the file was replaced by a symbolic link while it was opened');
    if (code === 'ENOENT') throw new SourceError('not-found', `no file ${JSON.stringify(requested)} under the data root`, POINTER);
    throw error;
  });
  try {
    const opened = await handle.stat();
    if (!opened.isFile() || opened.ino !== checked.ino || opened.dev !== checked.dev) {
      throw refuse('the file changed while it was opened');
    }
    return { handle, realPath, size: opened.size };
  } catch (error) {
    await handle.close();
    throw error;
  }
}

/**
 * Resolves a client's path, relative to the data root, to the absolute real path of a regular
 * file inside the root.
 *
 * The path is taken literally: it must be relative, use "/" between segments, hold no ".."
 * segment, no backslash, NUL, control character or percent-escape of ".", "/", "\" or NUL.
 * "." segments and repeated slashes are harmless and ignored. The candidate's real path
 * (fs.realpath, so every symbolic link on the way is resolved) must lie inside the real path of
 * the root: a link to another file inside the root is fine, one leading out is refused.
 *
 * Time of check and time of use: the returned path holds no symbolic link at the moment it was
 * resolved, and callers open that path, not the client's text. Someone able to write inside the
 * root could still swap a directory for a link between the check and the open; where that
 * matters, use {@link openUnderRoot}, which opens with O_NOFOLLOW and compares the inode.
 *
 * @param root - The data directory (realpath'ed on each call; use {@link createDataRoot} to
 *   resolve it once for the lifetime of a server).
 * @param requested - The path as the client sent it, relative to the root.
 * @returns The absolute real path of the file.
 * @throws SourceError with code 'forbidden-path' (pointer '/file') for a refused path,
 *   'not-found' when nothing is there, 'not-a-file' for a directory or special file.
 * @throws Error when the root itself does not exist or is not a directory.
 * @see OWASP "Path Traversal" (common practice: canonicalise, then check the prefix).
 */
export async function resolveUnderRoot(root: string, requested: string): Promise<string> {
  return (await createDataRoot(root)).resolve(requested);
}

/**
 * Like {@link resolveUnderRoot}, then opens the file read-only with O_NOFOLLOW and checks that
 * the opened file is the one that was resolved (same device and inode).
 *
 * @returns The open handle (the caller closes it), the real path and the size in bytes.
 * @throws SourceError as {@link resolveUnderRoot}; 'forbidden-path' when the file changed between
 *   the check and the open.
 */
export async function openUnderRoot(root: string, requested: string): Promise<OpenedFile> {
  return (await createDataRoot(root)).open(requested);
}
