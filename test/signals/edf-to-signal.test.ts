import { describe, expect, it } from 'vitest';
import { createRandom } from '../../src/common/random.js';
import { edfToSignal, type EdfUploadOptions } from '../../src/signals/edf-to-signal.js';
import { readEdfHeader, writeEdf, type EdfWriteSignal, type WriteEdfInput } from '../../src/signals/edf/index.js';
import { SignalInputError } from '../../src/signals/errors.js';
import { DEFAULT_SIGNAL_LIMITS, type SignalLimits } from '../../src/signals/limits.js';
import { channelView } from '../../src/signals/signal.js';

// Test data is invented and seeded. Byte layouts follow the EDF spec (Kemp et al. 1992) and EDF+
// (Kemp & Olivan 2003); the calibration checked below is the header's linear map
// physical = (digital − digmin)·(physmax − physmin)/(digmax − digmin) + physmin (Kemp et al. 1992).

const start = { year: 2024, month: 11, day: 2, hour: 23, minute: 40, second: 0 };

function noise(n: number, scale: number, seed: number): Float64Array {
  const random = createRandom(seed);
  return Float64Array.from({ length: n }, () => scale * Math.max(-3, Math.min(3, random.normal())));
}

function edf(signals: EdfWriteSignal[], extra: Partial<WriteEdfInput> = {}): Uint8Array {
  return writeEdf({ signals, recordDuration: 1, startDate: start, ...extra });
}

function thrown(run: () => unknown): SignalInputError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(SignalInputError);
    return error as SignalInputError;
  }
  throw new Error('expected a SignalInputError, nothing was thrown');
}

function toSignal(bytes: Uint8Array, options: EdfUploadOptions = {}, limits: SignalLimits = DEFAULT_SIGNAL_LIMITS) {
  return edfToSignal(bytes, options, limits);
}

const ascii = (text: string) => Uint8Array.from(text, (c) => c.charCodeAt(0));

/**
 * Rewrites the "EDF Annotations" bytes of every data record with the given TAL text (EDF+ §2.2.2:
 * onset 0x14 0x14 0x00 is a time-keeping TAL) and optionally the reserved field (offset 192, 44 bytes).
 * The file must have been written with room: pad it with a long annotation label.
 */
function rewriteAnnotations(bytes: Uint8Array, perRecord: string[], reserved?: string): Uint8Array {
  const out = bytes.slice();
  const header = readEdfHeader(out);
  const tal = header.signals[header.annotationSignals[0]!]!;
  const size = 2 * tal.samplesPerRecord;
  perRecord.forEach((text, r) => {
    const at = header.headerBytes + r * header.recordBytes + tal.recordByteOffset;
    if (text.length > size) throw new Error(`TAL text of record ${r} needs ${text.length} bytes, the signal has ${size}`);
    out.fill(0, at, at + size);
    out.set(ascii(text), at);
  });
  if (reserved !== undefined) out.set(ascii(reserved.padEnd(44, ' ')), 192);
  return out;
}

const roomy = [{ onset: 0.5, label: 'x'.repeat(60) }];

describe('when the same data is stored in mV and in µV', () => {
  // 4 s at 256 Hz within ±3.2767 mV. With physical range −3.2768..3.2767 mV over digital −32768..32767
  // the step is 6.5535/65535 = 0.0001 mV = 0.1 µV, and the µV file (−3276.8..3276.7) has the same 0.1 µV
  // step, so both files hold the same digital codes (writeEdf quantizes through the header's calibration).
  const millivolts = noise(1024, 1, 7).map((x) => Math.round(x * 1e4) / 1e4 + 0.00003);
  const microvolts = millivolts.map((x) => x * 1000);
  const fromMv = toSignal(edf([{ label: 'Oz', samples: millivolts, samplingRate: 256, physicalDimension: 'mV', physicalMinimum: -3.2768, physicalMaximum: 3.2767 }]));
  const fromUv = toSignal(edf([{ label: 'Oz', samples: microvolts, samplingRate: 256, physicalDimension: 'uV', physicalMinimum: -3276.8, physicalMaximum: 3276.7 }]));

  it('should report both in uV with the same shape', () => {
    for (const s of [fromMv, fromUv]) {
      expect(s.unit).toBe('uV');
      expect(s.channels).toEqual(['Oz']);
      expect(s.samplingRate).toBe(256);
      expect(s.epochCount).toBe(1);
      expect(s.samplesPerEpoch).toBe(1024);
    }
  });

  it('should give identical samples up to float rounding (1e-9 µV, far below the 0.1 µV step)', () => {
    let worst = 0;
    for (let k = 0; k < 1024; k++) worst = Math.max(worst, Math.abs(fromMv.data[k]! - fromUv.data[k]!));
    expect(worst).toBeLessThan(1e-9);
  });

  it('should be within half a quantization step (0.05 µV) of the original µV values', () => {
    for (const s of [fromMv, fromUv]) {
      let worst = 0;
      for (let k = 0; k < 1024; k++) worst = Math.max(worst, Math.abs(s.data[k]! - microvolts[k]!));
      expect(worst).toBeLessThanOrEqual(0.05 + 1e-9);
      expect(worst).toBeGreaterThan(0); // the 0.03 µV offset is not on the grid: quantization did happen
    }
  });

  it('should scale V by 10^6 and nV by 10^-3 (SI prefixes, common practice)', () => {
    const volts = toSignal(edf([{ label: 'Oz', samples: millivolts.map((x) => x / 1000), samplingRate: 256, physicalDimension: 'V', physicalMinimum: -0.00328, physicalMaximum: 0.00328 }]));
    const nano = toSignal(edf([{ label: 'Oz', samples: [0, 1000, -1000, 500], samplingRate: 4, physicalDimension: 'nV', physicalMinimum: -1000, physicalMaximum: 1000 }]));
    const halfStep = 6560 / 65535 / 2; // µV: (physmax − physmin)/(digmax − digmin)/2 of the V file
    for (let k = 0; k < 1024; k++) expect(Math.abs(volts.data[k]! - microvolts[k]!)).toBeLessThanOrEqual(halfStep + 1e-9);
    expect(nano.unit).toBe('uV');
    expect(Array.from(nano.data)).toEqual([expect.closeTo(0, 3), expect.closeTo(1, 6), expect.closeTo(-1, 6), expect.closeTo(0.5, 3)]);
  });
});

describe('when a file mixes sampling rates', () => {
  const bytes = edf([
    { label: 'Fz', samples: noise(512, 20, 1), samplingRate: 256, physicalDimension: 'uV' },
    { label: 'Resp', samples: noise(64, 1, 2), samplingRate: 32, physicalDimension: 'uV' },
    { label: 'Cz', samples: noise(512, 20, 3), samplingRate: 256, physicalDimension: 'uV' },
  ]);

  it('should refuse without a selection, listing each rate with its labels', () => {
    const error = thrown(() => toSignal(bytes));
    expect(error.kind).toBe('sampling-rate');
    expect(error.pointer).toBe('/body');
    expect(error.message).toContain('256 Hz: "Fz", "Cz"');
    expect(error.message).toContain('32 Hz: "Resp"');
  });

  it('should keep the channels of a requested samplingRate in file order', () => {
    const signal = toSignal(bytes, { samplingRate: 256 });
    expect(signal.channels).toEqual(['Fz', 'Cz']);
    expect(signal.samplesPerEpoch).toBe(512);
    const low = toSignal(bytes, { samplingRate: 32 });
    expect(low.channels).toEqual(['Resp']);
    expect(low.samplingRate).toBe(32);
  });

  it('should accept a selection of one rate in the order asked, and refuse one that mixes rates', () => {
    const signal = toSignal(bytes, { channels: ['Cz', 'Fz'] });
    expect(signal.channels).toEqual(['Cz', 'Fz']);
    const direct = toSignal(bytes, { channels: ['Cz'] });
    expect(Array.from(channelView(signal, 0, 0))).toEqual(Array.from(direct.data));
    const error = thrown(() => toSignal(bytes, { channels: ['Fz', 'Resp'] }));
    expect(error.kind).toBe('sampling-rate');
    expect(error.pointer).toBe('/query/channels');
  });

  it('should refuse a samplingRate no signal has, and a selected channel of another rate', () => {
    const none = thrown(() => toSignal(bytes, { samplingRate: 500 }));
    expect(none.kind).toBe('sampling-rate');
    expect(none.pointer).toBe('/query/samplingRate');
    expect(none.message).toContain('500 Hz');
    const other = thrown(() => toSignal(bytes, { channels: ['Fz', 'Resp'], samplingRate: 256 }));
    expect(other.message).toContain('"Resp"');
    expect(other.pointer).toBe('/query/channels');
  });
});

describe('when the sampling rate is not a whole number of samples per second of record', () => {
  // 77 samples per 0.3 s record: the header rate is 77 / 0.3 in floating point (Kemp et al. 1992: rate =
  // samples per record / record duration), which a typed "256.666666666667" or the exact quotient must match.
  const bytes = writeEdf({ signals: [{ label: 'Cz', samples: noise(77 * 4, 10, 6), samplingRate: 77 / 0.3 }], recordDuration: 0.3, startDate: start });

  it('should accept the rate as typed to 12 significant digits', () => {
    const signal = toSignal(bytes, { samplingRate: 256.666666666667 });
    expect(signal.samplingRate).toBe(77 / 0.3);
    expect(signal.samplesPerEpoch).toBe(308);
  });
});

describe('when the upload is a view into a larger buffer', () => {
  it('should decode the same signal as from a copy (Node Buffers share a pool with an offset)', () => {
    const bytes = edf([{ label: 'Fz', samples: noise(64, 10, 8), samplingRate: 32, physicalDimension: 'uV' }], { annotations: [] });
    const pool = new Uint8Array(bytes.length + 7);
    pool.set(bytes, 3);
    const view = pool.subarray(3, 3 + bytes.length);
    expect(toSignal(view)).toEqual(toSignal(bytes.slice()));
  });
});

describe('when channels are selected by label', () => {
  const bytes = edf(
    [
      { label: 'F3', samples: noise(256, 10, 4), samplingRate: 128, physicalDimension: 'uV' },
      { label: 'F4', samples: noise(256, 10, 5), samplingRate: 128, physicalDimension: 'uV' },
    ],
    { annotations: [] },
  );

  it('should refuse an unknown label at /query/channels/i, listing the labels that exist', () => {
    const error = thrown(() => toSignal(bytes, { channels: ['F4', 'Fp1'] }));
    expect(error.kind).toBe('channels');
    expect(error.pointer).toBe('/query/channels/1');
    expect(error.message).toContain('"Fp1"');
    expect(error.message).toContain('"F3", "F4"');
  });

  it('should not offer the annotations signal as a channel (EDF+ §2.2.1)', () => {
    expect(toSignal(bytes).channels).toEqual(['F3', 'F4']);
    const error = thrown(() => toSignal(bytes, { channels: ['EDF Annotations'] }));
    expect(error.kind).toBe('channels');
    expect(error.message).toContain('annotations');
  });

  it('should refuse a label given twice and an empty selection', () => {
    expect(thrown(() => toSignal(bytes, { channels: ['F3', 'F3'] })).kind).toBe('channels');
    expect(thrown(() => toSignal(bytes, { channels: [] })).kind).toBe('channels');
  });

  it('should refuse a label two signals share, naming their positions', () => {
    const twins = edf([
      { label: 'EEG', samples: noise(8, 1, 1), samplingRate: 4 },
      { label: 'EEG', samples: noise(8, 1, 2), samplingRate: 4 },
    ]);
    const ambiguous = thrown(() => toSignal(twins, { channels: ['EEG'] }));
    expect(ambiguous.message).toContain('signals 1, 2');
    const all = thrown(() => toSignal(twins));
    expect(all.kind).toBe('channels');
    expect(all.pointer).toBe('/body');
  });
});

describe('when channels have different physical dimensions', () => {
  const bytes = edf([
    { label: 'C3', samples: noise(64, 0.02, 1), samplingRate: 32, physicalDimension: 'mV' },
    { label: 'C4', samples: noise(64, 20, 2), samplingRate: 32, physicalDimension: 'uV' },
    { label: 'SpO2', samples: noise(64, 1, 3).map((x) => 96 + x), samplingRate: 32, physicalDimension: '%' },
  ]);

  it('should merge voltages in different prefixes into uV', () => {
    const signal = toSignal(bytes, { channels: ['C3', 'C4'] });
    expect(signal.unit).toBe('uV');
  });

  it('should refuse channels of different units after conversion, naming them', () => {
    const error = thrown(() => toSignal(bytes));
    expect(error.kind).toBe('channels');
    expect(error.message).toContain('"uV": "C3", "C4"');
    expect(error.message).toContain('"%": "SpO2"');
  });

  it('should keep a non-voltage dimension as it is', () => {
    const signal = toSignal(bytes, { channels: ['SpO2'] });
    expect(signal.unit).toBe('%');
    expect(Math.abs(signal.data[0]! - (96 + noise(64, 1, 3)[0]!))).toBeLessThan(0.01);
  });
});

describe('when the file is EDF+ with annotations', () => {
  // EDF+ §2.2.2: "+180\x14Lights off\x14Close door\x14\x00" is one TAL with two annotations at 180 s, and
  // "+1800.2\x1525.5\x14Apnea\x14\x00" an annotation lasting 25.5 s; here scaled down to a 4 s file.
  const bytes = edf([{ label: 'Pz', samples: noise(1024, 15, 9), samplingRate: 256, physicalDimension: 'uV' }], { annotations: roomy });
  const file = rewriteAnnotations(bytes, ['+0\x14\x14\x00', '+1\x14\x14\x00+1.8\x14Lights off\x14Close door\x14\x00', '+2\x14\x14\x00+2.2\x1525.5\x14Apnea\x14\x00', '+3\x14\x14\x00']);

  it('should turn TALs into events (onset, duration, label) and leave the time-keeping TALs out', () => {
    const signal = toSignal(file);
    expect(signal.channels).toEqual(['Pz']);
    expect(signal.events).toEqual([
      { onset: 1.8, duration: null, label: 'Lights off' },
      { onset: 1.8, duration: null, label: 'Close door' },
      { onset: 2.2, duration: 25.5, label: 'Apnea' },
    ]);
  });

  it('should measure onsets from the first sample when the first record starts at +0.X (EDF+ §2.2.4)', () => {
    const late = rewriteAnnotations(bytes, ['+0.5\x14\x14\x00+0.75\x14Blink\x14\x00', '+1.5\x14\x14\x00', '+2.5\x14\x14\x00', '+3.5\x14\x14\x00']);
    expect(toSignal(late).events).toEqual([{ onset: 0.25, duration: null, label: 'Blink' }]);
  });

  it('should carry no events for a plain EDF file', () => {
    const plain = toSignal(edf([{ label: 'Pz', samples: noise(8, 1, 1), samplingRate: 4 }]));
    expect(plain.events).toBeUndefined();
  });
});

describe('when the file is EDF+D', () => {
  const bytes = edf([{ label: 'O1', samples: noise(768, 15, 11), samplingRate: 256, physicalDimension: 'uV' }], { annotations: roomy });

  it('should refuse records with gaps between them, saying where the gaps are', () => {
    // Record 3 says +5 s where record 2 ended at 2 s: a gap of 3 s (EDF+ §2.2.4, EDF+D).
    const gappy = rewriteAnnotations(bytes, ['+0\x14\x14\x00', '+1\x14\x14\x00', '+5\x14\x14\x00'], 'EDF+D');
    const error = thrown(() => toSignal(gappy));
    expect(error.kind).toBe('format');
    expect(error.pointer).toBe('/body');
    expect(error.message).toContain('1 gap');
    expect(error.message).toContain('after record 2, 2 s to 5 s');
    expect(error.message).toContain('not supported');
  });

  it('should read an EDF+D file whose records happen to be contiguous', () => {
    const contiguous = rewriteAnnotations(bytes, ['+0\x14\x14\x00', '+1\x14\x14\x00', '+2\x14\x14\x00'], 'EDF+D');
    expect(toSignal(contiguous).samplesPerEpoch).toBe(768);
  });
});

describe('when the bytes are malformed', () => {
  const good = edf([{ label: 'Fz', samples: noise(512, 10, 2), samplingRate: 256, physicalDimension: 'uV' }]);

  it('should name the field and byte offset of a bad header field', () => {
    const bad = good.slice();
    bad.set(ascii('abc     '), 236); // data record count, offset 236 (Kemp et al. 1992 header layout)
    const error = thrown(() => toSignal(bad));
    expect(error.kind).toBe('format');
    expect(error.pointer).toBe('/body');
    expect(error.message).toContain('data record count');
    expect(error.message).toContain('offset 236');
  });

  it('should refuse a wrong header byte count at offset 184 (256 + 256·ns bytes)', () => {
    const bad = good.slice();
    bad.set(ascii('768     '), 184);
    const error = thrown(() => toSignal(bad));
    expect(error.message).toContain('offset 184');
  });

  it('should refuse a truncated file and a file cut inside the fixed header, with an offset', () => {
    const truncated = thrown(() => toSignal(good.subarray(0, good.length - 3)));
    expect(truncated.kind).toBe('format');
    expect(truncated.message).toMatch(/offset \d+/);
    const stub = thrown(() => toSignal(good.subarray(0, 100)));
    expect(stub.kind).toBe('format');
    expect(stub.message).toMatch(/offset \d+/);
  });

  it('should refuse a malformed TAL with its offset (onset without sign, EDF+ §2.2.2)', () => {
    const plus = edf([{ label: 'Fz', samples: noise(512, 10, 2), samplingRate: 256 }], { annotations: roomy });
    const bad = rewriteAnnotations(plus, ['+0\x14\x14\x00', '1\x14\x14\x00']);
    const error = thrown(() => toSignal(bad));
    expect(error.kind).toBe('format');
    expect(error.message).toMatch(/TAL at offset \d+/);
  });
});

describe('when the server limits are reached', () => {
  const bytes = edf([
    { label: 'Fz', samples: noise(512, 10, 2), samplingRate: 256 },
    { label: 'Cz', samples: noise(512, 10, 3), samplingRate: 256 },
  ]);

  it('should refuse too many samples or channels before decoding', () => {
    expect(thrown(() => toSignal(bytes, {}, { ...DEFAULT_SIGNAL_LIMITS, maxSamples: 1023 })).kind).toBe('limit');
    expect(thrown(() => toSignal(bytes, {}, { ...DEFAULT_SIGNAL_LIMITS, maxChannels: 1 })).kind).toBe('limit');
    expect(toSignal(bytes, { channels: ['Cz'] }, { ...DEFAULT_SIGNAL_LIMITS, maxChannels: 1 }).channels).toEqual(['Cz']);
  });

  it('should refuse a rate above the limit', () => {
    expect(thrown(() => toSignal(bytes, {}, { ...DEFAULT_SIGNAL_LIMITS, maxSamplingRate: 200 })).kind).toBe('sampling-rate');
  });

  it('should refuse a file that holds annotations only', () => {
    // Hand-built EDF+C: one "EDF Annotations" signal, record duration 0, which EDF+ §2.2.4 allows only
    // for annotation-only files; 256 + 256·1 header bytes, one record of 8 two-byte samples.
    const fields = [
      '0'.padEnd(8),
      ''.padEnd(80),
      ''.padEnd(80),
      '02.11.24',
      '23.40.00',
      '512'.padEnd(8),
      'EDF+C'.padEnd(44),
      '1'.padEnd(8),
      '0'.padEnd(8),
      '1'.padEnd(4),
      'EDF Annotations'.padEnd(16),
      ''.padEnd(80),
      ''.padEnd(8),
      '-1'.padEnd(8),
      '1'.padEnd(8),
      '-32768'.padEnd(8),
      '32767'.padEnd(8),
      ''.padEnd(80),
      '8'.padEnd(8),
      ''.padEnd(32),
      '+0\x14\x14\x00+0\x14Marker\x14\x00',
    ];
    const error = thrown(() => toSignal(ascii(fields.join(''))));
    expect(error.kind).toBe('channels');
    expect(error.message).toContain('no ordinary signal');
  });
});
