import { ANNOTATION_LABEL, type EdfDateTime } from './header.js';
import { encodeTal } from './tal.js';

export interface EdfWriteSignal {
  label: string;
  /** Physical samples, in `physicalDimension` units; length = recordCount·samplesPerRecord. */
  samples: Float64Array | readonly number[];
  /** Hz; samplingRate·recordDuration must be a whole number of samples per record. */
  samplingRate: number;
  /** @defaultValue '' */
  physicalDimension?: string;
  /** @defaultValue '' */
  transducer?: string;
  /** @defaultValue '' */
  prefiltering?: string;
  /** @defaultValue the data minimum, rounded down to fit the 8-character field */
  physicalMinimum?: number;
  /** @defaultValue the data maximum, rounded up to fit the 8-character field */
  physicalMaximum?: number;
  /** @defaultValue −32768 */
  digitalMinimum?: number;
  /** @defaultValue 32767 */
  digitalMaximum?: number;
}

export interface EdfWriteAnnotation {
  /** Seconds from the file start; may be negative. */
  onset: number;
  /** Seconds, ≥ 0; null or absent for an instant. */
  duration?: number | null;
  label: string;
}

export interface WriteEdfInput {
  signals: readonly EdfWriteSignal[];
  /** Seconds per data record, > 0. */
  recordDuration: number;
  /** Local start date and time; year 1985–2084 (the two-digit year rule of EDF+ §2.1.3). */
  startDate: EdfDateTime;
  /** @defaultValue 'X X X X' with annotations (EDF+ unknown-subfield form), else '' */
  patientId?: string;
  /** @defaultValue 'Startdate dd-MMM-yyyy X X X' with annotations, else '' */
  recordingId?: string;
  /** When given (even empty), the file is written as EDF+C with an "EDF Annotations" signal. */
  annotations?: readonly EdfWriteAnnotation[];
  /**
   * Clip samples outside a caller-given physical range instead of refusing them.
   * @defaultValue false
   */
  clip?: boolean;
}

const MONTHS = ['JAN', 'FEB', 'MAR', 'APR', 'MAY', 'JUN', 'JUL', 'AUG', 'SEP', 'OCT', 'NOV', 'DEC'];

function trimZeros(text: string): string {
  const t = text.includes('.') ? text.replace(/0+$/, '').replace(/\.$/, '') : text;
  return t === '-0' ? '0' : t;
}

/**
 * Writes a number into an 8-character ASCII field. `exact` refuses a value that does not fit as
 * is; `down`/`up` round outward so the written range still contains the data.
 */
export function formatEdfNumber(value: number, mode: 'exact' | 'down' | 'up', what: string): string {
  if (!Number.isFinite(value)) throw new RangeError(`${what} must be finite, got ${value}`);
  if (mode === 'exact') {
    for (let d = 0; d <= 7; d++) {
      const text = trimZeros(value.toFixed(d));
      if (text.length <= 8 && Number(text) === value) return text;
    }
    throw new RangeError(`${what} ${value} does not fit the 8-character EDF field exactly`);
  }
  for (let d = 7; d >= 0; d--) {
    const step = 10 ** -d;
    let text = value.toFixed(d);
    if (mode === 'down' && Number(text) > value) text = (Number(text) - step).toFixed(d);
    if (mode === 'up' && Number(text) < value) text = (Number(text) + step).toFixed(d);
    text = trimZeros(text);
    if (text.length <= 8) return text;
  }
  throw new RangeError(`${what} ${value} is too large for the 8-character EDF field`);
}

function asciiField(text: string, width: number, what: string): string {
  if (!/^[\x20-\x7e]*$/.test(text)) throw new RangeError(`${what} must be printable ASCII, got ${JSON.stringify(text)}`);
  if (text.length > width) throw new RangeError(`${what} is ${text.length} characters; the EDF field holds ${width}`);
  return text.padEnd(width, ' ');
}

function two(n: number): string {
  return String(n).padStart(2, '0');
}

function checkStart(start: EdfDateTime): void {
  const { year, month, day, hour, minute, second } = start;
  const valid =
    [year, month, day, hour, minute, second].every(Number.isInteger) &&
    year >= 1985 &&
    year <= 2084 &&
    month >= 1 &&
    month <= 12 &&
    day >= 1 &&
    day <= new Date(Date.UTC(year, month, 0)).getUTCDate() &&
    hour >= 0 &&
    hour <= 23 &&
    minute >= 0 &&
    minute <= 59 &&
    second >= 0 &&
    second <= 59;
  if (!valid) throw new RangeError(`startDate ${JSON.stringify(start)} is not a date and time in 1985–2084`);
}

interface PreparedSignal {
  fields: Record<string, string>;
  samplesPerRecord: number;
  digital: Int16Array;
}

function prepareSignal(signal: EdfWriteSignal, i: number, recordDuration: number, clip: boolean): PreparedSignal {
  const what = `signals[${i}]`;
  const rate = signal.samplingRate;
  if (!(rate > 0) || !Number.isFinite(rate)) throw new RangeError(`${what}.samplingRate must be a positive number of Hz, got ${rate}`);
  const exact = rate * recordDuration;
  const samplesPerRecord = Math.round(exact);
  if (samplesPerRecord < 1 || Math.abs(exact - samplesPerRecord) > 1e-9 * exact) {
    throw new RangeError(`${what}.samplingRate ${rate} Hz × recordDuration ${recordDuration} s is not a whole number of samples`);
  }
  const samples = signal.samples;
  let low = Infinity;
  let high = -Infinity;
  for (let k = 0; k < samples.length; k++) {
    const x = samples[k]!;
    if (!Number.isFinite(x)) throw new RangeError(`${what}.samples[${k}] is ${x}; EDF stores finite numbers only`);
    if (x < low) low = x;
    if (x > high) high = x;
  }
  if (samples.length === 0) low = high = 0;
  // A flat signal still needs physmax ≠ physmin.
  if (low === high) {
    low -= 1;
    high += 1;
  }
  const physMinText = signal.physicalMinimum === undefined ? formatEdfNumber(low, 'down', `${what} physical minimum`) : formatEdfNumber(signal.physicalMinimum, 'exact', `${what}.physicalMinimum`);
  const physMaxText = signal.physicalMaximum === undefined ? formatEdfNumber(high, 'up', `${what} physical maximum`) : formatEdfNumber(signal.physicalMaximum, 'exact', `${what}.physicalMaximum`);
  const physMin = Number(physMinText);
  const physMax = Number(physMaxText);
  if (physMin === physMax) throw new RangeError(`${what}.physicalMaximum must differ from physicalMinimum (${physMin})`);
  const digMin = signal.digitalMinimum ?? -32768;
  const digMax = signal.digitalMaximum ?? 32767;
  for (const [name, v] of [
    ['digitalMinimum', digMin],
    ['digitalMaximum', digMax],
  ] as const) {
    if (!Number.isInteger(v) || v < -32768 || v > 32767) throw new RangeError(`${what}.${name} must be an integer in −32768..32767, got ${v}`);
  }
  if (digMax <= digMin) throw new RangeError(`${what}.digitalMaximum ${digMax} must exceed digitalMinimum ${digMin}`);

  // Quantize with the numbers as the reader will parse them, so the round trip error is ≤ half a step.
  const gain = (physMax - physMin) / (digMax - digMin);
  const digital = new Int16Array(samples.length);
  for (let k = 0; k < samples.length; k++) {
    const level = (samples[k]! - physMin) / gain + digMin;
    if ((level < digMin - 0.5 || level > digMax + 0.5) && !clip) {
      throw new RangeError(`${what}.samples[${k}] = ${samples[k]} lies outside the physical range ${physMin}..${physMax}`);
    }
    digital[k] = Math.min(digMax, Math.max(digMin, Math.round(level)));
  }
  return {
    samplesPerRecord,
    digital,
    fields: {
      label: asciiField(signal.label, 16, `${what}.label`),
      transducer: asciiField(signal.transducer ?? '', 80, `${what}.transducer`),
      physicalDimension: asciiField(signal.physicalDimension ?? '', 8, `${what}.physicalDimension`),
      physicalMinimum: physMinText.padEnd(8, ' '),
      physicalMaximum: physMaxText.padEnd(8, ' '),
      digitalMinimum: String(digMin).padEnd(8, ' '),
      digitalMaximum: String(digMax).padEnd(8, ' '),
      prefiltering: asciiField(signal.prefiltering ?? '', 80, `${what}.prefiltering`),
      samplesPerRecord: String(samplesPerRecord).padEnd(8, ' '),
      reserved: ' '.repeat(32),
    },
  };
}

function annotationRecords(annotations: readonly EdfWriteAnnotation[], recordCount: number, recordDuration: number): Uint8Array[][] {
  const perRecord: Uint8Array[][] = [];
  for (let r = 0; r < recordCount; r++) {
    // Rounded to 15 digits so that r·duration is written as 0.3, not 0.30000000000000004.
    const start = Number((r * recordDuration).toPrecision(15));
    perRecord.push([encodeTal(start, null, [''])]);
  }
  annotations.forEach((a, i) => {
    if (!Number.isFinite(a.onset)) throw new RangeError(`annotations[${i}].onset must be finite, got ${a.onset}`);
    if (a.label === '') throw new RangeError(`annotations[${i}].label must not be empty`);
    const r = Math.min(recordCount - 1, Math.max(0, Math.floor(a.onset / recordDuration)));
    perRecord[r]!.push(encodeTal(a.onset, a.duration ?? null, [a.label]));
  });
  return perRecord;
}

/**
 * Writes signals (and optionally annotations) as an EDF file, or EDF+C when annotations are given.
 *
 * Physical samples are quantized to 16-bit digital values through the header's own calibration,
 * so reading the file back gives every sample to within half a quantization step,
 * (physmax − physmin)/(digmax − digmin)/2.
 *
 * @param input - See {@link WriteEdfInput}.
 * @returns The file bytes.
 * @throws RangeError When a sampling rate does not give whole samples per record, signals cover
 *   different numbers of records, a text is not ASCII or too long, a number does not fit its field,
 *   a sample is not finite or lies outside a given physical range (unless `clip`).
 *
 * References: Kemp et al. (1992); Kemp & Olivan (2003), EDF+ §2.
 */
export function writeEdf(input: WriteEdfInput): Uint8Array {
  const duration = input.recordDuration;
  if (!(duration > 0) || !Number.isFinite(duration)) throw new RangeError(`recordDuration must be a positive number of seconds, got ${duration}`);
  const durationText = formatEdfNumber(duration, 'exact', 'recordDuration');
  checkStart(input.startDate);
  if (input.signals.length === 0) throw new RangeError('signals must hold at least one signal');
  const clip = input.clip ?? false;
  const prepared = input.signals.map((s, i) => prepareSignal(s, i, duration, clip));
  const recordCount = prepared[0]!.digital.length / prepared[0]!.samplesPerRecord;
  prepared.forEach((p, i) => {
    const records = p.digital.length / p.samplesPerRecord;
    if (!Number.isInteger(records) || records !== recordCount || records < 1) {
      throw new RangeError(
        `signals[${i}] has ${p.digital.length} samples = ${records} records of ${p.samplesPerRecord}; ` + `every signal must fill the same whole number (≥ 1) of records (signals[0]: ${recordCount})`,
      );
    }
  });

  const plus = input.annotations !== undefined;
  let tals: Uint8Array[][] = [];
  if (plus) {
    tals = annotationRecords(input.annotations!, recordCount, duration);
    // A loop, not Math.max(...): an overnight file can have more records than a call has arguments.
    let most = 0;
    for (const list of tals)
      most = Math.max(
        most,
        list.reduce((n, t) => n + t.length, 0),
      );
    const samplesPerRecord = Math.ceil(most / 2);
    const fields: Record<string, string> = {
      label: ANNOTATION_LABEL.padEnd(16, ' '),
      transducer: ' '.repeat(80),
      physicalDimension: ' '.repeat(8),
      physicalMinimum: '-1      ',
      physicalMaximum: '1       ',
      digitalMinimum: '-32768  ',
      digitalMaximum: '32767   ',
      prefiltering: ' '.repeat(80),
      samplesPerRecord: String(samplesPerRecord).padEnd(8, ' '),
      reserved: ' '.repeat(32),
    };
    prepared.push({ fields, samplesPerRecord, digital: new Int16Array(0) });
  }

  const ns = prepared.length;
  const { year, month, day, hour, minute, second } = input.startDate;
  const defaultRecording = plus ? `Startdate ${two(day)}-${MONTHS[month - 1]}-${year} X X X` : '';
  let header =
    '0       ' +
    asciiField(input.patientId ?? (plus ? 'X X X X' : ''), 80, 'patientId') +
    asciiField(input.recordingId ?? defaultRecording, 80, 'recordingId') +
    `${two(day)}.${two(month)}.${two(year % 100)}` +
    `${two(hour)}.${two(minute)}.${two(second)}` +
    String(256 + 256 * ns).padEnd(8, ' ') +
    (plus ? 'EDF+C' : '').padEnd(44, ' ') +
    String(recordCount).padEnd(8, ' ') +
    durationText.padEnd(8, ' ') +
    String(ns).padEnd(4, ' ');
  for (const key of ['label', 'transducer', 'physicalDimension', 'physicalMinimum', 'physicalMaximum', 'digitalMinimum', 'digitalMaximum', 'prefiltering', 'samplesPerRecord', 'reserved']) {
    for (const p of prepared) header += p.fields[key]!;
  }

  const recordBytes = prepared.reduce((n, p) => n + 2 * p.samplesPerRecord, 0);
  const out = new Uint8Array(header.length + recordCount * recordBytes);
  for (let i = 0; i < header.length; i++) out[i] = header.charCodeAt(i);
  const view = new DataView(out.buffer);
  let at = header.length;
  for (let r = 0; r < recordCount; r++) {
    prepared.forEach((p, i) => {
      if (plus && i === ns - 1) {
        let t = at;
        for (const tal of tals[r]!) {
          out.set(tal, t);
          t += tal.length;
        }
      } else {
        const base = r * p.samplesPerRecord;
        for (let k = 0; k < p.samplesPerRecord; k++) view.setInt16(at + 2 * k, p.digital[base + k]!, true);
      }
      at += 2 * p.samplesPerRecord;
    });
  }
  return out;
}
