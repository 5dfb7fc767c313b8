import { createHash } from 'node:crypto';
import { endianness } from 'node:os';
import { canonicalJson } from '../common/canonical-json.js';
import type { Signal } from './signal.js';

/** Format tag hashed with every signal; bump it if the hashed layout ever changes. */
export const SIGNAL_HASH_FORMAT = 'rhythmetric-signal/1';

export function signalHeader(signal: Signal) {
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
 * SHA-256 over the canonical JSON header, a newline, then the samples as little-endian float64.
 * The same numbers give the same hash whether they arrived as JSON or as float32 binary.
 */
export function signalSha256(signal: Signal): string {
  return createHash('sha256').update(canonicalJson(signalHeader(signal))).update('\n').update(sampleBytes(signal.data)).digest('hex');
}

/**
 * Signal ids follow from the content hash and the owning tenant: the same upload by the same tenant
 * gives the same id, and another tenant's id for the same content is different (and answers 404).
 */
export function signalIdFromHash(sha256: string, tenant = 'public'): string {
  const basis = tenant === 'public' ? sha256 : createHash('sha256').update(`${tenant}\n${sha256}`).digest('hex');
  return `sig_${basis.slice(0, 32)}`;
}
