import { SignalInputError } from './errors.js';
import { channelView, type Signal } from './signal.js';
// Micro sign U+00B5 and Greek small mu U+03BC: both occur in recorded unit strings.
const MICRO = new Set(['u', 'U', '\u00b5', '\u03bc']);

/**
 * Factor that converts a voltage in `dimension` to microvolts, or null when `dimension` is not a
 * voltage (the caller keeps such signals in their own unit).
 *
 * Accepted: nV (0.001), uV / µV / μV (1), mV (1000), V (1 000 000). Surrounding spaces (EDF pads
 * its fields) are ignored. Case rules: the unit letter may be V or v; the prefix keeps its SI case
 * (n, m), except that micro may be written u, U, µ (U+00B5) or μ (U+03BC) and nano as N, since
 * neither U nor N is an SI prefix. "MV" is refused (null): it would be megavolt in SI but is
 * usually an upper-cased mV, and guessing either way could scale data by 10^9.
 *
 * @param dimension - A physical dimension such as an EDF header's (e.g. "uV", "mV ").
 * @returns Microvolts per unit of `dimension`, or null for a non-voltage or ambiguous dimension.
 *
 * Reference: SI prefixes, BIPM SI Brochure, 9th ed. (2019), SI prefixes table (common practice; table number from memory: 7).
 */
export function voltageScaleToMicrovolts(dimension: string): number | null {
  const text = dimension.trim();
  if (text.length === 0 || text.length > 2) return null;
  const unit = text[text.length - 1]!;
  if (unit !== 'V' && unit !== 'v') return null;
  if (text.length === 1) return 1e6;
  const prefix = text[0]!;
  if (MICRO.has(prefix)) return 1;
  if (prefix === 'm') return 1e3;
  if (prefix === 'n' || prefix === 'N') return 1e-3;
  return null;
}

/** value·10^exponent computed on the decimal digits, exactly as if the number had been written in the new unit. */
export function shiftDecimal(value: number, exponent: number): number {
  if (exponent === 0 || value === 0 || !Number.isFinite(value)) return value;
  const [mantissa, power = '0'] = String(value).split('e');
  return Number(`${mantissa}e${Number(power) + exponent}`);
}

/**
 * Takes float32 samples to the stored unit: `values[i]·10^exponent` into `out[i]` for i < count.
 * float32 values are exact in float64; one multiplication (or, for a negative exponent, one
 * division — 1e-3 is not exact) takes each there with a single rounding. The one place this is
 * written: ingest and the reader of samples stored as float32 both call it, so both give the same bits.
 */
export function scaleFloat32(values: Float32Array, exponent: number, out: Float64Array, count = values.length): void {
  const factor = 10 ** Math.abs(exponent);
  if (exponent === 0) for (let i = 0; i < count; i++) out[i] = values[i]!;
  else if (exponent > 0) for (let i = 0; i < count; i++) out[i] = values[i]! * factor;
  else for (let i = 0; i < count; i++) out[i] = values[i]! / factor;
}

/** The unit a signal is stored in, and the decimal exponent that takes its samples there. */
export interface StoredUnit {
  /** 'uV' for any voltage; the declared unit otherwise */
  unit: string;
  /** samples are multiplied by 10^exponent (0 for µV and for non-voltages) */
  exponent: number;
}

/**
 * The unit an upload declares, checked. Voltages (nV, µV, mV, V in the spellings
 * {@link voltageScaleToMicrovolts} accepts) are stored in µV, as EDF uploads are, so the same
 * recording gives the same samples and the same id whatever voltage unit it arrived in. Any other
 * unit string is refused unless the upload declares `voltage: false`, so that a typo such as "uv2"
 * can never pass as an unconverted voltage.
 *
 * @param unit - the declared unit; undefined means µV
 * @param voltage - false when the samples are not a voltage (then `unit` is kept as given). @defaultValue true
 * @param pointer - where the unit was given, for the error
 * @throws SignalInputError ('format') for an unknown or ambiguous voltage unit, or a missing non-voltage unit
 */
export function resolveUploadUnit(unit: string | undefined, voltage: boolean | undefined, pointer: string): StoredUnit {
  if (voltage === false) {
    if (unit === undefined || unit.trim() === '') throw new SignalInputError('format', 'a signal declared as not a voltage ("voltage": false) must name its unit', pointer);
    return { unit: unit.trim(), exponent: 0 };
  }
  if (unit === undefined) return { unit: 'uV', exponent: 0 };
  const scale = voltageScaleToMicrovolts(unit);
  if (scale === null) {
    const ambiguous = unit.trim() === 'MV' ? ' ("MV" could be megavolts or an upper-cased mV)' : '';
    throw new SignalInputError('format', `unknown voltage unit "${unit}"${ambiguous}; give nV, uV (µV), mV or V, or declare a unit that is not a voltage with "voltage": false`, pointer);
  }
  return { unit: 'uV', exponent: Math.round(Math.log10(scale)) };
}

// Scalp EEG runs from a few µV to a few hundred µV (common practice); these bounds are two decades
// beyond, so only a wrong unit (volts sent as µV sits near 1e-5, nanovolts near 1e4) falls outside.
const PLAUSIBLE_RMS_MICROVOLTS: readonly [number, number] = [0.01, 10_000];

/**
 * Per-channel root-mean-square of the finite samples, fed in any order and in pieces, for the
 * plausibility check of an upload that streams to disk.
 */
export class AmplitudeSurvey {
  private readonly squares: Float64Array;
  private readonly counts: Float64Array;
  constructor(readonly channels: readonly string[]) {
    this.squares = new Float64Array(channels.length);
    this.counts = new Float64Array(channels.length);
  }

  add(channel: number, samples: ArrayLike<number>): void {
    let squares = 0,
      count = 0;
    for (let i = 0; i < samples.length; i++) {
      const v = samples[i]!;
      if (Number.isFinite(v)) {
        squares += v * v;
        count++;
      }
    }
    this.squares[channel] = this.squares[channel]! + squares;
    this.counts[channel] = this.counts[channel]! + count;
  }

  /**
   * Warnings for voltage channels whose RMS about zero lies far outside the EEG range; a channel of
   * zeros is left to the quality flags. Nothing is said of non-voltage units.
   */
  warnings(unit: string): string[] {
    if (unit !== 'uV') return [];
    const [low, high] = PLAUSIBLE_RMS_MICROVOLTS;
    const out: string[] = [];
    this.channels.forEach((name, c) => {
      const rms = this.counts[c]! > 0 ? Math.sqrt(this.squares[c]! / this.counts[c]!) : 0;
      if (rms > 0 && (rms < low || rms > high)) {
        const hint = rms < low ? 'volts or millivolts sent as µV look like this' : 'nanovolts sent as µV, or an unremoved offset, look like this';
        out.push(`channel "${name}" has an RMS of ${rms.toPrecision(3)} µV, far outside the EEG range (${low}–${high} µV): check the declared unit (${hint})`);
      }
    });
    return out;
  }
}

/** {@link AmplitudeSurvey} warnings of a signal held in memory. */
export function amplitudeWarnings(signal: Signal): string[] {
  const survey = new AmplitudeSurvey(signal.channels);
  for (let e = 0; e < signal.epochCount; e++) for (let c = 0; c < signal.channels.length; c++) survey.add(c, channelView(signal, e, c));
  return survey.warnings(signal.unit);
}
