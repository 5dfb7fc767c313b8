import { createHash } from 'node:crypto';
import { endianness } from 'node:os';
import { canonicalJson } from '../common/canonical-json.js';
import type { Signal } from './signal.js';

/** Format tag hashed with every signal; bump it if the hashed layout ever changes. */
export const SIGNAL_HASH_FORMAT = 'rhythmetric-signal/2';

export function signalHeader(signal: Omit<Signal, 'data'>) {
  return {
    format: SIGNAL_HASH_FORMAT,
    samplingRate: signal.samplingRate,
    channels: signal.channels,
    unit: signal.unit,
    epochCount: signal.epochCount,
    samplesPerEpoch: signal.samplesPerEpoch,
    events: signal.events ?? [],
  };
}

/** Little-endian float64 bytes of the samples, whatever the host's byte order. */
export function sampleBytes(data: Float64Array): Uint8Array {
  if (endianness() === 'LE') return new Uint8Array(data.buffer, data.byteOffset, data.byteLength);
  const out = new Uint8Array(data.length * 8);
  const view = new DataView(out.buffer);
  data.forEach((v, i) => view.setFloat64(i * 8, v, true));
  return out;
}

/**
 * SHA-256 of the canonical JSON header with, in it, the SHA-256 of the samples as little-endian
 * float64. The same numbers give the same hash whether they arrived as JSON, float32 binary or EDF,
 * and the samples' hash can be taken while they stream to disk, before the header is known.
 */
export function signalSha256(signal: Signal): string {
  return signalSha256FromParts(signal, createHash('sha256').update(sampleBytes(signal.data)).digest('hex'));
}

export function signalSha256FromParts(description: Parameters<typeof signalHeader>[0], samplesSha256: string): string {
  return createHash('sha256')
    .update(canonicalJson({ ...signalHeader(description), samplesSha256 }))
    .digest('hex');
}

/**
 * Signal ids follow from the content hash and the owning tenant: the same upload by the same tenant
 * gives the same id, and another tenant's id for the same content is different (and answers 404).
 */
export function signalIdFromHash(sha256: string, tenant = 'public'): string {
  const basis = tenant === 'public' ? sha256 : createHash('sha256').update(`${tenant}\n${sha256}`).digest('hex');
  return `sig_${basis.slice(0, 32)}`;
}
