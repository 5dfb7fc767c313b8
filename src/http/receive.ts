import { createWriteStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { Transform } from 'node:stream';
import { createHash, randomBytes } from 'node:crypto';
import { DomainError } from '../common/errors.js';
import { ProblemError } from './problem.js';

/** Binary routes pass the request stream through as the body (see their content-type parser). */
export function isStream(body: unknown): body is Readable {
  return typeof body === 'object' && body !== null && typeof (body as Readable).pipe === 'function';
}

export interface ReceivedFile {
  path: string;
  bytes: number;
  /** SHA-256 of the raw bytes as received, when asked for (`hash`) */
  sha256: string | null;
  remove(): Promise<void>;
}

/**
 * Streams a request body to a file, counting and hashing as it goes. A declared Content-Length
 * over the limit is refused before reading; a body that grows past it is cut off. Either way the
 * answer is 413 (with `tooLargeHint`, say where such bodies can go) and the partial file is removed.
 * The raw bytes are hashed only when `hash` asks for it (upload parts report their hash): a signal
 * upload's content hash is taken over its decoded samples, and hashing a 472 MB body a second time
 * cost the upload about a second of CPU on the benchmark machine.
 */
export async function receiveToFile(body: Readable, dir: string, limit: number, declared: string | undefined, tooLargeHint: string, hash: true): Promise<ReceivedFile & { sha256: string }>;
export async function receiveToFile(body: Readable, dir: string, limit: number, declared?: string | undefined, tooLargeHint?: string): Promise<ReceivedFile>;
export async function receiveToFile(body: Readable, dir: string, limit: number, declared?: string | undefined, tooLargeHint = '', hash = false): Promise<ReceivedFile> {
  const hint = tooLargeHint ? `; ${tooLargeHint}` : '';
  if (declared !== undefined && Number(declared) > limit) {
    body.resume();
    throw new ProblemError('payload-too-large', `the body of ${declared} bytes exceeds this server's limit of ${limit} bytes${hint}`);
  }
  const path = join(dir, `${randomBytes(8).toString('hex')}.upload`);
  const digest = hash ? createHash('sha256') : null;
  let bytes = 0;
  const meter = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      bytes += chunk.length;
      if (bytes > limit) {
        done(new ProblemError('payload-too-large', `the body exceeds this server's limit of ${limit} bytes${hint}`));
        return;
      }
      digest?.update(chunk);
      done(null, chunk);
    },
  });
  try {
    await pipeline(body, meter, createWriteStream(path));
  } catch (error) {
    await rm(path, { force: true });
    // A domain error says whose fault it is: the body over the limit (413), or a remote source
    // that stalled or broke off (502); only a client's own broken body is the client's 400.
    if (error instanceof DomainError) {
      body.resume();
      throw error;
    }
    throw new ProblemError('invalid-request', `the body could not be received: ${error instanceof Error ? error.message : String(error)}`);
  }
  return { path, bytes, sha256: digest ? digest.digest('hex') : null, remove: () => rm(path, { force: true }) };
}
