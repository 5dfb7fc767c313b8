import { mkdir, mkdtemp, realpath, rename, rm, symlink, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkRelativePath, createDataRoot, openUnderRoot, resolveUnderRoot, SourceError } from '../../src/signals/data-root.js';

// The cases follow the OWASP "Path Traversal" attack catalogue (from memory: "../" and "..\"
// sequences, absolute paths, percent-encoded "%2e%2e%2f", NUL bytes, UNC shares) and the POSIX
// realpath() definition (IEEE Std 1003.1: "an absolute pathname that resolves to the same
// directory entry, whose resolution does not involve '.', '..', or symbolic links").

let base: string;
let root: string;
let outside: string;

beforeAll(async () => {
  base = await realpath(await mkdtemp(join(tmpdir(), 'rhythmetric-root-')));
  root = join(base, 'root');
  outside = join(base, 'outside');
  await mkdir(join(root, 'a', 'deep'), { recursive: true });
  await mkdir(outside);
  await writeFile(join(root, 'top.edf'), 'top');
  await writeFile(join(root, 'a', 'b.edf'), 'b');
  await writeFile(join(root, 'a', 'deep', 'c.edf'), 'c');
  await writeFile(join(root, 'a', '...'), 'three dots are a plain name');
  await writeFile(join(outside, 'secret.edf'), 'secret');
  await symlink('/etc/hostname', join(root, 'hostname-link'));
  await symlink(join(root, 'a', 'b.edf'), join(root, 'inside-link.edf'));
  await symlink('deep/c.edf', join(root, 'a', 'relative-link.edf'));
  await symlink(outside, join(root, 'outside-dir'));
  await symlink('../../outside/secret.edf', join(root, 'a', 'dotdot-link.edf'));
  await symlink(join(root, 'missing.edf'), join(root, 'dangling.edf'));
  await symlink('loop2', join(root, 'loop1'));
  await symlink('loop1', join(root, 'loop2'));
  await symlink('.', join(root, 'self'));
});

afterAll(async () => {
  await rm(base, { recursive: true, force: true });
});

async function failure(requested: string): Promise<SourceError> {
  const error = await resolveUnderRoot(root, requested).then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(SourceError);
  return error as SourceError;
}

describe('when the path stays inside the root', () => {
  it.each([
    ['top.edf', ['top.edf']],
    ['a/b.edf', ['a', 'b.edf']],
    ['./a/./b.edf', ['a', 'b.edf']],
    ['a//b.edf', ['a', 'b.edf']],
    ['a/deep/c.edf', ['a', 'deep', 'c.edf']],
    ['a/...', ['a', '...']],
  ])('should resolve %j by its segments', async (requested, segments) => {
    await expect(resolveUnderRoot(root, requested)).resolves.toBe(join(root, ...segments));
  });

  it('should follow a symlink to another file inside the root and return the target', async () => {
    await expect(resolveUnderRoot(root, 'inside-link.edf')).resolves.toBe(join(root, 'a', 'b.edf'));
    await expect(resolveUnderRoot(root, 'a/relative-link.edf')).resolves.toBe(join(root, 'a', 'deep', 'c.edf'));
  });

  it('should accept a root given through a symlink and compare real paths', async () => {
    const linkedRoot = join(base, 'root-link');
    await symlink(root, linkedRoot);
    await expect(resolveUnderRoot(linkedRoot, 'a/b.edf')).resolves.toBe(join(root, 'a', 'b.edf'));
  });
});

describe('when the path text is refused before the disk is touched', () => {
  it.each([
    ['', 'empty'],
    ['.', 'names no file'],
    ['./', 'names no file'],
    ['/etc/passwd', 'absolute'],
    ['//server/share/x.edf', 'absolute'],
    ['C:\\x.edf', 'backslash'],
    ['C:/x.edf', 'drive letter'],
    ['c:x.edf', 'drive letter'],
    ['\\\\server\\share\\x.edf', 'backslash'],
    ['a\\..\\..\\etc\\passwd', 'backslash'],
    ['..', '".." segment'],
    ['../outside/secret.edf', '".." segment'],
    ['a/../../etc/passwd', '".." segment'],
    ['a/../top.edf', '".." segment'],
    ['a/b.edf/..', '".." segment'],
    ['a/b.edf\0.png', 'NUL'],
    ['a/b\n.edf', 'control character'],
    ['%2e%2e/outside/secret.edf', 'percent-encoded'],
    ['%2E%2E%2Foutside', 'percent-encoded'],
    ['a%2Fb.edf', 'percent-encoded'],
    ['a%2fb.edf', 'percent-encoded'],
    ['a%5Cb.edf', 'percent-encoded'],
    ['a%00.edf', 'percent-encoded'],
    ['a%252Fb.edf', 'percent-encoded'],
  ])('should refuse %j (%s)', async (requested, why) => {
    const error = await failure(requested);
    expect(error.reason).toBe('forbidden-path');
    expect(error.pointer).toBe('/file');
    expect(error.message).toContain(why);
  });

  it('should refuse a path that is not a string', () => {
    expect(() => checkRelativePath(42)).toThrow(SourceError);
    expect(() => checkRelativePath(undefined)).toThrow(/must be a string/);
  });

  it('should keep a literal percent sign that escapes nothing special', () => {
    expect(checkRelativePath('100%/a%20b.edf')).toEqual(['100%', 'a%20b.edf']);
  });
});

describe('when a symbolic link leads out of the root', () => {
  it.each([
    ['hostname-link', 'a file link to /etc/hostname'],
    ['outside-dir/secret.edf', 'a directory link pointing outside'],
    ['a/dotdot-link.edf', 'a relative link climbing out'],
  ])('should refuse %j (%s)', async (requested) => {
    const error = await failure(requested);
    expect(error.reason).toBe('forbidden-path');
    expect(error.message).toContain('outside the data root');
  });

  it('should refuse a loop of links', async () => {
    const error = await failure('loop1');
    expect(error.reason).toBe('forbidden-path');
    expect(error.message).toContain('loop');
  });
});

describe('when the file system refuses the name', () => {
  it('should refuse a name longer than the file system allows (NAME_MAX is 255 bytes on Linux, from memory)', async () => {
    const error = await failure(`a/${'x'.repeat(300)}.edf`);
    expect(error.reason).toBe('forbidden-path');
    expect(error.message).toContain('too long');
  });
});

describe('when nothing usable is at the path', () => {
  it.each([['missing.edf'], ['a/missing.edf'], ['nowhere/b.edf'], ['top.edf/inner'], ['dangling.edf']])('should answer not-found for %j', async (requested) => {
    const error = await failure(requested);
    expect(error.reason).toBe('not-found');
    expect(error.pointer).toBe('/file');
  });

  it.each([['a'], ['a/deep/'], ['self'], ['self/a']])('should answer not-a-file for the directory %j', async (requested) => {
    const error = await failure(requested);
    expect(error.reason).toBe('not-a-file');
  });

  it('should answer not-a-file for a special file (a FIFO is not readable as a recording)', async () => {
    const { execFileSync } = await import('node:child_process');
    execFileSync('mkfifo', [join(root, 'pipe')]);
    const error = await failure('pipe');
    expect(error.reason).toBe('not-a-file');
    expect(error.message).toContain('not a regular file');
  });
});

describe('when the root is misconfigured', () => {
  it('should throw a plain error (a server fault, not a client one) for a missing root', async () => {
    const error = await resolveUnderRoot(join(base, 'no-such-root'), 'a/b.edf').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(Error);
    expect(error).not.toBeInstanceOf(SourceError);
    expect((error as Error).message).toContain('cannot be resolved');
  });

  it('should throw for a root that is a file', async () => {
    await expect(createDataRoot(join(root, 'top.edf'))).rejects.toThrow(/not a directory/);
  });
});

describe('when a data root is created once', () => {
  it('should keep the root it resolved at creation even if the configured link moves', async () => {
    const link = join(base, 'moving-root');
    await symlink(root, link);
    const dataRoot = await createDataRoot(link);
    await rm(link);
    await symlink(outside, link);
    expect(dataRoot.realRoot).toBe(root);
    await expect(dataRoot.resolve('a/b.edf')).resolves.toBe(join(root, 'a', 'b.edf'));
  });
});

describe('when a file is opened under the root', () => {
  it('should open the resolved file read-only and report its size', async () => {
    const opened = await openUnderRoot(root, 'inside-link.edf');
    try {
      expect(opened.realPath).toBe(join(root, 'a', 'b.edf'));
      expect(opened.size).toBe(1);
      expect(await opened.handle.readFile('utf8')).toBe('b');
    } finally {
      await opened.handle.close();
    }
  });

  it('should refuse to open what it would refuse to resolve', async () => {
    await expect(openUnderRoot(root, 'hostname-link')).rejects.toMatchObject({ reason: 'forbidden-path' });
  });

  it('should answer not-found when the file disappears by a rename', async () => {
    await writeFile(join(root, 'soon-gone.edf'), 'x');
    const dataRoot = await createDataRoot(root);
    const first = await dataRoot.open('soon-gone.edf');
    await first.handle.close();
    expect(first.size).toBe(1);
    await rename(join(root, 'soon-gone.edf'), join(root, 'gone.edf'));
    await expect(dataRoot.open('soon-gone.edf')).rejects.toMatchObject({ reason: 'not-found' });
  });
});
