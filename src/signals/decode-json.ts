import { loneSurrogateAt } from '../common/canonical-json.js';
import { SignalInputError } from './errors.js';
import type { SignalLimits } from './limits.js';
import type { Signal, SignalEvent } from './signal.js';
import { resolveUploadUnit, shiftDecimal } from './units.js';
import { checkSignalShape } from './validate.js';

/** The JSON upload body, already shape-checked by the HTTP schema (types only). */
export interface JsonSignalBody {
  samplingRate: number;
  channels: string[];
  unit?: string | undefined;
  /** false when the samples are not a voltage; voltages are stored in µV */
  voltage?: boolean | undefined;
  data?: (number | null)[][] | undefined;
  epochs?: (number | null)[][][] | undefined;
  events?: SignalEvent[] | undefined;
  /** `reject` (default): a null sample is an error; `keep`: stored as NaN, for recipes that skip epochs */
  nonFinite?: 'reject' | 'keep' | undefined;
}

/**
 * Decodes a JSON upload into a {@link Signal}. `data` is channel × sample (one continuous epoch),
 * `epochs` is epoch × channel × sample. Ragged rows are refused with the pointer of the first short row.
 */
export function decodeJsonSignal(body: JsonSignalBody, limits: SignalLimits): Signal {
  if ((body.data === undefined) === (body.epochs === undefined)) {
    throw new SignalInputError('shape', 'give exactly one of "data" (channel × sample) or "epochs" (epoch × channel × sample)', body.data ? '/epochs' : '/data');
  }
  const epochs = body.epochs ?? [body.data!];
  const base = body.epochs ? '/epochs' : '/data';
  const pointer = (e: number, ...rest: number[]) => (body.epochs ? `${base}/${e}` : base) + rest.map((r) => `/${r}`).join('');
  const channelCount = body.channels.length;
  const samplesPerEpoch = epochs[0]?.[0]?.length ?? 0;
  epochs.forEach((epoch, e) => {
    if (epoch.length !== channelCount) {
      throw new SignalInputError('shape', `${epoch.length} channel rows but ${channelCount} channel names`, pointer(e));
    }
  });
  checkSignalShape({ samplingRate: body.samplingRate, channels: body.channels, epochCount: epochs.length, samplesPerEpoch }, limits, {
    samplingRate: '/samplingRate',
    channels: '/channels',
    samples: pointer(0, 0),
  });
  // Names and labels go into the signal's hash, whose canonical JSON (RFC 8785) takes I-JSON only.
  const texts: [string | undefined, string, 'channels' | 'format'][] = [
    ...body.channels.map((name, i): [string, string, 'channels'] => [name, `/channels/${i}`, 'channels']),
    [body.unit, '/unit', 'format'],
    ...(body.events ?? []).map((ev, i): [string, string, 'format'] => [ev.label, `/events/${i}/label`, 'format']),
  ];
  for (const [text, at, code] of texts) {
    if (text !== undefined && loneSurrogateAt(text) >= 0)
      throw new SignalInputError(code, 'the text holds an unpaired UTF-16 surrogate, which JSON text exchanged between programs (I-JSON, RFC 7493) may not hold', at);
  }
  const { unit, exponent } = resolveUploadUnit(body.unit, body.voltage, '/unit');
  const keep = body.nonFinite === 'keep';
  const data = new Float64Array(epochs.length * channelCount * samplesPerEpoch);
  let offset = 0;
  epochs.forEach((epoch, e) => {
    epoch.forEach((row, c) => {
      if (row.length !== samplesPerEpoch) {
        throw new SignalInputError('shape', `channel "${body.channels[c]}" has ${row.length} samples where the first has ${samplesPerEpoch} (ragged rows)`, pointer(e, c));
      }
      for (let s = 0; s < row.length; s++) {
        const v = row[s];
        if (typeof v !== 'number' || !Number.isFinite(v)) {
          if (!keep) {
            throw new SignalInputError('non-finite', `sample is ${v === null ? 'null' : String(v)}, not a finite number; send "nonFinite": "keep" to store it as a gap`, pointer(e, c, s));
          }
          data[offset++] = Number.NaN;
        } else {
          // On the decimal digits, so 0.00001234 V and 12.34 µV give the same double (and the same id).
          data[offset++] = exponent === 0 ? v : shiftDecimal(v, exponent);
        }
      }
    });
  });
  const signal: Signal = {
    samplingRate: body.samplingRate,
    channels: [...body.channels],
    unit,
    epochCount: epochs.length,
    samplesPerEpoch,
    data,
  };
  if (body.events && body.events.length > 0) signal.events = body.events.map((ev) => ({ ...ev }));
  return signal;
}
