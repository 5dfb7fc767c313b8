import type { SignalEvent } from '../signal.js';
import { EdfFormatError } from './errors.js';

/**
 * One annotation: onset in seconds from the file start (may be negative), duration in seconds or
 * null. The same shape as a Signal's events, so annotations pass through unchanged.
 */
export type EdfAnnotation = SignalEvent;

export interface ParsedTals {
  /** Onset of the time-keeping TAL, i.e. the record's start in seconds; null when not asked for. */
  recordStart: number | null;
  annotations: EdfAnnotation[];
}

const ONSET_END = 0x14;
const DURATION_MARK = 0x15;
const TAL_END = 0x00;

const SIGNED = /^[+-](\d+\.?\d*|\.\d+)$/;
const UNSIGNED = /^(\d+\.?\d*|\.\d+)$/;

const utf8 = new TextDecoder('utf-8', { fatal: true });

function ascii(bytes: Uint8Array, start: number, end: number): string {
  let text = '';
  for (let i = start; i < end; i++) text += String.fromCharCode(bytes[i]!);
  return text;
}

function talError(where: string, offset: number, detail: string): EdfFormatError {
  return new EdfFormatError('annotation TAL', offset, `TAL at offset ${offset}${where} ${detail}`);
}

/**
 * Parses the TALs (time-stamped annotation lists) held in one data record of an "EDF Annotations"
 * signal: `onset [0x15 duration] 0x14 text 0x14 [text 0x14 …] 0x00`, then 0x00 padding.
 *
 * @param bytes - The signal's bytes within one data record.
 * @param fileOffset - File offset of `bytes[0]`, used in error messages.
 * @param timekeeping - When true, the first TAL must be a time-keeping TAL (its first text empty) and
 *   its onset is returned as `recordStart` (EDF+ §2.2.4).
 * @param where - Extra location text for error messages, e.g. " (data record 3)".
 * @throws EdfFormatError For an onset without its sign, a signed or malformed duration, a TAL that
 *   does not end with 0x14 0x00, text that is not UTF-8, or a missing time-keeping TAL.
 */
export function parseTals(bytes: Uint8Array, fileOffset: number, timekeeping: boolean, where = ''): ParsedTals {
  const annotations: EdfAnnotation[] = [];
  let recordStart: number | null = null;
  let first = true;
  let p = 0;
  while (p < bytes.length) {
    if (bytes[p] === TAL_END) {
      p++;
      continue;
    }
    const talOffset = fileOffset + p;
    let q = p;
    while (q < bytes.length && bytes[q] !== ONSET_END && bytes[q] !== DURATION_MARK && bytes[q] !== TAL_END) q++;
    if (q >= bytes.length || bytes[q] === TAL_END) {
      throw talError(where, talOffset, 'has no 0x14 after its onset, so it does not end with 0x14 0x00');
    }
    const onsetText = ascii(bytes, p, q);
    if (!SIGNED.test(onsetText)) {
      const why = /^(\d+\.?\d*|\.\d+)$/.test(onsetText) ? 'has no leading + or − sign' : 'is not a number';
      throw talError(where, talOffset, `has onset "${onsetText}", which ${why}`);
    }
    const onset = Number(onsetText);
    if (!Number.isFinite(onset)) throw talError(where, talOffset, `has onset "${onsetText}", which is too large`);
    let duration: number | null = null;
    if (bytes[q] === DURATION_MARK) {
      const d = q + 1;
      q = d;
      while (q < bytes.length && bytes[q] !== ONSET_END && bytes[q] !== DURATION_MARK && bytes[q] !== TAL_END) q++;
      if (q >= bytes.length || bytes[q] !== ONSET_END) {
        throw talError(where, talOffset, 'has no 0x14 after its duration, so it does not end with 0x14 0x00');
      }
      const durationText = ascii(bytes, d, q);
      if (!UNSIGNED.test(durationText)) {
        const why = durationText.startsWith('-') ? 'is negative' : durationText.startsWith('+') ? 'carries a sign' : 'is not a number';
        throw talError(where, talOffset, `has duration "${durationText}", which ${why}`);
      }
      duration = Number(durationText);
      if (!Number.isFinite(duration)) throw talError(where, talOffset, `has duration "${durationText}", which is too large`);
    }
    p = q + 1;
    const texts: string[] = [];
    for (;;) {
      const s = p;
      while (p < bytes.length && bytes[p] !== ONSET_END && bytes[p] !== TAL_END) p++;
      if (p >= bytes.length) throw talError(where, talOffset, 'does not end with 0x14 0x00 before the signal ends');
      if (bytes[p] === TAL_END) {
        if (p !== s) throw talError(where, talOffset, `has text not closed by 0x14 before its 0x00 at offset ${fileOffset + p}`);
        p++;
        break;
      }
      try {
        texts.push(utf8.decode(bytes.subarray(s, p)));
      } catch {
        throw talError(where, talOffset, `has text at offset ${fileOffset + s} that is not valid UTF-8`);
      }
      p++;
    }
    let from = 0;
    if (first && timekeeping) {
      if (texts[0] !== '') throw talError(where, talOffset, 'is the first TAL of its data record but not a time-keeping TAL (onset 0x14 0x14)');
      recordStart = onset;
      from = 1;
    }
    for (let i = from; i < texts.length; i++) {
      if (texts[i] !== '') annotations.push({ onset, duration, label: texts[i]! });
    }
    first = false;
  }
  if (timekeeping && first) {
    throw new EdfFormatError('annotation TAL', fileOffset, `data record${where} at offset ${fileOffset} has no time-keeping TAL`);
  }
  return { recordStart, annotations };
}

/** Seconds as a plain decimal string (never exponent notation, which TALs do not allow). */
export function formatSeconds(value: number, signed: boolean): string {
  if (!Number.isFinite(value) || Math.abs(value) >= 1e15) {
    throw new RangeError(`a TAL time must be finite and below 1e15 s, got ${value}`);
  }
  const magnitude = Math.abs(value);
  let text = magnitude.toString();
  if (text.includes('e')) text = magnitude.toFixed(20).replace(/0+$/, '').replace(/\.$/, '');
  if (!signed) return text;
  return (value < 0 || Object.is(value, -0) ? '-' : '+') + text;
}

const utf8Encoder = new TextEncoder();

/** Encodes one TAL; every text must be free of the structural bytes 0x00, 0x14 and 0x15. */
export function encodeTal(onset: number, duration: number | null, texts: string[]): Uint8Array {
  if (duration !== null && !(duration >= 0)) throw new RangeError(`annotation duration must be ≥ 0 s, got ${duration}`);
  let head = formatSeconds(onset, true);
  if (duration !== null) head += '\x15' + formatSeconds(duration, false);
  const parts: Uint8Array[] = [utf8Encoder.encode(head + '\x14')];
  for (const text of texts) {
    if (/[\x00\x14\x15]/.test(text)) throw new RangeError(`annotation label ${JSON.stringify(text)} holds a byte 0x00, 0x14 or 0x15`);
    parts.push(utf8Encoder.encode(text), Uint8Array.of(ONSET_END));
  }
  parts.push(Uint8Array.of(TAL_END));
  const out = new Uint8Array(parts.reduce((n, part) => n + part.length, 0));
  let at = 0;
  for (const part of parts) {
    out.set(part, at);
    at += part.length;
  }
  return out;
}
