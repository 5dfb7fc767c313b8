import { describe, expect, it } from 'vitest';
import { formatEdfNumber, parseEdf, readEdfHeader, writeEdf, type WriteEdfInput } from '../../src/signals/edf/index.js';

// Invented, seeded test data: a 32-bit linear congruential generator (Numerical Recipes constants,
// common practice) so the round trip is checked on irregular values.
function seeded(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

const start = { year: 2024, month: 3, day: 9, hour: 22, minute: 15, second: 30 };

function noise(n: number, scale: number, seed: number): Float64Array {
  const next = seeded(seed);
  return Float64Array.from({ length: n }, () => (next() - 0.5) * 2 * scale);
}

describe('when writing and reading back an EDF file', () => {
  const fz = noise(256 * 4, 87.3, 1);
  const oz = noise(128 * 4, 12.05, 2);
  const input: WriteEdfInput = {
    signals: [
      { label: 'Fz', samples: fz, samplingRate: 256, physicalDimension: 'uV', transducer: 'AgAgCl electrode', prefiltering: 'HP:0.1Hz LP:70Hz' },
      { label: 'Oz', samples: oz, samplingRate: 128, physicalDimension: 'uV', digitalMinimum: -2048, digitalMaximum: 2047 },
    ],
    recordDuration: 1,
    startDate: start,
    patientId: 'P-001',
    recordingId: 'session A',
  };
  const bytes = writeEdf(input);
  const file = parseEdf(bytes);

  it('should write a plain EDF header of 256 + 256·2 bytes and 4 records', () => {
    expect(file.header.headerBytes).toBe(768);
    expect(file.header.variant).toBe('EDF');
    expect(file.header.recordCount).toBe(4);
    expect(bytes.length).toBe(768 + 4 * 2 * (256 + 128));
    expect(file.header.start).toEqual(start);
    expect(file.header.startDateField).toBe('09.03.24');
    expect(file.header.patientId).toBe('P-001');
  });

  it('should keep labels, units, transducer, prefiltering and rates', () => {
    expect(file.signals.map((s) => [s.label, s.physicalDimension, s.samplingRate])).toEqual([
      ['Fz', 'uV', 256],
      ['Oz', 'uV', 128],
    ]);
    expect(file.signals[0]!.transducer).toBe('AgAgCl electrode');
    expect(file.signals[0]!.prefiltering).toBe('HP:0.1Hz LP:70Hz');
  });

  it('should give every sample back to within half a quantization step, (physmax − physmin)/(digmax − digmin)/2', () => {
    for (const [i, original] of [fz, oz].entries()) {
      const s = file.signals[i]!;
      const halfStep = Math.abs(s.gain) / 2;
      let worst = 0;
      for (let k = 0; k < original.length; k++) worst = Math.max(worst, Math.abs(s.samples[k]! - original[k]!));
      expect(worst).toBeLessThanOrEqual(halfStep * (1 + 1e-9));
      // The derived range contains the data, so the extremes need no clipping.
      expect(s.physicalMinimum).toBeLessThanOrEqual(Math.min(...original));
      expect(s.physicalMaximum).toBeGreaterThanOrEqual(Math.max(...original));
    }
  });

  it('should be exact for values on the digital grid (a second write of the read data gives the same bytes)', () => {
    const again = writeEdf({
      ...input,
      signals: file.signals.map((s, i) => ({
        ...input.signals[i]!,
        samples: s.samples,
        physicalMinimum: s.physicalMinimum,
        physicalMaximum: s.physicalMaximum,
      })),
    });
    expect(again).toEqual(bytes);
  });
});

describe('when writing annotations', () => {
  const samples = new Float64Array(100 * 3).map((_, k) => Math.sin(k / 5));
  const annotations = [
    { onset: -0.25, duration: 1.5, label: 'Before start' },
    { onset: 0, label: 'Eyes open' },
    { onset: 1.2, duration: 0, label: 'Blink' },
    { onset: 2.75, duration: 30, label: 'Eyes closed – ü' },
  ];
  const bytes = writeEdf({ signals: [{ label: 'O1', samples, samplingRate: 100, physicalDimension: 'uV' }], recordDuration: 1, startDate: start, annotations });
  const file = parseEdf(bytes);

  it('should write EDF+C with an "EDF Annotations" signal (EDF+ §2.2.1)', () => {
    expect(file.header.variant).toBe('EDF+C');
    expect(file.header.reserved.startsWith('EDF+C')).toBe(true);
    const a = file.header.signals[1]!;
    expect([a.label, a.digitalMinimum, a.digitalMaximum, a.physicalMinimum, a.physicalMaximum]).toEqual(['EDF Annotations', -32768, 32767, -1, 1]);
  });

  it('should use the EDF+ identification defaults (from memory of EDF+ §2.1.3: unknown subfields are X)', () => {
    expect(file.header.patientId).toBe('X X X X');
    expect(file.header.recordingId).toBe('Startdate 09-MAR-2024 X X X');
  });

  it('should give the annotations back exactly, with null for an absent duration', () => {
    expect(file.annotations).toEqual(annotations.map((a) => ({ onset: a.onset, duration: a.duration ?? null, label: a.label })));
  });

  it('should write time-keeping TALs so the records are contiguous', () => {
    expect(Array.from(file.recordStarts)).toEqual([0, 1, 2]);
    expect(file.contiguous).toBe(true);
  });

  it('should write the time-keeping TAL "+0 0x14 0x14 0x00" first in record 1 (EDF+ §2.2.4)', () => {
    const at = file.header.headerBytes + file.header.signals[1]!.recordByteOffset;
    expect(Array.from(bytes.subarray(at, at + 5))).toEqual([0x2b, 0x30, 0x14, 0x14, 0x00]);
  });

  it('should write an EDF+C file even for an empty annotation list', () => {
    expect(parseEdf(writeEdf({ signals: [{ label: 'O1', samples, samplingRate: 100 }], recordDuration: 1, startDate: start, annotations: [] })).header.variant).toBe('EDF+C');
  });

  it('should write 0.1-s record starts as decimals a reader parses back contiguously', () => {
    const short = writeEdf({ signals: [{ label: 'O1', samples, samplingRate: 100 }], recordDuration: 0.1, startDate: start, annotations: [] });
    const parsed = parseEdf(short);
    expect(parsed.header.recordCount).toBe(30);
    expect(parsed.recordStarts[3]).toBe(0.3);
    expect(parsed.contiguous).toBe(true);
  });
});

describe('when formatting numbers for the 8-character fields', () => {
  it.each([
    [-123.456789, 'down', '-123.457'],
    [123.456789, 'up', '123.4568'],
    [123.456789, 'down', '123.4567'],
    [-0.00001234, 'down', '-0.00002'],
    [0.00001234, 'up', '0.000013'],
    [12345678.4, 'up', '12345679'],
    [-5, 'down', '-5'],
    [0.05, 'exact', '0.05'],
  ] as const)('should write %d rounded %s as "%s"', (value, mode, text) => {
    expect(formatEdfNumber(value, mode, 'x')).toBe(text);
  });

  it('should refuse numbers that do not fit', () => {
    expect(() => formatEdfNumber(0.123456789, 'exact', 'recordDuration')).toThrow(/does not fit/);
    expect(() => formatEdfNumber(1e9, 'up', 'x')).toThrow(RangeError);
    expect(() => formatEdfNumber(Number.NaN, 'up', 'x')).toThrow(RangeError);
  });
});

describe('when the input to writeEdf is wrong', () => {
  const base: WriteEdfInput = {
    signals: [{ label: 'Cz', samples: new Float64Array(10), samplingRate: 10 }],
    recordDuration: 1,
    startDate: start,
  };

  it('should write a flat signal with a widened range (physmax ≠ physmin) and read it back', () => {
    const file = parseEdf(writeEdf(base));
    expect([file.signals[0]!.physicalMinimum, file.signals[0]!.physicalMaximum]).toEqual([-1, 1]);
    expect(Math.max(...file.signals[0]!.samples.map(Math.abs))).toBeLessThanOrEqual(1 / 65535);
  });

  it.each([
    ['a rate that is not whole samples per record', { signals: [{ label: 'Cz', samples: new Float64Array(10), samplingRate: 10.5 }] }, /whole number of samples/],
    ['samples that do not fill whole records', { signals: [{ label: 'Cz', samples: new Float64Array(15), samplingRate: 10 }] }, /same whole number/],
    ['signals of different lengths', { signals: [base.signals[0]!, { label: 'Pz', samples: new Float64Array(20), samplingRate: 10 }] }, /signals\[1\]/],
    ['a NaN sample', { signals: [{ label: 'Cz', samples: [0, Number.NaN, 0, 0, 0, 0, 0, 0, 0, 0], samplingRate: 10 }] }, /samples\[1\] is NaN/],
    ['a label longer than 16 characters', { signals: [{ ...base.signals[0]!, label: 'A very long label!' }] }, /label/],
    ['a non-ASCII unit', { signals: [{ ...base.signals[0]!, physicalDimension: 'µV' }] }, /printable ASCII/],
    ['a sample outside a given range', { signals: [{ label: 'Cz', samples: new Float64Array(10).fill(5), samplingRate: 10, physicalMinimum: -1, physicalMaximum: 1 }] }, /outside the physical range/],
    ['digmax ≤ digmin', { signals: [{ ...base.signals[0]!, digitalMinimum: 0, digitalMaximum: 0 }] }, /digitalMaximum/],
    ['physmax = physmin', { signals: [{ ...base.signals[0]!, physicalMinimum: 1, physicalMaximum: 1 }] }, /differ/],
    ['a year after 2084', { startDate: { ...start, year: 2085 } }, /1985–2084/],
    ['a record duration of 0', { recordDuration: 0 }, /recordDuration/],
    ['no signals', { signals: [] }, /at least one/],
    ['an empty annotation label', { annotations: [{ onset: 0, label: '' }] }, /label/],
  ] as const)('should refuse %s with a RangeError', (_, patch, message) => {
    expect(() => writeEdf({ ...base, ...patch } as WriteEdfInput)).toThrow(message);
  });

  it('should clip out-of-range samples only when asked', () => {
    const file = parseEdf(writeEdf({ ...base, clip: true, signals: [{ label: 'Cz', samples: new Float64Array(10).fill(5), samplingRate: 10, physicalMinimum: -1, physicalMaximum: 1 }] }));
    expect(file.signals[0]!.samples[0]).toBe(1);
  });

  it('should write a header that the header reader accepts on its own', () => {
    expect(readEdfHeader(writeEdf(base).subarray(0, 512)).signals[0]!.label).toBe('Cz');
  });
});

describe('when writing a file with more records than a JS call takes arguments', () => {
  // 250 000 one-second records (about 69 h); Math.max(...array) overflows the stack at 2·10^5 on Node 20 (seen here).
  it('should write and read back 250 000 records with annotations', () => {
    const records = 250_000;
    const bytes = writeEdf({
      signals: [{ label: 'Cz', samples: new Float64Array(records).map((_, k) => k % 13), samplingRate: 1 }],
      recordDuration: 1,
      startDate: start,
      annotations: [{ onset: 249_999.5, label: 'Lights on' }],
    });
    const file = parseEdf(bytes);
    expect(file.header.recordCount).toBe(records);
    expect(file.recordStarts[records - 1]).toBe(records - 1);
    expect(file.annotations).toEqual([{ onset: 249_999.5, duration: null, label: 'Lights on' }]);
    expect(file.signals[0]!.samples[12]).toBeCloseTo(12, 3);
  });
});
