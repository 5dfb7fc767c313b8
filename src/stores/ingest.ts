import { createHash, randomBytes } from 'node:crypto';
import { open, rm, type FileHandle } from 'node:fs/promises';
import { join } from 'node:path';
import { sampleBytes, signalIdFromHash, signalSha256FromParts } from '../signals/content-hash.js';
import { EdfFormatError, calibrate, copyDigital, decodeEdfRecords, readEdfHeader, type EdfGap, type EdfHeader } from '../signals/edf/index.js';
import { discontinuityError, formatError, planEdfSignal } from '../signals/edf-to-signal.js';
import { SignalInputError } from '../signals/errors.js';
import type { SignalLimits } from '../signals/limits.js';
import type { SignalEvent } from '../signals/signal.js';
import { AmplitudeSurvey, resolveUploadUnit } from '../signals/units.js';
import { FLOAT64, bytesPerSample, decodeSamples, encodedBytes, encodingFields, survivesJson, type SampleEncoding } from '../signals/sample-encoding.js';
import { checkSignalShape } from '../signals/validate.js';
import { withStorageReservation, type SignalMeta, type Store } from './store.js';

export type IngestDescription =
  | {
      format: 'float32';
      samplingRate: number;
      channels: string[];
      epochCount: number;
      unit?: string | undefined;
      voltage?: boolean | undefined;
      nonFinite?: 'reject' | 'keep' | undefined;
      events?: SignalEvent[] | undefined;
    }
  | { format: 'edf'; channels?: string[] | undefined; samplingRate?: number | undefined };

export interface IngestOptions {
  tenant: string;
  limits: SignalLimits;
  /** 0 = no limit */
  maxStoreBytes: number;
}

/** Bytes read or written per step: memory stays bounded by a few of these, whatever the file size. */
const CHUNK = 8 * 1024 * 1024;
/** Stored bytes converted and hashed per step of the second pass over an EDF's codes (a multiple of 8). */
const HASH_BLOCK_BYTES = 512 * 1024;

/**
 * Turns a raw upload already on disk (float32 or EDF/EDF+) into a stored signal without holding the
 * recording in memory: samples are written chunk by chunk, at their source precision (float32 as
 * uploaded; EDF as its 16-bit codes), into a file under the store's temp directory, hashed as the
 * float64 values a reader gets back, then moved into place. Nothing is stored when any check fails.
 */
export async function ingestFile(store: Store, raw: string | RawFile, description: IngestDescription, options: IngestOptions): Promise<SignalMeta> {
  const out = join(await store.tempDir(), `${randomBytes(8).toString('hex')}.samples.part`);
  // A caller that checked what it opened (a data-root file) passes that handle, so the bytes read
  // are those of the file it checked, not of whatever the path names by now.
  const input = typeof raw === 'string' ? await open(raw, 'r') : raw.handle;
  try {
    const size = typeof raw === 'string' ? (await input.stat()).size : raw.size;
    const decoded = description.format === 'float32' ? await decodeFloat32File(input, size, out, description, options.limits) : await decodeEdfFile(input, size, out, description, options.limits);
    const sha256 = signalSha256FromParts(decoded.description, decoded.samplesSha256);
    const id = signalIdFromHash(sha256, options.tenant);
    const existing = await store.getSignalMeta(id);
    if (existing) return existing;
    const { epochCount, channels, samplesPerEpoch } = decoded.description;
    const bytes = epochCount * channels.length * samplesPerEpoch * bytesPerSample(decoded.encoding);
    const meta: SignalMeta = {
      id,
      sha256,
      tenant: options.tenant,
      ...decoded.description,
      nonFiniteSamples: decoded.nonFinite,
      events: decoded.description.events ?? [],
      bytes,
      ...encodingFields(decoded.encoding),
      storedAt: new Date().toISOString(),
      warnings: decoded.warnings,
    };
    await withStorageReservation(store, bytes, options.maxStoreBytes, () => store.putSignalFile(meta, out));
    return meta;
  } finally {
    if (typeof raw === 'string') await input.close();
    await rm(out, { force: true });
  }
}

/** An open file and its size; the caller keeps and closes the handle. */
export interface RawFile {
  handle: FileHandle;
  size: number;
}

interface Decoded {
  description: { samplingRate: number; channels: string[]; unit: string; epochCount: number; samplesPerEpoch: number; events?: SignalEvent[] };
  /** how the samples file holds them */
  encoding: SampleEncoding;
  nonFinite: number;
  warnings: string[];
  /** SHA-256 of the samples as little-endian float64, as a reader gets them back */
  samplesSha256: string;
}

async function decodeFloat32File(input: FileHandle, size: number, out: string, d: Extract<IngestDescription, { format: 'float32' }>, limits: SignalLimits): Promise<Decoded> {
  if (size % 4 !== 0) throw new SignalInputError('shape', `the body has ${size} bytes, not a whole number of float32 samples`, '/body');
  const values = size / 4;
  const rows = d.epochCount * d.channels.length;
  if (rows === 0 || values % rows !== 0) throw new SignalInputError('shape', `${values} float32 samples do not divide into ${d.epochCount} epoch(s) × ${d.channels.length} channel(s)`, '/body');
  const samplesPerEpoch = values / rows;
  checkSignalShape({ samplingRate: d.samplingRate, channels: d.channels, epochCount: d.epochCount, samplesPerEpoch }, limits, {
    samplingRate: '/query/samplingRate',
    channels: '/query/channels',
    samples: '/body',
  });
  const { unit, exponent } = resolveUploadUnit(d.unit, d.voltage, '/query/unit');
  // The uploaded bytes are stored as they are; the float64 values (hashed, surveyed, and what a
  // reader gets back) come from the same conversion the reader uses.
  const encoding: SampleEncoding = { kind: 'float32', exponent };
  const survey = new AmplitudeSurvey(d.channels);
  const keep = d.nonFinite === 'keep';
  let nonFinite = 0;
  const hash = createHash('sha256');
  const output = await open(out, 'w');
  try {
    const raw = Buffer.alloc(CHUNK);
    const wide = new Float64Array(CHUNK / 4);
    let index = 0;
    for (let position = 0; position < size; ) {
      const bytesRead = await readExactly(input, raw, Math.min(CHUNK, size - position), position);
      const count = bytesRead / 4;
      decodeSamples(encoding, 0, raw, count, wide);
      for (let i = 0; i < count; i++) {
        const v = wide[i]!;
        if (v - v !== 0) {
          // NaN or ±Inf (v − v is 0 for every finite v)
          if (!keep) {
            const at = index + i;
            const row = Math.floor(at / samplesPerEpoch);
            throw new SignalInputError(
              'non-finite',
              `sample ${at % samplesPerEpoch} of channel "${d.channels[row % d.channels.length]}" in epoch ${Math.floor(row / d.channels.length)} is ${v} (byte offset ${at * 4}); use nonFinite=keep to store it as a gap`,
              '/body',
            );
          }
          nonFinite++;
        }
      }
      const converted = wide.subarray(0, count);
      surveyChunk(survey, converted, index, samplesPerEpoch);
      hash.update(sampleBytes(converted));
      await writeAll(output, raw.subarray(0, bytesRead), position);
      index += count;
      position += bytesRead;
    }
  } finally {
    await output.close();
  }
  // Events as a JSON upload has them: kept only when there are some, so the content hash is the same.
  const events = d.events && d.events.length > 0 ? { events: d.events.map((ev) => ({ ...ev })) } : {};
  return {
    description: { samplingRate: d.samplingRate, channels: [...d.channels], unit, epochCount: d.epochCount, samplesPerEpoch, ...events },
    encoding,
    nonFinite,
    warnings: survey.warnings(unit),
    samplesSha256: hash.digest('hex'),
  };
}

/** Adds samples stored in [epoch][channel][sample] order, starting at sample index `first`, to the survey. */
function surveyChunk(survey: AmplitudeSurvey, samples: Float64Array, first: number, samplesPerEpoch: number): void {
  const channels = survey.channels.length;
  for (let at = 0; at < samples.length; ) {
    const row = Math.floor((first + at) / samplesPerEpoch);
    const end = Math.min(samples.length, (row + 1) * samplesPerEpoch - first);
    survey.add(row % channels, samples.subarray(at, end));
    at = end;
  }
}

async function decodeEdfFile(input: FileHandle, size: number, out: string, d: Extract<IngestDescription, { format: 'edf' }>, limits: SignalLimits): Promise<Decoded> {
  const output = await open(out, 'w');
  let flushed: Promise<void> | null = null;
  let reading: Promise<void> | null = null;
  try {
    const header = await readHeader(input, size);
    const expected = header.headerBytes + header.recordCount * header.recordBytes;
    if (size !== expected) {
      throw new SignalInputError(
        'format',
        `the file has ${size} bytes but its header (${header.headerBytes} bytes) and ${header.recordCount} data records of ${header.recordBytes} bytes need ${expected} (number of data records at offset 236)`,
        '/body',
      );
    }
    const plan = planEdfSignal(header, { ...(d.channels ? { channels: d.channels } : {}), ...(d.samplingRate ? { samplingRate: d.samplingRate } : {}) }, limits);
    const selected = plan.channelIndices.map((index) => plan.header.signals[index]!);
    // The 16-bit codes are stored with each channel's calibration, unless a calibration would not
    // come back from the meta's JSON exactly (then the calibrated float64 values are stored).
    const calibration = selected.map(({ digitalMinimum, gain, physicalMinimum }) => ({ digitalMinimum, gain, physicalMinimum }));
    const encoding: SampleEncoding = calibration.every(survivesJson) ? { kind: 'int16', calibration } : FLOAT64;
    const width = bytesPerSample(encoding);
    const perRecord = plan.samplesPerEpoch / Math.max(1, header.recordCount);
    const batch = Math.max(1, Math.floor(CHUNK / header.recordBytes));
    const events: SignalEvent[] = [];
    let firstStart: number | null = null;
    let previousStart: number | undefined;
    const gaps: EdfGap[] = [];
    // Two read buffers: the next batch is read while this one's codes are written, channel by
    // channel, each to its place in the [channel][sample] file, all at once.
    const buffers = [Buffer.alloc(batch * header.recordBytes), Buffer.alloc(batch * header.recordBytes)] as const;
    const digital = new Int16Array(selected.length * batch * perRecord);
    const physical = encoding.kind === 'float64' ? new Float64Array(selected.length * batch * perRecord) : null;
    const readBatch = (r0: number, buffer: Buffer) => readAll(input, buffer, (Math.min(header.recordCount, r0 + batch) - r0) * header.recordBytes, header.headerBytes + r0 * header.recordBytes);
    reading = header.recordCount > 0 ? handled(readBatch(0, buffers[0])) : null;
    for (let r0 = 0, n = 0; r0 < header.recordCount; r0 += batch, n++) {
      const r1 = Math.min(header.recordCount, r0 + batch);
      const buffer = buffers[n % 2]!;
      await reading;
      reading = r1 < header.recordCount ? handled(readBatch(r1, buffers[(n + 1) % 2]!)) : null;
      let records;
      try {
        // Timing and annotations only: the samples are copied below as codes.
        records = decodeEdfRecords(plan.header, buffer.subarray(0, (r1 - r0) * header.recordBytes), {
          channels: [],
          startRecord: r0,
          endRecord: r1,
          bytesOrigin: header.headerBytes + r0 * header.recordBytes,
          annotations: true,
          // The decoder checks each record against the one before, across batches too.
          ...(previousStart === undefined ? {} : { previousRecordStart: previousStart }),
        });
      } catch (error) {
        throw error instanceof EdfFormatError ? formatError(error) : error;
      }
      firstStart ??= records.recordStarts[0] ?? null;
      previousStart = records.recordStarts.at(-1);
      for (const gap of records.gaps) gaps.push(gap);
      for (const a of records.annotations) events.push({ onset: a.onset, duration: a.duration, label: a.label });
      const count = (r1 - r0) * perRecord;
      const writes = selected.map((s, c) => {
        const codes = digital.subarray(c * count, (c + 1) * count);
        copyDigital(plan.header, s, buffer, 0, r1 - r0, codes);
        let bytes: Uint8Array;
        if (physical) {
          const values = physical.subarray(c * count, (c + 1) * count);
          calibrate(codes, s, values);
          bytes = sampleBytes(values);
        } else bytes = encodedBytes(codes);
        return writeAll(output, bytes, (c * plan.samplesPerEpoch + r0 * perRecord) * width);
      });
      await Promise.all(writes);
    }
    if (gaps.length > 0) throw discontinuityError(gaps);
    const offset = firstStart ?? 0;
    const shifted = events.map((ev) => ({ ...ev, onset: ev.onset - offset }));
    const description = {
      samplingRate: plan.samplingRate,
      channels: plan.channels,
      unit: plan.unit,
      epochCount: 1,
      samplesPerEpoch: plan.samplesPerEpoch,
      ...(shifted.length ? { events: shifted } : {}),
    };
    // The file is flushed to disk while it is hashed, so the store's own flush finds little left to do.
    flushed = handled(output.sync());
    // The codes were written channel by channel; the content hash runs over the float64 values in
    // [channel][sample] order, so it is taken in a second pass over the stored file.
    const survey = new AmplitudeSurvey(description.channels);
    const channelCount = description.channels.length;
    const samplesSha256 = await hashStored(out, description, encoding, (row, values) => survey.add(row % channelCount, values));
    await flushed;
    return { description, encoding, nonFinite: 0, warnings: survey.warnings(description.unit), samplesSha256 };
  } finally {
    // Nothing may still be in flight on the handles when they close (after a failure).
    await reading?.catch(() => undefined);
    await flushed?.catch(() => undefined);
    await output.close();
  }
}

/**
 * SHA-256 of a stored samples file's values as little-endian float64, read in chunks and converted
 * as a reader converts them; `visit` sees each row's values (in pieces) as they go by.
 */
async function hashStored(
  path: string,
  shape: { channels: readonly string[]; epochCount: number; samplesPerEpoch: number },
  encoding: SampleEncoding,
  visit: (row: number, values: Float64Array) => void,
): Promise<string> {
  const width = bytesPerSample(encoding);
  const total = shape.epochCount * shape.channels.length * shape.samplesPerEpoch;
  const hash = createHash('sha256');
  // Small blocks, so that the float64 values are still in the CPU's cache when they are surveyed
  // and hashed; the next block is read while one is converted.
  const perBlock = HASH_BLOCK_BYTES / width;
  const buffers = [Buffer.alloc(HASH_BLOCK_BYTES), Buffer.alloc(HASH_BLOCK_BYTES)] as const;
  const wide = new Float64Array(perBlock);
  const handle = await open(path, 'r');
  const readBlock = (index: number, buffer: Buffer) => readExactly(handle, buffer, Math.min(perBlock, total - index) * width, index * width);
  let next = total > 0 ? handled(readBlock(0, buffers[0])) : null;
  try {
    for (let index = 0, n = 0; next !== null; n++) {
      const raw = buffers[n % 2]!;
      const count = (await next) / width;
      next = index + count < total ? handled(readBlock(index + count, buffers[(n + 1) % 2]!)) : null;
      // A block may span rows; each row's part is converted with that row's channel.
      for (let at = 0; at < count; ) {
        const row = Math.floor((index + at) / shape.samplesPerEpoch);
        const end = Math.min(count, (row + 1) * shape.samplesPerEpoch - index);
        const values = wide.subarray(at, end);
        decodeSamples(encoding, row % shape.channels.length, raw.subarray(at * width), end - at, values);
        visit(row, values);
        at = end;
      }
      hash.update(sampleBytes(wide.subarray(0, count)));
      index += count;
    }
  } finally {
    await next?.catch(() => 0);
    await handle.close();
  }
  return hash.digest('hex');
}

/**
 * A read or flush started now and awaited later: a failure meanwhile is not an unhandled rejection
 * (which would end the process); it is thrown where the promise is awaited.
 */
function handled<T>(promise: Promise<T>): Promise<T> {
  promise.catch(() => undefined);
  return promise;
}

/** Reads exactly `length` bytes at `position` (completing short reads, so chunks stay whole samples); throws at the end of the file. */
async function readExactly(handle: FileHandle, buffer: Uint8Array, length: number, position: number): Promise<number> {
  let done = 0;
  while (done < length) {
    const { bytesRead } = await handle.read(buffer, done, length - done, position + done);
    if (bytesRead === 0) throw new Error(`file ended after ${position + done} bytes, ${length - done} bytes short`);
    done += bytesRead;
  }
  return done;
}

async function readHeader(input: FileHandle, size: number): Promise<EdfHeader> {
  const fixed = Buffer.alloc(Math.min(256, size));
  await readAll(input, fixed, fixed.length, 0);
  const count = Number(fixed.subarray(252, 256).toString('latin1').trim());
  const length = Number.isInteger(count) && count > 0 && count < 100_000 ? Math.min(size, 256 + 256 * count) : fixed.length;
  const bytes = Buffer.alloc(length);
  await readAll(input, bytes, length, 0);
  try {
    return readEdfHeader(bytes);
  } catch (error) {
    throw error instanceof EdfFormatError ? formatError(error) : error;
  }
}

async function readAll(handle: FileHandle, buffer: Uint8Array, length: number, position: number): Promise<void> {
  let done = 0;
  while (done < length) {
    const { bytesRead } = await handle.read(buffer, done, length - done, position + done);
    if (bytesRead === 0) throw new SignalInputError('format', `the file ends at byte ${position + done}, before the ${length} bytes expected there`, '/body');
    done += bytesRead;
  }
}

async function writeAll(handle: FileHandle, bytes: Uint8Array, position: number): Promise<void> {
  let done = 0;
  while (done < bytes.length) {
    const { bytesWritten } = await handle.write(bytes, done, bytes.length - done, position + done);
    done += bytesWritten;
  }
}
