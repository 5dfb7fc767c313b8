import { ANNOTATION_LABEL, EdfFormatError, decodeEdfRecords, parseEdf, type EdfFile, type EdfGap, type EdfHeader, type EdfSignalHeader } from './edf/index.js';
import { SignalInputError } from './errors.js';
import type { SignalLimits } from './limits.js';
import type { Signal, SignalEvent } from './signal.js';
import { shiftDecimal, voltageScaleToMicrovolts } from './units.js';
import { checkSignalShape } from './validate.js';

export interface EdfUploadOptions {
  /**
   * Ordinary signals to keep, by EDF label, in the order wanted.
   * @defaultValue every ordinary signal of the file (or of `samplingRate`), in file order
   */
  channels?: string[];
  /**
   * Keep only the signals sampled at this rate (Hz); needed when the file mixes rates.
   * @defaultValue the one rate of the file
   */
  samplingRate?: number;
}

const CHANNELS_QUERY = '/query/channels';
const RATE_QUERY = '/query/samplingRate';
const BODY = '/body';

// Rates are samplesPerRecord / recordDuration; a typed 255 must match 51 / 0.2 = 254.99999999999997.
const RATE_TOLERANCE = 1e-9;

type OrdinarySignal = EdfSignalHeader & { samplingRate: number };

export function formatError(error: EdfFormatError): SignalInputError {
  const located = error.message.includes(`offset ${error.offset}`);
  const message = located ? error.message : `${error.message} (${error.field} at byte offset ${error.offset})`;
  return new SignalInputError('format', message, BODY);
}

function rateText(rate: number): string {
  return `${Number(rate.toPrecision(12))} Hz`;
}

function labelList(signals: readonly EdfSignalHeader[]): string {
  return signals.map((s) => JSON.stringify(s.label)).join(', ');
}

/** "256 Hz: "Fz", "Cz"; 128 Hz: "Resp"" — keys in order of first appearance. */
function describeGroups(signals: readonly OrdinarySignal[], key: (s: OrdinarySignal) => string): string {
  const groups = new Map<string, OrdinarySignal[]>();
  for (const s of signals) {
    const k = key(s);
    const list = groups.get(k);
    if (list) list.push(s);
    else groups.set(k, [s]);
  }
  return [...groups].map(([k, list]) => `${k}: ${labelList(list)}`).join('; ');
}

function sameRate(a: number, b: number): boolean {
  return Math.abs(a - b) <= RATE_TOLERANCE * Math.max(Math.abs(a), Math.abs(b));
}

function selectByLabel(ordinary: readonly OrdinarySignal[], header: EdfHeader, labels: readonly string[]): OrdinarySignal[] {
  if (labels.length === 0) throw new SignalInputError('channels', `select at least one channel; the file's signals are ${labelList(ordinary)}`, CHANNELS_QUERY);
  return labels.map((label, i) => {
    const before = labels.indexOf(label);
    if (before !== i) throw new SignalInputError('channels', `channel "${label}" is selected twice (positions ${before} and ${i})`, `${CHANNELS_QUERY}/${i}`);
    const matches = ordinary.filter((s) => s.label === label);
    if (matches.length === 1) return matches[0]!;
    if (matches.length > 1) {
      const positions = matches.map((s) => s.index + 1).join(', ');
      throw new SignalInputError('channels', `channel "${label}" is ambiguous: signals ${positions} of the file share that label`, `${CHANNELS_QUERY}/${i}`);
    }
    const why = header.annotationSignals.length > 0 && label === ANNOTATION_LABEL ? ' (it holds the EDF+ annotations, which become events, not samples)' : '';
    throw new SignalInputError('channels', `the file has no ordinary signal labelled "${label}"${why}; its signals are ${labelList(ordinary)}`, `${CHANNELS_QUERY}/${i}`);
  });
}

function pickRate(candidates: OrdinarySignal[], ordinary: readonly OrdinarySignal[], options: EdfUploadOptions): OrdinarySignal[] {
  const rates = (list: readonly OrdinarySignal[]) => describeGroups(list, (s) => rateText(s.samplingRate));
  const wanted = options.samplingRate;
  if (wanted !== undefined) {
    if (!Number.isFinite(wanted) || wanted <= 0) {
      throw new SignalInputError('sampling-rate', `samplingRate must be a positive number of Hz, got ${wanted}`, RATE_QUERY);
    }
    const kept = candidates.filter((s) => sameRate(s.samplingRate, wanted));
    if (kept.length === 0) {
      throw new SignalInputError('sampling-rate', `no ${options.channels ? 'selected ' : ''}signal is sampled at ${rateText(wanted)}; the rates are ${rates(candidates)}`, RATE_QUERY);
    }
    if (options.channels && kept.length < candidates.length) {
      const other = candidates.filter((s) => !kept.includes(s));
      throw new SignalInputError('sampling-rate', `the selected channels ${labelList(other)} are not sampled at ${rateText(wanted)}; the rates are ${rates(candidates)}`, CHANNELS_QUERY);
    }
    return kept;
  }
  const first = candidates[0]!.samplingRate;
  if (candidates.every((s) => sameRate(s.samplingRate, first))) return candidates;
  const what = options.channels ? 'the selected channels have' : "the file's signals have";
  throw new SignalInputError(
    'sampling-rate',
    `${what} different sampling rates (${rates(options.channels ? candidates : ordinary)}); a signal has one rate, so choose channels of one rate with channels or samplingRate`,
    options.channels ? CHANNELS_QUERY : BODY,
  );
}

/** The unit after conversion ('uV' for any voltage) and the factor that gets there. */
function unitOf(s: EdfSignalHeader): { unit: string; scale: number } {
  const scale = voltageScaleToMicrovolts(s.physicalDimension);
  return scale === null ? { unit: s.physicalDimension.trim(), scale: 1 } : { unit: 'uV', scale };
}

function checkLabels(chosen: readonly OrdinarySignal[], pointer: string): void {
  const seen = new Map<string, OrdinarySignal>();
  for (const s of chosen) {
    if (s.label === '') throw new SignalInputError('channels', `signal ${s.index + 1} of the file has an empty label`, pointer);
    const before = seen.get(s.label);
    if (before) {
      throw new SignalInputError('channels', `signals ${before.index + 1} and ${s.index + 1} of the file are both labelled "${s.label}"`, pointer);
    }
    seen.set(s.label, s);
  }
}

/** The refusal of an EDF+D file whose records leave gaps (the same for whole and piecewise reads). */
export function discontinuityError(gaps: readonly EdfGap[]): SignalInputError {
  const shown = gaps.slice(0, 5).map((g) => `after record ${g.afterRecord + 1}, ${g.start} s to ${g.end} s`);
  const more = gaps.length > shown.length ? `, and ${gaps.length - shown.length} more` : '';
  return new SignalInputError(
    'format',
    `this EDF+D file is discontinuous: ${gaps.length} gap${gaps.length === 1 ? '' : 's'} between data records (${shown.join('; ')}${more}); ` +
      'discontinuous recordings are not supported yet, so upload each continuous part as its own file',
    BODY,
  );
}

/**
 * Turns an uploaded EDF or EDF+ file into one continuous {@link Signal} (epochCount 1).
 *
 * The annotation signal never becomes a channel; EDF+ annotations become `signal.events`, with
 * onsets in seconds from the first sample (the file start plus the first record's time-keeping
 * onset, EDF+ §2.2.4). Voltages in nV, uV/µV/μV, mV or V are scaled to microvolts (`unit: 'uV'`);
 * any other dimension is kept as written. Calibration is the header's linear map,
 * physical = (digital − digmin)·(physmax − physmin)/(digmax − digmin) + physmin.
 *
 * @param bytes - The whole file as uploaded.
 * @param options - Channel selection by label and/or by sampling rate (Hz); see {@link EdfUploadOptions}.
 * @param limits - The server's size limits, checked before any sample is decoded.
 * @returns The selected channels as a Signal in microvolts (or their common non-voltage unit).
 * @throws SignalInputError
 *   - `format` at `/body` for malformed bytes (the message names the field and byte offset) and for
 *     an EDF+D file whose records have gaps (the gaps are listed; EDF+D without gaps is read);
 *   - `channels` at `/query/channels/i` for an unknown or ambiguous label (the labels that exist
 *     are listed), at `/body` for a file with no ordinary signal or with empty or repeated labels;
 *     and when the chosen channels do not share one unit after conversion (each unit is listed);
 *   - `sampling-rate` when the chosen signals mix rates (each rate is listed with its labels) or no
 *     signal has the requested `samplingRate`;
 *   - `limit` / `shape` / `sampling-rate` from the server limits (see checkSignalShape).
 *
 * References: B. Kemp et al. (1992), Electroencephalogr. Clin. Neurophysiol. 82:391–393;
 * B. Kemp & J. Olivan (2003), "European data format 'plus' (EDF+)", Clin. Neurophysiol. 114:1755–1761.
 */
export function edfToSignal(bytes: Uint8Array, options: EdfUploadOptions, limits: SignalLimits): Signal {
  let file: EdfFile;
  try {
    // No sample is decoded here: header, file length, TALs and record timing only.
    file = parseEdf(bytes, { channels: [] });
  } catch (error) {
    throw error instanceof EdfFormatError ? formatError(error) : error;
  }
  const { header } = file;
  if (file.gaps.length > 0) throw discontinuityError(file.gaps);
  const plan = planEdfSignal(header, options, limits);
  let decoded;
  try {
    decoded = decodeEdfRecords(plan.header, bytes, { channels: plan.channelIndices, annotations: false });
  } catch (error) {
    throw error instanceof EdfFormatError ? formatError(error) : error;
  }
  const { samplesPerEpoch, channels } = plan;
  const data = new Float64Array(channels.length * samplesPerEpoch);
  decoded.signals.forEach((s, c) => data.set(s.samples, c * samplesPerEpoch));

  const signal: Signal = {
    samplingRate: plan.samplingRate,
    channels,
    unit: plan.unit,
    epochCount: 1,
    samplesPerEpoch,
    data,
  };
  if (file.annotations.length > 0) {
    const firstSample = file.recordStarts[0] ?? 0;
    signal.events = file.annotations.map((a): SignalEvent => ({ onset: a.onset - firstSample, duration: a.duration, label: a.label }));
  }
  return signal;
}

/** What to read from an EDF file: the selected ordinary signals, checked, with voltages in µV. */
export interface EdfPlan {
  /** the file's header with the selected signals' physical extremes rewritten in µV */
  header: EdfHeader;
  channelIndices: number[];
  channels: string[];
  unit: string;
  samplingRate: number;
  samplesPerEpoch: number;
}

/**
 * Checks the selection, rates, units and limits against the header alone (no sample is read), so a
 * large file can be refused, or decoded piecewise, after its first 256·(ns + 1) bytes.
 */
export function planEdfSignal(header: EdfHeader, options: EdfUploadOptions, limits: SignalLimits): EdfPlan {
  const ordinary = header.signals.filter((s): s is OrdinarySignal => !s.isAnnotation && s.samplingRate !== null);
  if (ordinary.length === 0) {
    throw new SignalInputError('channels', `the file holds ${header.signalCount} annotation signal(s) and no ordinary signal, so there are no samples`, BODY);
  }

  const pointer = options.channels ? CHANNELS_QUERY : BODY;
  const chosen = pickRate(options.channels ? selectByLabel(ordinary, header, options.channels) : ordinary, ordinary, options);
  checkLabels(chosen, pointer);
  const units = chosen.map(unitOf);
  if (units.some((u) => u.unit !== units[0]!.unit)) {
    const listed = describeGroups(chosen, (s) => JSON.stringify(unitOf(s).unit));
    throw new SignalInputError(
      'channels',
      `the ${options.channels ? 'selected channels' : "file's signals"} do not share one unit after converting voltages to uV (${listed}); choose channels of one unit with channels`,
      pointer,
    );
  }

  const samplesPerEpoch = header.recordCount * chosen[0]!.samplesPerRecord;
  const channels = chosen.map((s) => s.label);
  checkSignalShape({ samplingRate: chosen[0]!.samplingRate, channels, epochCount: 1, samplesPerEpoch }, limits, {
    samplingRate: options.samplingRate === undefined ? BODY : RATE_QUERY,
    channels: pointer,
    samples: BODY,
  });

  // Voltages are converted by shifting the decimal point of the physical extremes before calibration,
  // so an EDF in mV and the same digital codes with the extremes written in µV decode to the same
  // float64 samples bit for bit (scaling each calibrated sample would round differently).
  const scaled = new Map(
    chosen.map((s, c) => {
      const exponent = Math.round(Math.log10(units[c]!.scale));
      if (exponent === 0) return [s.index, s];
      const physicalMinimum = shiftDecimal(s.physicalMinimum, exponent);
      const physicalMaximum = shiftDecimal(s.physicalMaximum, exponent);
      return [s.index, { ...s, physicalMinimum, physicalMaximum, gain: (physicalMaximum - physicalMinimum) / (s.digitalMaximum - s.digitalMinimum) }];
    }),
  );
  return {
    header: { ...header, signals: header.signals.map((s) => scaled.get(s.index) ?? s) },
    channelIndices: chosen.map((s) => s.index),
    channels,
    unit: units[0]!.unit,
    samplingRate: chosen[0]!.samplingRate,
    samplesPerEpoch,
  };
}
